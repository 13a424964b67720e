package org.hullbound.model;

import org.hullbound.lang.ModelException;
import org.hullbound.lang.SourcePosition;

/**
 * Makes the positioned error of the model or data file at fault; the binder's phases and the
 * small rules they use ({@link VectorArgument}, {@link CensoredRows}, {@link ExpressionLowering})
 * share it so that every message quotes its line the same way.
 */
@FunctionalInterface
interface BindingErrors {
  ModelException at(SourcePosition position, String problem, String hint);
}

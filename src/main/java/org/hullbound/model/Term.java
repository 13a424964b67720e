package org.hullbound.model;

import java.util.List;
import org.hullbound.lang.SourcePosition;
import org.hullbound.model.family.Parametrisation;

/**
 * One element-level term of the joint log-density: {@code value ~ family(args)}, optionally
 * truncated to {@code [lower, upper]}, with value and arguments resolved to {@link Formula}s.
 *
 * <p>{@code owner} is the slot whose prior (or, for a missing observation, whose own likelihood)
 * this term is, or -1 for an observed data value. Element {@code element} of {@code names} is the
 * element the term is about; its label ({@code survived[3]}) is made when a message asks for it,
 * not held, as a model may have a term for each of millions of rows. For observed data, {@code
 * cells} says where its value was written ({@link #valueCell}), so that the value itself can be a
 * shared constant; {@code null} for the term of an unknown.
 */
record Term(
    ElementNames names,
    int element,
    Formula.Cells cells,
    Parametrisation family,
    Formula value,
    List<Formula> arguments,
    Within within,
    int owner,
    SourcePosition position) {
  Term {
    arguments = List.copyOf(arguments);
  }

  /** The bounds of {@code within lower .. upper}; a term not truncated holds none. */
  record Within(double lower, double upper) {}

  boolean truncated() {
    return within != null;
  }

  /** The lower truncation bound, -infinity when not truncated. */
  double lower() {
    return within == null ? Double.NEGATIVE_INFINITY : within.lower();
  }

  /** The upper truncation bound, +infinity when not truncated. */
  double upper() {
    return within == null ? Double.POSITIVE_INFINITY : within.upper();
  }

  /** The data cell of an observed value, or {@code null}. */
  SourcePosition valueCell() {
    return cells == null ? null : cells.at(element);
  }

  /** The element's name, as in {@code survived[3]}. */
  String label() {
    return names.label(element);
  }

  String familyName() {
    return family.family().name();
  }

  String argumentName(int k) {
    return family.argumentNames().get(k);
  }

  /** The argument called {@code name}, or {@code null}. */
  Formula argument(String name) {
    int k = family.argumentNames().indexOf(name);
    return k < 0 ? null : arguments.get(k);
  }

  /** The known arguments' values, NaN for those that read an unknown. */
  double[] knownArguments() {
    double[] known = new double[arguments.size()];
    for (int k = 0; k < known.length; k++) {
      known[k] =
          arguments.get(k) instanceof Formula.Constant c ? c.value() : Double.NaN;
    }
    return known;
  }
}

package org.hullbound.validation;

import java.nio.file.Path;
import java.util.Map;

/**
 * Computes a validation case's reference values at run time, from the case's data files and a
 * definition of its model written independently of hullbound (quadrature or closed form).
 *
 * <p>Keyed by quantity, as written in the case's {@code reference.csv} ({@code mean(mu)}).
 */
@FunctionalInterface
interface CaseReference {
  Map<String, Double> values(Path caseFolder);
}

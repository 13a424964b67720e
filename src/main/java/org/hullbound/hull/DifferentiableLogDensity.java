package org.hullbound.hull;

/**
 * A log density h(x) = log f(x) + const together with its derivative h'(x).
 *
 * <p>The tangent form of adaptive rejection sampling (Gilks and Wild 1992) builds its upper hull
 * from the tangents at the abscissae, so it needs both at each of them.
 */
@FunctionalInterface
public interface DifferentiableLogDensity {

  /** Returns h(x) and h'(x) at {@code x}. */
  Evaluation evaluate(double x);
}

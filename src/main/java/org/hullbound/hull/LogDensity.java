package org.hullbound.hull;

/**
 * A log density h(x) = log f(x) + const, without its derivative.
 *
 * <p>Used by the derivative-free form of adaptive rejection sampling, whose hull is built from
 * secants through neighbouring abscissae (Gilks 1992).
 */
@FunctionalInterface
public interface LogDensity {

  /** Returns h(x); {@code -inf} where f(x) = 0. */
  double value(double x);
}

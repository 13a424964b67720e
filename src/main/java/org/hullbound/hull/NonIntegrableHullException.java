package org.hullbound.hull;

/**
 * On an unbounded side of the support the outermost tangent or secant does not fall away, so the
 * hull has infinite mass.
 *
 * <p>Raised after a bounded outward search for a falling slope (the starting-abscissae condition
 * of Gilks and Wild 1992, section 2.2) instead of searching forever; usually the density is not
 * proper on that support, e.g. h(x) = x on the whole line.
 */
public final class NonIntegrableHullException extends HullException {

  NonIntegrableHullException(String message, double x) {
    super(message, x);
  }
}

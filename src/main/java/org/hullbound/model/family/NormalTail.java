package org.hullbound.model.family;

import org.apache.commons.math3.special.Erf;

/**
 * The log of the standard normal upper tail {@code Q(z) = 1 - Phi(z)} with full relative accuracy
 * for every {@code z}, including far tails where {@code Q} underflows.
 *
 * <p>Central part from commons-math3's {@code erfc}; for {@code z > 5} the Mills ratio {@code
 * Q(z) / phi(z)} from its continued fraction {@code 1/(z + 1/(z + 2/(z + 3/(z + ...))))} (Laplace;
 * see Abramowitz and Stegun 1964, 26.2.14), evaluated by the modified Lentz method (Press et al.,
 * Numerical Recipes, 3rd ed., 5.2), so that {@code log Q} is finite far beyond the underflow of Q.
 */
final class NormalTail {
  static final double HALF_LOG_TWO_PI = 0.5 * Math.log(2.0 * Math.PI);
  private static final double SQRT_HALF = Math.sqrt(0.5);
  private static final double TAIL_SWITCH = 5.0;
  private static final double TINY = 1e-300;

  private NormalTail() {}

  /** {@code log Q(z)}. */
  static double logUpper(double z) {
    if (Double.isNaN(z)) {
      return Double.NaN;
    }
    if (z > TAIL_SWITCH) {
      return -0.5 * z * z - HALF_LOG_TWO_PI + Math.log(millsRatio(z));
    }
    if (z < -TAIL_SWITCH) {
      return LogSpace.log1p(-Math.exp(logUpper(-z)));
    }
    return Math.log(0.5 * Erf.erfc(z * SQRT_HALF));
  }

  /** {@code log Phi(z) = log Q(-z)}. */
  static double logLower(double z) {
    return logUpper(-z);
  }

  /** {@code log phi(z)}. */
  static double logDensity(double z) {
    return -0.5 * z * z - HALF_LOG_TWO_PI;
  }

  /** Mills ratio {@code Q(z) / phi(z)} for {@code z > 0} by its continued fraction. */
  static double millsRatio(double z) {
    if (z > 1e150) {
      return 1.0 / z;
    }
    // R = a1/(b1 + a2/(b2 + ...)), a1 = 1, a_j = j - 1, b_j = z; modified Lentz with b0 = 0.
    double f = TINY;
    double c = f;
    double d = 0.0;
    for (int j = 1; j < 10_000; j++) {
      double a = j == 1 ? 1.0 : j - 1.0;
      d = z + a * d;
      if (Math.abs(d) < TINY) {
        d = TINY;
      }
      c = z + a / c;
      if (Math.abs(c) < TINY) {
        c = TINY;
      }
      d = 1.0 / d;
      double delta = c * d;
      f *= delta;
      if (Math.abs(delta - 1.0) < 4e-16) {
        return f;
      }
    }
    throw new ArithmeticException("Mills ratio continued fraction did not converge at z = " + z);
  }
}

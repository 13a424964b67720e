package org.hullbound.model.family;

import org.apache.commons.math3.special.Beta;

/**
 * The log of the regularised incomplete beta function {@code I_x(a, b)}, finite where the function
 * underflows.
 *
 * <p>The continued fraction of Abramowitz and Stegun (1964) 26.5.8, evaluated by the modified Lentz
 * method for {@code x < (a + 1) / (a + b + 2)} and through {@code I_x(a, b) = 1 - I_{1-x}(b, a)}
 * otherwise (as in Press et al., Numerical Recipes, 3rd ed., 6.4), with the prefactor {@code x^a
 * (1-x)^b / (a B(a, b))} kept as a log. Callers pass both {@code x} and {@code y = 1 - x}, each
 * computed without cancellation (e.g. {@code p} and {@code 1 - p} from a logit).
 */
final class IncompleteBeta {
  private static final double EPSILON = 4e-16;
  private static final double TINY = 1e-300;
  private static final int MAX_ITERATIONS = 1_000_000;

  private IncompleteBeta() {}

  /** {@code log I_x(a, b)} with {@code y = 1 - x}. */
  static double logRegularized(double x, double y, double a, double b) {
    return logRegularized(x, y, Math.log(x), Math.log(y), a, b);
  }

  /**
   * {@code log I_x(a, b)} with {@code y = 1 - x} and their logs supplied by the caller: when {@code
   * x} is within {@code 1e-10} of 1 and {@code a} is large, {@code a log(x)} needs {@code log x}
   * from {@code log1p}, not from the rounded {@code x}.
   */
  static double logRegularized(double x, double y, double logX, double logY, double a, double b) {
    if (x <= 0) {
      return Double.NEGATIVE_INFINITY;
    }
    if (y <= 0) {
      return 0.0;
    }
    double logPrefactor = a * logX + b * logY - Beta.logBeta(a, b);
    if (x < (a + 1) / (a + b + 2)) {
      return logPrefactor - Math.log(a) + Math.log(continuedFraction(x, a, b));
    }
    double logComplement = logPrefactor - Math.log(b) + Math.log(continuedFraction(y, b, a));
    return LogSpace.log1mExp(Math.min(0.0, logComplement));
  }

  private static double continuedFraction(double x, double a, double b) {
    double qab = a + b;
    double qap = a + 1.0;
    double qam = a - 1.0;
    double c = 1.0;
    double d = 1.0 - qab * x / qap;
    if (Math.abs(d) < TINY) {
      d = TINY;
    }
    d = 1.0 / d;
    double h = d;
    for (int m = 1; m < MAX_ITERATIONS; m++) {
      int m2 = 2 * m;
      // Even step d_{2m} = m (b - m) x / ((a + 2m - 1)(a + 2m)).
      double aa = m * (b - m) * x / ((qam + m2) * (a + m2));
      d = 1.0 + aa * d;
      if (Math.abs(d) < TINY) {
        d = TINY;
      }
      c = 1.0 + aa / c;
      if (Math.abs(c) < TINY) {
        c = TINY;
      }
      d = 1.0 / d;
      h *= d * c;
      // Odd step d_{2m+1} = -(a + m)(a + b + m) x / ((a + 2m)(a + 2m + 1)).
      aa = -(a + m) * (qab + m) * x / ((a + m2) * (qap + m2));
      d = 1.0 + aa * d;
      if (Math.abs(d) < TINY) {
        d = TINY;
      }
      c = 1.0 + aa / c;
      if (Math.abs(c) < TINY) {
        c = TINY;
      }
      d = 1.0 / d;
      double delta = d * c;
      h *= delta;
      if (Math.abs(delta - 1.0) < EPSILON) {
        return h;
      }
    }
    throw new ArithmeticException(
        "incomplete beta continued fraction did not converge, x = " + x + ", a = " + a + ", b = " + b);
  }
}

package org.hullbound.model.family;

import org.apache.commons.math3.special.Gamma;

/**
 * Logs of the regularised incomplete gamma functions {@code P(a, x)} and {@code Q(a, x) = 1 - P(a,
 * x)}, finite where the functions themselves underflow.
 *
 * <p>The series {@code P = x^a e^-x / Gamma(a+1) * sum x^n / ((a+1)...(a+n))} for {@code x < a + 1}
 * and Legendre's continued fraction for {@code Q} otherwise (Abramowitz and Stegun 1964, 6.5.29 and
 * 6.5.31; the split as in Press et al., Numerical Recipes, 3rd ed., 6.2), with the prefactor {@code
 * x^a e^-x / Gamma(a)} kept as a log. The other function follows by {@link LogSpace#log1mExp}.
 */
final class IncompleteGamma {
  private static final double EPSILON = 4e-16;
  private static final double TINY = 1e-300;
  private static final int MAX_ITERATIONS = 1_000_000;

  private IncompleteGamma() {}

  /** {@code log P(a, x)}, {@code a > 0}, {@code x >= 0}. */
  static double logLower(double a, double x) {
    if (x <= 0) {
      return Double.NEGATIVE_INFINITY;
    }
    if (x == Double.POSITIVE_INFINITY) {
      return 0.0;
    }
    return x < a + 1 ? logSeries(a, x) : LogSpace.log1mExp(logContinuedFraction(a, x));
  }

  /** {@code log Q(a, x)}, {@code a > 0}, {@code x >= 0}. */
  static double logUpper(double a, double x) {
    if (x <= 0) {
      return 0.0;
    }
    if (x == Double.POSITIVE_INFINITY) {
      return Double.NEGATIVE_INFINITY;
    }
    return x < a + 1 ? LogSpace.log1mExp(logSeries(a, x)) : logContinuedFraction(a, x);
  }

  private static double logPrefactor(double a, double x) {
    return a * Math.log(x) - x - Gamma.logGamma(a);
  }

  private static double logSeries(double a, double x) {
    double term = 1.0 / a;
    double sum = term;
    for (int n = 1; n < MAX_ITERATIONS; n++) {
      term *= x / (a + n);
      sum += term;
      if (term < sum * EPSILON) {
        return logPrefactor(a, x) + Math.log(sum);
      }
    }
    throw new ArithmeticException("incomplete gamma series did not converge, a = " + a + ", x = " + x);
  }

  private static double logContinuedFraction(double a, double x) {
    // Q = prefactor * 1/(x+1-a- 1(1-a)/(x+3-a- 2(2-a)/(x+5-a- ...))), modified Lentz.
    double b = x + 1.0 - a;
    double c = 1.0 / TINY;
    double d = 1.0 / b;
    double h = d;
    for (int i = 1; i < MAX_ITERATIONS; i++) {
      double an = -i * (i - a);
      b += 2.0;
      d = an * d + b;
      if (Math.abs(d) < TINY) {
        d = TINY;
      }
      c = b + an / c;
      if (Math.abs(c) < TINY) {
        c = TINY;
      }
      d = 1.0 / d;
      double delta = d * c;
      h *= delta;
      if (Math.abs(delta - 1.0) < EPSILON) {
        return logPrefactor(a, x) + Math.log(h);
      }
    }
    throw new ArithmeticException(
        "incomplete gamma continued fraction did not converge, a = " + a + ", x = " + x);
  }
}

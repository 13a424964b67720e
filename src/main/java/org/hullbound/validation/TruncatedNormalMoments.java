package org.hullbound.validation;

import org.apache.commons.math3.special.Erf;

/**
 * Mean and variance of a standard normal truncated to {@code [a, inf)}: mean {@code lambda =
 * phi(a) / Q(a)} (the inverse Mills ratio) and variance {@code 1 + a lambda - lambda^2} (Johnson,
 * Kotz and Balakrishnan 1994, <i>Continuous Univariate Distributions</i> vol. 1, 2nd ed., ch. 13,
 * section 10.1).
 *
 * <p>Why a class of its own: at {@code a = 37}, {@code Q(a)} is about 6e-300 and the variance
 * about 7e-4 is a difference of numbers near {@code 1400}; both are computed from Laplace's
 * continued fraction {@code Q(a) / phi(a) = 1 / (a + 1 / (a + 2 / (a + 3 / (a + ...))))}
 * (Abramowitz and Stegun 1964, 26.2.14), whose first level gives {@code lambda - a} without
 * cancellation. Below {@code a = 3}, where the fraction converges slowly, commons-math3's {@code
 * erfc} gives {@code Q(a)} directly.
 */
final class TruncatedNormalMoments {
  private static final int TERMS = 5000;
  private static final double LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

  private final double mean;
  private final double variance;

  private TruncatedNormalMoments(double mean, double variance) {
    this.mean = mean;
    this.variance = variance;
  }

  /** The moments for truncation point {@code a} (any finite value). */
  static TruncatedNormalMoments of(double a) {
    if (!Double.isFinite(a)) {
      throw new IllegalArgumentException("a must be finite, got " + a);
    }
    if (a < 3) {
      double q = 0.5 * Erf.erfc(a / Math.sqrt(2));
      double lambda = Math.exp(-0.5 * a * a - LOG_SQRT_2PI) / q;
      return new TruncatedNormalMoments(lambda, 1 + a * lambda - lambda * lambda);
    }
    // Backward evaluation of f_k = a + (k + 1) / f_{k+1}; f_0 = lambda, f_0 - a = 1 / f_1.
    double f = a;
    for (int k = TERMS; k >= 2; k--) {
      f = a + k / f;
    }
    double firstLevel = f;
    double lambda = a + 1 / firstLevel;
    // 1 + a lambda - lambda^2 = 1 - lambda (lambda - a) = 1 - lambda / f_1.
    return new TruncatedNormalMoments(lambda, 1 - lambda / firstLevel);
  }

  double mean() {
    return mean;
  }

  double variance() {
    return variance;
  }

  double sd() {
    return Math.sqrt(variance);
  }
}

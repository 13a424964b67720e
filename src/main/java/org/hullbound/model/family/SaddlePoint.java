package org.hullbound.model.family;

import org.apache.commons.math3.special.Gamma;

/**
 * Binomial and Poisson log masses in the saddle-point form of Loader (2000), "Fast and accurate
 * computation of binomial probabilities": a Stirling error and a deviance term {@code
 * x log(x / mean) + mean - x}, each small and accurate, instead of log-gamma differences and
 * {@code x log p} products of size {@code trials}.
 *
 * <p>Why: at {@code trials} near 1e15 the terms {@code log C(n, x)}, {@code x log p} and {@code
 * (n - x) log(1 - p)} are each near 1e15 and cancel to a log mass near -17, so their sum keeps
 * only about one significant digit (ulp(1e15) = 0.125) and the hull's log-concavity check reads
 * the rounding as curvature. Here the only large quantity is the difference {@code x - n p}, which
 * the caller passes in computed once with one rounding (a fused multiply-add), so a change of
 * {@code p} by one posterior standard deviation moves the log mass with about nine correct
 * digits.
 */
final class SaddlePoint {
  private static final double HALF_LOG_TWO_PI = 0.5 * Math.log(2 * Math.PI);

  private SaddlePoint() {}

  /** {@code lgamma(n + 1) - (n + 1/2) log(n) + n - log(2 pi)/2}, for {@code n > 0} (Loader 2000). */
  static double stirlingError(double n) {
    if (n < 15) {
      return Gamma.logGamma(n + 1) - (n + 0.5) * Math.log(n) + n - HALF_LOG_TWO_PI;
    }
    // Stirling series B_2k / (2k (2k - 1) n^(2k-1)): 1/12, 1/360, 1/1260, 1/1680, 1/1188.
    double w = 1 / (n * n);
    return (1.0 / 12 - (1.0 / 360 - (1.0 / 1260 - (1.0 / 1680 - w / 1188) * w) * w) * w) / n;
  }

  /**
   * {@code x log(x / mean) + mean - x} for {@code x > 0, mean > 0} (Loader's bd0), with {@code
   * excess = x - mean} given by the caller so that its rounding is the caller's one rounding; by
   * the series in {@code v = (x - mean)/(x + mean)} when x is near the mean, where the direct form
   * cancels.
   */
  static double deviance(double x, double mean, double excess) {
    if (Math.abs(excess) < 0.1 * (x + mean)) {
      double v = excess / (x + mean);
      double sum = excess * v;
      double term = 2 * x * v;
      double v2 = v * v;
      for (int j = 1; j < 1000; j++) {
        term *= v2;
        double next = sum + term / (2 * j + 1);
        if (next == sum) {
          return next;
        }
        sum = next;
      }
      return sum;
    }
    return x * Math.log(x / mean) - excess;
  }

  /**
   * {@code log C(n, x) + x log p + (n - x) log q} for {@code 0 < x < n} with {@code n - x}
   * exact in floating point, {@code p + q = 1},
   * {@code n p} and {@code n q} positive and normal, and {@code excess = x - n p} (Loader 2000,
   * dbinom_raw: the deviance of the successes from {@code n p} and of the failures from {@code n
   * q}, whose excess is {@code -excess}).
   */
  static double binomial(double x, double n, double p, double q, double excess) {
    return binomial(x, n, p, q, excess, binomialStirling(x, n), binomialSpread(x, n));
  }

  /**
   * The same from its two parts free of {@code p}, {@link #binomialStirling} and {@link
   * #binomialSpread}, worked out once for a row that is evaluated at many {@code p}: the same
   * operations in the same order, so the same bits.
   */
  static double binomial(double x, double n, double p, double q, double excess, double stirling,
      double spread) {
    double failures = n - x;
    double logCore = stirling - deviance(x, n * p, excess) - deviance(failures, n * q, -excess);
    return logCore - HALF_LOG_TWO_PI - 0.5 * spread;
  }

  /** The Stirling errors of {@link #binomial}: {@code e(n) - e(x) - e(n - x)}. */
  static double binomialStirling(double x, double n) {
    return stirlingError(n) - stirlingError(x) - stirlingError(n - x);
  }

  /** {@code log(x (n - x)/n)} of {@link #binomial}. */
  static double binomialSpread(double x, double n) {
    // from the failures themselves: log1p(-x/n) would cancel where x is near n
    return Math.log(x) + Math.log((n - x) / n);
  }

  /** {@code n p} and {@code n q} are where {@link #binomial} applies. */
  static boolean applies(double n, double p, double q) {
    double meanSuccesses = n * p;
    double meanFailures = n * q;
    return meanSuccesses >= Double.MIN_NORMAL && meanFailures >= Double.MIN_NORMAL
        && meanSuccesses < Double.POSITIVE_INFINITY && meanFailures < Double.POSITIVE_INFINITY;
  }
}

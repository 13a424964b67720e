package org.hullbound.diagnostics;

/**
 * Mean and variance that neither overflow for huge draws nor underflow for tiny ones.
 *
 * <p>Two passes (mean, then centred squares) avoid the cancellation of the one-pass sum of
 * squares; the centred values are divided by their largest magnitude before squaring, so that
 * draws near 1e200 or 1e-200 still give a finite, non-zero variance (common practice).
 */
final class Moments {
  private Moments() {}

  /** The arithmetic mean of {@code x[from, to)}, computed without intermediate overflow. */
  static double mean(double[] x, int from, int to) {
    int n = to - from;
    double sum = 0;
    for (int i = from; i < to; i++) {
      sum += x[i];
    }
    double mean = sum / n;
    if (Double.isFinite(mean)) {
      return mean;
    }
    double scaled = 0;
    for (int i = from; i < to; i++) {
      scaled += x[i] / n;
    }
    return scaled;
  }

  static double mean(double[] x) {
    return mean(x, 0, x.length);
  }

  /** The sample variance with divisor {@code n - 1}; 0 for one value; may overflow to infinity. */
  static double variance(double[] x, int from, int to) {
    double sd = standardDeviation(x, from, to);
    return sd * sd;
  }

  /**
   * The sample standard deviation with divisor {@code n - 1}; 0 for one value. Finite whenever
   * the centred draws are, even when the variance itself is beyond double range.
   */
  static double standardDeviation(double[] x, int from, int to) {
    int n = to - from;
    if (n < 2) {
      return 0;
    }
    double mean = mean(x, from, to);
    double largest = 0;
    for (int i = from; i < to; i++) {
      largest = Math.max(largest, Math.abs(x[i] - mean));
    }
    if (largest == 0 || Double.isInfinite(largest)) {
      // 0: all equal. Infinite: x[i] - mean overflowed, the spread is beyond double range.
      return largest;
    }
    double sum = 0;
    double correction = 0;
    for (int i = from; i < to; i++) {
      double d = (x[i] - mean) / largest;
      sum += d * d;
      correction += d;
    }
    // Correction term of the corrected two-pass algorithm (Chan, Golub and LeVeque 1983).
    double scaledVariance = Math.max(0, (sum - correction * correction / n) / (n - 1));
    return Math.sqrt(scaledVariance) * largest;
  }

  static double variance(double[] x) {
    return variance(x, 0, x.length);
  }

  /**
   * Centre and scale with which {@code (x - centre) / scale} has magnitude at most 1, so that
   * scale-free statistics (R-hat, effective sample size) can work on moderate numbers.
   */
  static double[] centreAndScale(Draws draws) {
    double[] all = draws.pooled();
    double centre = mean(all);
    double largest = 0;
    for (double x : all) {
      largest = Math.max(largest, Math.abs(x - centre));
    }
    return new double[] {centre, largest};
  }
}

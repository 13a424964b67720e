package org.hullbound.diagnostics;

/**
 * Sample quantiles by linear interpolation between order statistics, definition 7 of Hyndman and
 * Fan (1996), "Sample quantiles in statistical packages", The American Statistician 50(4).
 *
 * <p>Definition 7 is the most common default (common practice) and equals commons-math3's {@code
 * Percentile} with {@code EstimationType.R_7}: for sorted {@code x_1 <= ... <= x_n} and {@code h =
 * (n - 1) p + 1}, the p-quantile is {@code x_floor(h) + (h - floor(h)) (x_floor(h)+1 - x_floor(h))};
 * p = 0 gives the minimum and p = 1 the maximum.
 */
public final class Quantiles {
  private Quantiles() {}

  /**
   * The p-quantile of values already sorted ascending.
   *
   * @throws IllegalArgumentException if {@code sorted} is null or empty, or {@code p} is not in
   *     [0, 1]
   */
  public static double of(double[] sorted, double p) {
    if (sorted == null || sorted.length == 0) {
      throw new IllegalArgumentException("sorted must hold at least one value");
    }
    if (!(p >= 0 && p <= 1)) {
      throw new IllegalArgumentException("p must be in [0, 1], got " + p);
    }
    double h = (sorted.length - 1) * p;
    int below = (int) Math.floor(h);
    if (below >= sorted.length - 1) {
      return sorted[sorted.length - 1];
    }
    double weight = h - below;
    double lower = sorted[below];
    double upper = sorted[below + 1];
    if (weight == 0 || lower == upper) {
      return lower;
    }
    double difference = upper - lower;
    if (Double.isInfinite(difference) && Double.isFinite(lower) && Double.isFinite(upper)) {
      // The gap overflows (draws near -MAX and +MAX); the weighted form stays in range.
      return (1 - weight) * lower + weight * upper;
    }
    return lower + weight * difference;
  }

  /**
   * The p-quantile of all draws of all chains pooled.
   *
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static double of(Draws draws, double p) {
    return of(draws.requireFinite().sorted(), p);
  }
}

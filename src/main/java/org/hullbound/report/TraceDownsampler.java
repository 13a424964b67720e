package org.hullbound.report;

/**
 * Thins a long chain to a bounded number of plot points by keeping, for each run of consecutive
 * draws, its smallest and its largest finite value in the order they occurred.
 *
 * <p>A plot of 100 000 draws is at most a few hundred pixels wide; keeping both extremes of every
 * bucket draws the same envelope as the full trace, so a single spike is never hidden, while the
 * report stays small. Non-finite draws are left out; a bucket with none finite becomes a gap.
 */
final class TraceDownsampler {
  private TraceDownsampler() {}

  /**
   * The trace of {@code chain} at x = 1..n with at most {@code maxPoints} points (at least 2).
   *
   * @throws IllegalArgumentException if {@code maxPoints < 2}
   */
  static Series minMax(String name, double[] chain, int maxPoints) {
    if (maxPoints < 2) {
      throw new IllegalArgumentException("maxPoints must be >= 2, got " + maxPoints);
    }
    int n = chain.length;
    if (n <= maxPoints) {
      double[] x = new double[n];
      for (int i = 0; i < n; i++) {
        x[i] = i + 1;
      }
      return new Series(name, x, chain);
    }
    int buckets = maxPoints / 2;
    double[] x = new double[2 * buckets];
    double[] y = new double[2 * buckets];
    for (int b = 0; b < buckets; b++) {
      // Bucket b covers draws [from, to), the n draws split as evenly as integers allow.
      int from = (int) ((long) b * n / buckets);
      int to = (int) ((long) (b + 1) * n / buckets);
      int lowest = -1;
      int highest = -1;
      for (int i = from; i < to; i++) {
        double v = chain[i];
        if (Double.isFinite(v)) {
          if (lowest < 0 || v < chain[lowest]) {
            lowest = i;
          }
          if (highest < 0 || v > chain[highest]) {
            highest = i;
          }
        }
      }
      int first = Math.min(lowest, highest);
      int second = Math.max(lowest, highest);
      if (first < 0) {
        x[2 * b] = from + 1;
        y[2 * b] = Double.NaN;
        x[2 * b + 1] = to;
        y[2 * b + 1] = Double.NaN;
      } else {
        x[2 * b] = first + 1;
        y[2 * b] = chain[first];
        x[2 * b + 1] = second + 1;
        y[2 * b + 1] = chain[second];
      }
    }
    return new Series(name, x, y);
  }
}

package org.hullbound.report;

import java.util.Arrays;

/**
 * A Gaussian kernel density estimate with Silverman's rule-of-thumb bandwidth (Silverman 1986,
 * "Density Estimation for Statistics and Data Analysis", eq. 3.31).
 *
 * <p>It draws the smooth marginal curves of the report; the rule {@code h = 0.9 A n^(-1/5)}, {@code
 * A = min(sd, IQR / 1.34)}, is robust to heavy tails and needs no tuning. Evaluation sums only over
 * draws within eight bandwidths of the point (the kernel beyond is below 1.3e-14 of its peak).
 */
public final class KernelDensity {
  /** Kernel terms beyond this many bandwidths are below exp(-32) and left out. */
  private static final double CUTOFF = 8.0;

  private static final double INV_SQRT_2PI = 1.0 / Math.sqrt(2.0 * Math.PI);

  private final double[] sorted;
  private final double bandwidth;

  private KernelDensity(double[] sorted, double bandwidth) {
    this.sorted = sorted;
    this.bandwidth = bandwidth;
  }

  /**
   * The estimate from {@code sample} with Silverman's bandwidth.
   *
   * @throws IllegalArgumentException if the sample has fewer than two values, a value that is not
   *     finite, or no spread (all values equal), since then no bandwidth exists
   */
  public static KernelDensity of(double[] sample) {
    double[] sorted = checkedSortedCopy(sample);
    return new KernelDensity(sorted, silvermanBandwidth(sorted));
  }

  /**
   * The estimate from {@code sample} with a given bandwidth.
   *
   * @throws IllegalArgumentException if the sample is empty or not finite, or {@code bandwidth} is
   *     not a positive normal double
   */
  public static KernelDensity of(double[] sample, double bandwidth) {
    if (!(bandwidth >= Double.MIN_NORMAL) || Double.isInfinite(bandwidth)) {
      throw new IllegalArgumentException(
          "bandwidth must be a finite positive normal double, got " + bandwidth);
    }
    if (sample == null || sample.length == 0) {
      throw new IllegalArgumentException("sample must hold at least one value, got none");
    }
    double[] sorted = sample.clone();
    for (int i = 0; i < sorted.length; i++) {
      if (!Double.isFinite(sorted[i])) {
        throw new IllegalArgumentException(
            "sample values must be finite, got " + sorted[i] + " at index " + i);
      }
    }
    Arrays.sort(sorted);
    return new KernelDensity(sorted, bandwidth);
  }

  /**
   * Silverman's rule-of-thumb bandwidth {@code 0.9 min(sd, IQR/1.34) n^(-1/5)} (Silverman 1986, eq.
   * 3.31); the IQR uses linearly interpolated quantiles (Hyndman and Fan 1996, type 7). When the
   * IQR is zero but the sd is not (many ties), the sd alone is used.
   *
   * @throws IllegalArgumentException as {@link #of(double[])}
   */
  public static double silvermanBandwidth(double[] sample) {
    double[] sorted = sample;
    if (!isSortedFinite(sample)) {
      sorted = checkedSortedCopy(sample);
    } else if (sample.length < 2) {
      throw new IllegalArgumentException(
          "sample must hold at least two values for a bandwidth, got " + sample.length);
    }
    int n = sorted.length;
    // Scale to the largest magnitude first so that squares of huge or tiny values neither
    // overflow nor underflow; the rule is scale-equivariant, so the scale is put back at the end.
    double scale = Math.max(Math.abs(sorted[0]), Math.abs(sorted[n - 1]));
    double mean = 0;
    for (double v : sorted) {
      mean += v / scale;
    }
    mean /= n;
    double squares = 0;
    for (double v : sorted) {
      double d = v / scale - mean;
      squares += d * d;
    }
    double sd = Math.sqrt(squares / (n - 1));
    double iqr = quantile(sorted, 0.75) / scale - quantile(sorted, 0.25) / scale;
    double spread = iqr > 0 ? Math.min(sd, iqr / 1.34) : sd;
    double h = 0.9 * spread * Math.pow(n, -0.2) * scale;
    if (!(h >= Double.MIN_NORMAL) || Double.isInfinite(h)) {
      throw new IllegalArgumentException(
          "sample has no spread: all "
              + n
              + " values equal "
              + sorted[0]
              + " (or differ below double precision), so no bandwidth exists");
    }
    return h;
  }

  /** The bandwidth (standard deviation of the Gaussian kernel). */
  public double bandwidth() {
    return bandwidth;
  }

  /** The number of draws behind the estimate. */
  public int size() {
    return sorted.length;
  }

  /** The smallest draw. */
  public double min() {
    return sorted[0];
  }

  /** The largest draw. */
  public double max() {
    return sorted[sorted.length - 1];
  }

  /** The estimated density at {@code x}; 0 far from the data, NaN only for a NaN {@code x}. */
  public double density(double x) {
    if (Double.isNaN(x)) {
      return Double.NaN;
    }
    int from = lowerBound(x - CUTOFF * bandwidth);
    double sum = 0;
    for (int i = from; i < sorted.length; i++) {
      double u = (x - sorted[i]) / bandwidth;
      if (u < -CUTOFF) {
        break;
      }
      sum += Math.exp(-0.5 * u * u);
    }
    return sum * INV_SQRT_2PI / bandwidth / sorted.length;
  }

  /** The density at each point of {@code xs}. */
  public double[] density(double[] xs) {
    double[] out = new double[xs.length];
    for (int i = 0; i < xs.length; i++) {
      out[i] = density(xs[i]);
    }
    return out;
  }

  private int lowerBound(double x) {
    int lo = 0;
    int hi = sorted.length;
    while (lo < hi) {
      int mid = (lo + hi) >>> 1;
      if (sorted[mid] < x) {
        lo = mid + 1;
      } else {
        hi = mid;
      }
    }
    return lo;
  }

  /** Hyndman and Fan (1996) type 7 quantile of sorted values: linear between order statistics. */
  static double quantile(double[] sorted, double p) {
    double position = p * (sorted.length - 1);
    int below = (int) Math.floor(position);
    int above = Math.min(below + 1, sorted.length - 1);
    double weight = position - below;
    // The weighted-sum form cannot overflow even for neighbours near the largest doubles.
    return (1 - weight) * sorted[below] + weight * sorted[above];
  }

  private static boolean isSortedFinite(double[] sample) {
    if (sample == null) {
      return false;
    }
    for (int i = 0; i < sample.length; i++) {
      if (!Double.isFinite(sample[i]) || (i > 0 && sample[i] < sample[i - 1])) {
        return false;
      }
    }
    return true;
  }

  private static double[] checkedSortedCopy(double[] sample) {
    if (sample == null || sample.length < 2) {
      throw new IllegalArgumentException(
          "sample must hold at least two values for a bandwidth, got "
              + (sample == null ? "null" : sample.length));
    }
    double[] sorted = sample.clone();
    for (int i = 0; i < sorted.length; i++) {
      if (!Double.isFinite(sorted[i])) {
        throw new IllegalArgumentException(
            "sample values must be finite, got " + sorted[i] + " at index " + i);
      }
    }
    Arrays.sort(sorted);
    return sorted;
  }
}

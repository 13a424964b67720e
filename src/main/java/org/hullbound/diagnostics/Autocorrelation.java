package org.hullbound.diagnostics;

import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;

/**
 * Sample autocovariance and autocorrelation of a chain, computed by the fast Fourier transform.
 *
 * <p>The FFT makes all lags cost O(N log N) instead of O(N^2), which matters for the long chains
 * the effective sample size needs. The estimator is the usual biased one, divisor N at every lag
 * (Geyer 1992, Statistical Science 7(4), section 3.1; Vehtari et al. 2021, section 3.2): its
 * sequence is positive semi-definite and shrinks to 0 at long lags. The chain is centred and zero
 * padded to a power of two at least 2N, so that the circular convolution of the FFT equals the
 * linear one (common practice).
 */
public final class Autocorrelation {
  private Autocorrelation() {}

  /**
   * Autocovariance at lags 0 to N - 1, {@code gamma(t) = (1/N) sum_{i<N-t} (x_i - m)(x_{i+t} - m)}.
   *
   * @throws IllegalArgumentException if {@code chain} is null or empty
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static double[] autocovariance(double[] chain) {
    requireChain(chain);
    int n = chain.length;
    double mean = Moments.mean(chain);
    double scale = 0;
    for (double x : chain) {
      scale = Math.max(scale, Math.abs(x - mean));
    }
    double[] gamma = new double[n];
    if (scale == 0) {
      return gamma;
    }
    double[] correlation = scaledAutocovariance(chain, mean, scale);
    for (int t = 0; t < n; t++) {
      gamma[t] = correlation[t] * scale * scale;
    }
    return gamma;
  }

  /**
   * Autocorrelation at lags 0 to N - 1 (lag 0 is 1).
   *
   * @return the autocorrelations; every entry is NaN when the chain is constant, for which
   *     autocorrelation is undefined
   * @throws IllegalArgumentException if {@code chain} is null or empty
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static double[] of(double[] chain) {
    requireChain(chain);
    double mean = Moments.mean(chain);
    double scale = 0;
    for (double x : chain) {
      scale = Math.max(scale, Math.abs(x - mean));
    }
    double[] rho = new double[chain.length];
    if (scale == 0) {
      java.util.Arrays.fill(rho, Double.NaN);
      return rho;
    }
    double[] gamma = scaledAutocovariance(chain, mean, scale);
    for (int t = 0; t < rho.length; t++) {
      rho[t] = gamma[t] / gamma[0];
    }
    rho[0] = 1;
    return rho;
  }

  /**
   * Autocorrelation at lags 0 to {@code maxLag}, for plots.
   *
   * @throws IllegalArgumentException if {@code maxLag} is not in [0, N - 1]
   */
  public static double[] of(double[] chain, int maxLag) {
    requireChain(chain);
    requireLag(maxLag, chain.length);
    return java.util.Arrays.copyOf(of(chain), maxLag + 1);
  }

  /**
   * The autocorrelation of every chain at lags 0 to {@code maxLag}: {@code result[c][t]}.
   *
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static double[][] perChain(Draws draws, int maxLag) {
    draws.requireFinite();
    requireLag(maxLag, draws.length());
    double[][] rho = new double[draws.chainCount()][];
    for (int c = 0; c < rho.length; c++) {
      rho[c] = of(draws.values()[c], maxLag);
    }
    return rho;
  }

  /**
   * The autocorrelation averaged over chains at lags 0 to {@code maxLag}, for plots. Constant
   * chains, whose autocorrelation is undefined, are left out of the average; the result is all
   * NaN when every chain is constant.
   *
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static double[] averaged(Draws draws, int maxLag) {
    double[][] rho = perChain(draws, maxLag);
    double[] mean = new double[maxLag + 1];
    int used = 0;
    for (double[] chain : rho) {
      if (Double.isNaN(chain[0])) {
        continue;
      }
      used++;
      for (int t = 0; t <= maxLag; t++) {
        mean[t] += chain[t];
      }
    }
    for (int t = 0; t <= maxLag; t++) {
      mean[t] = used == 0 ? Double.NaN : mean[t] / used;
    }
    return mean;
  }

  /**
   * The mean over chains of each chain's autocovariance (about its own mean, divisor N) at lags
   * 0 to N - 1, with about M/2 + 1 transforms instead of 2M: the inverse transform is linear, so
   * the chains' power spectra are summed before one inverse; and two real chains share one
   * complex forward transform, {@code z = a + ib}, their power spectra summing to {@code
   * (|Z(k)|^2 + |Z(-k)|^2) / 2} (the two-for-one trick; Press et al., Numerical Recipes, section
   * 12.3, recalled from memory). Chains must be finite and of moderate magnitude.
   */
  static double[] meanAutocovariance(double[][] chains) {
    int m = chains.length;
    int n = chains[0].length;
    int size = Integer.highestOneBit(Math.max(1, 2 * n - 1)) << 1;
    double[] power = new double[size];
    double[][] data = new double[2][size];
    for (int c = 0; c < m; c += 2) {
      java.util.Arrays.fill(data[0], 0);
      java.util.Arrays.fill(data[1], 0);
      double meanA = Moments.mean(chains[c]);
      for (int i = 0; i < n; i++) {
        data[0][i] = chains[c][i] - meanA;
      }
      if (c + 1 < m) {
        double meanB = Moments.mean(chains[c + 1]);
        for (int i = 0; i < n; i++) {
          data[1][i] = chains[c + 1][i] - meanB;
        }
      }
      FastFourierTransformer.transformInPlace(
          data, DftNormalization.STANDARD, TransformType.FORWARD);
      for (int k = 0; k < size; k++) {
        int mirror = (size - k) % size;
        double here = data[0][k] * data[0][k] + data[1][k] * data[1][k];
        double there = data[0][mirror] * data[0][mirror] + data[1][mirror] * data[1][mirror];
        power[k] += (here + there) / 2;
      }
    }
    double[][] spectrum = {power, new double[size]};
    FastFourierTransformer.transformInPlace(
        spectrum, DftNormalization.STANDARD, TransformType.INVERSE);
    double[] gamma = new double[n];
    for (int t = 0; t < n; t++) {
      gamma[t] = spectrum[0][t] / n / m;
    }
    return gamma;
  }

  /** Autocovariance of {@code (x - mean) / scale} by FFT, divisor N. */
  private static double[] scaledAutocovariance(double[] chain, double mean, double scale) {
    int n = chain.length;
    int size = Integer.highestOneBit(Math.max(1, 2 * n - 1)) << 1;
    double[][] data = new double[2][size];
    for (int i = 0; i < n; i++) {
      data[0][i] = (chain[i] - mean) / scale;
    }
    FastFourierTransformer.transformInPlace(data, DftNormalization.STANDARD, TransformType.FORWARD);
    for (int k = 0; k < size; k++) {
      double re = data[0][k];
      double im = data[1][k];
      data[0][k] = re * re + im * im;
      data[1][k] = 0;
    }
    // STANDARD normalisation divides the inverse transform by the size.
    FastFourierTransformer.transformInPlace(data, DftNormalization.STANDARD, TransformType.INVERSE);
    double[] gamma = new double[n];
    for (int t = 0; t < n; t++) {
      gamma[t] = data[0][t] / n;
    }
    return gamma;
  }

  private static void requireChain(double[] chain) {
    if (chain == null) {
      throw new IllegalArgumentException("chain must not be null");
    }
    if (chain.length == 0) {
      throw new IllegalArgumentException("chain must hold at least one draw, got 0");
    }
    for (int i = 0; i < chain.length; i++) {
      if (!Double.isFinite(chain[i])) {
        long count = java.util.Arrays.stream(chain).filter(x -> !Double.isFinite(x)).count();
        throw new NonFiniteDrawException(0, i, chain[i], count);
      }
    }
  }

  private static void requireLag(int maxLag, int length) {
    if (maxLag < 0 || maxLag >= length) {
      throw new IllegalArgumentException(
          "maxLag must be in [0, " + (length - 1) + "] for chains of " + length
              + " draws, got " + maxLag);
    }
  }
}

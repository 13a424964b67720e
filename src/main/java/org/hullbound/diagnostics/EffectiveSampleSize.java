package org.hullbound.diagnostics;

/**
 * Effective sample size of draws from several chains: the number of independent draws that
 * would estimate a mean as precisely as these do.
 *
 * <p>Why: correlated draws carry less information than their count, and the effective sample
 * size tells how much less. The estimator is {@code S / tau} with {@code S = M N} draws and the
 * integrated autocorrelation time {@code tau = -1 + 2 sum_{k=0}^{K} P_k}, where {@code P_k =
 * rho_2k + rho_2k+1} are sums of adjacent autocorrelations truncated at the first negative one
 * and made non-increasing (Geyer's initial monotone sequence; Geyer 1992, Statistical Science
 * 7(4), section 3.3). The autocorrelations combine the chains through the within-chain variance W
 * and the pooled variance estimate var+ (Vehtari, Gelman, Simpson, Carpenter and Buerkner 2021,
 * Bayesian Analysis 16(2), section 3.2, equation 10): {@code rho_t = 1 - (W - mean_m(s_m^2
 * rho_t,m)) / var+}, so that chains that disagree lower the effective sample size.
 *
 * <p>Bulk, tail, quantile and mean variants apply this estimator to split chains transformed as
 * the 2021 paper prescribes (section 4). Results are NaN when undefined: all draws equal, or, for
 * the tail and quantile variants, an indicator that is constant.
 */
public final class EffectiveSampleSize {
  private EffectiveSampleSize() {}

  /**
   * The effective sample size of the chains as they are (not split, not rank-normalised).
   *
   * @return the estimate, at most {@code S log10 S} (see below); NaN if all draws are equal
   * @throws IllegalArgumentException if the chains hold fewer than 2 draws each
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static double of(Draws draws) {
    draws.requireFinite();
    int m = draws.chainCount();
    int n = draws.length();
    if (n < 2) {
      throw new IllegalArgumentException(
          "effective sample size needs at least 2 draws per chain, got " + n);
    }
    if (draws.isConstant()) {
      return Double.NaN;
    }
    double[] centreAndScale = Moments.centreAndScale(draws);
    double[][] x = draws.values();
    double[][] standard = new double[m][n];
    double[] chainMeans = new double[m];
    for (int c = 0; c < m; c++) {
      for (int i = 0; i < n; i++) {
        standard[c][i] = (x[c][i] - centreAndScale[0]) / centreAndScale[1];
      }
      chainMeans[c] = Moments.mean(standard[c]);
    }
    // Step 1. mean_m(s_m^2 rho_t,m): the chains' mean biased autocovariance rescaled to the divisor
    // n - 1 of s_m^2; at lag 0 it is W, the mean within-chain variance.
    double[] meanAutocovariance = Autocorrelation.meanAutocovariance(standard);
    for (int t = 0; t < n; t++) {
      meanAutocovariance[t] *= n / (n - 1.0);
    }
    // Step 2. W, and var+ = (N - 1)/N W + B/N (Vehtari et al. 2021, equations 3-4).
    double within = meanAutocovariance[0];
    double between = m > 1 ? Moments.variance(chainMeans) : 0;
    double varPlus = (n - 1.0) / n * within + between;

    // Step 3. Geyer (1992): pair sums P_k of the combined autocorrelations, stopped before the
    // first negative one (initial positive sequence) and made non-increasing (initial monotone).
    double pairSum = 0;
    double previousPair = Double.POSITIVE_INFINITY;
    for (int k = 0; 2 * k + 1 < n; k++) {
      // Vehtari et al. (2021), equation 10: rho_t = 1 - (W - mean_m(s_m^2 rho_t,m)) / var+.
      double pair =
          2 - (2 * within - meanAutocovariance[2 * k] - meanAutocovariance[2 * k + 1]) / varPlus;
      if (pair < 0) {
        break;
      }
      pair = Math.min(pair, previousPair);
      pairSum += pair;
      previousPair = pair;
    }
    // Step 4. tau = -1 + 2 sum P_k and ESS = S / tau.
    double tau = -1 + 2 * pairSum;
    double s = (double) m * n;
    // Safeguard against tau near 0 or below it for strongly antithetic chains: cap the effective
    // sample size at S log10 S (the bound Stan uses; recalled from memory, not in the paper).
    tau = Math.max(tau, 1 / Math.max(1, Math.log10(s)));
    return s / tau;
  }

  /**
   * Bulk effective sample size: of rank-normalised split chains (Vehtari et al. 2021, section
   * 4.1), a measure of how well the centre of the distribution is explored.
   *
   * @throws IllegalArgumentException if the chains hold fewer than 4 draws each
   */
  public static double bulk(Draws draws) {
    requireSplittable(draws);
    Draws split = draws.requireFinite().split();
    if (split.isConstant()) {
      return Double.NaN;
    }
    return of(RankNormalization.normalScores(split));
  }

  /**
   * Tail effective sample size: the smaller of the quantile effective sample sizes at 5% and 95%
   * (Vehtari et al. 2021, section 4.3), a measure of how well the tails are explored.
   *
   * @throws IllegalArgumentException if the chains hold fewer than 4 draws each
   */
  public static double tail(Draws draws) {
    double lower = quantile(draws, 0.05);
    double upper = quantile(draws, 0.95);
    if (Double.isNaN(lower) || Double.isNaN(upper)) {
      return Double.NaN;
    }
    return Math.min(lower, upper);
  }

  /**
   * Effective sample size for the p-quantile: of the indicator {@code x <= q_p} on split chains,
   * {@code q_p} the {@link Quantiles} estimate from all split draws (Vehtari et al. 2021, section
   * 4.3). NaN when the indicator is constant (p beyond the ties at an end of the draws).
   *
   * @throws IllegalArgumentException if {@code p} is not in (0, 1) or the chains hold fewer than
   *     4 draws each
   */
  public static double quantile(Draws draws, double p) {
    if (!(p > 0 && p < 1)) {
      throw new IllegalArgumentException("p must be in (0, 1), got " + p);
    }
    requireSplittable(draws);
    Draws split = draws.requireFinite().split();
    return quantileOfSplit(split, split.sorted(), p);
  }

  /** {@link #quantile} given the split chains and their sorted pooled draws. */
  static double quantileOfSplit(Draws split, double[] splitSorted, double p) {
    double q = Quantiles.of(splitSorted, p);
    Draws indicator = split.map(x -> x <= q ? 1 : 0);
    return indicator.isConstant() ? Double.NaN : of(indicator);
  }

  /**
   * Effective sample size for the mean: of split chains, not rank-normalised (Vehtari et al.
   * 2021, section 4.3), the one to divide the standard deviation by for the Monte Carlo standard
   * error of the mean.
   *
   * @throws IllegalArgumentException if the chains hold fewer than 4 draws each
   */
  public static double mean(Draws draws) {
    requireSplittable(draws);
    return of(draws.requireFinite().split());
  }

  static void requireSplittable(Draws draws) {
    if (draws.length() < 4) {
      throw new IllegalArgumentException(
          "split-chain diagnostics need at least 4 draws per chain (2 per half), got "
              + draws.length());
    }
  }
}

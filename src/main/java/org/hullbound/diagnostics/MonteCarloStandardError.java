package org.hullbound.diagnostics;

import org.apache.commons.math3.distribution.BetaDistribution;

/**
 * Monte Carlo standard errors: how far an estimate from these draws may be from the exact
 * posterior value because the chains are finite.
 *
 * <p>Why: a posterior mean reported to six digits is misleading when only two are settled. The
 * mean's error is {@code sd / sqrt(ess_mean)}; a quantile's error comes from the Beta
 * distribution of the cumulative probability at the estimate, with the quantile effective sample
 * size in place of the draw count (Vehtari, Gelman, Simpson, Carpenter and Buerkner 2021,
 * Bayesian Analysis 16(2), section 4.3).
 */
public final class MonteCarloStandardError {
  /** Phi(-1) and Phi(1): the central one-standard-deviation interval of a normal. */
  private static final double BELOW_ONE_SD = 0.15865525393145707;

  private static final double ABOVE_ONE_SD = 0.8413447460685429;

  private MonteCarloStandardError() {}

  /**
   * Standard error of the mean: pooled standard deviation over the square root of the mean's
   * effective sample size ({@link EffectiveSampleSize#mean}); NaN when all draws are equal.
   *
   * @throws IllegalArgumentException if the chains hold fewer than 4 draws each
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static double mean(Draws draws) {
    double ess = EffectiveSampleSize.mean(draws);
    double[] all = draws.pooled();
    return Moments.standardDeviation(all, 0, all.length) / Math.sqrt(ess);
  }

  /**
   * Standard error of the p-quantile (Vehtari et al. 2021, section 4.3): with {@code e} the
   * quantile effective sample size, take the Phi(-1) and Phi(1) quantiles {@code a1, a2} of
   * Beta(e p + 1, e (1 - p) + 1); the error is half the distance between the sorted draws of
   * (1-based) rank {@code max(floor(a1 S), 1)} and {@code min(ceil(a2 S), S)}. NaN when the
   * quantile effective sample size is undefined.
   *
   * @throws IllegalArgumentException if {@code p} is not in (0, 1) or the chains hold fewer than
   *     4 draws each
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static double quantile(Draws draws, double p) {
    double ess = EffectiveSampleSize.quantile(draws, p);
    return quantileGivenEss(draws.sorted(), p, ess);
  }

  /** {@link #quantile} given all draws sorted and the quantile effective sample size. */
  static double quantileGivenEss(double[] sorted, double p, double ess) {
    if (Double.isNaN(ess)) {
      return Double.NaN;
    }
    // Steps of Vehtari et al. (2021), section 4.3:
    // (1) Beta quantiles of the cumulative probability at the estimate.
    BetaDistribution beta = new BetaDistribution(null, ess * p + 1, ess * (1 - p) + 1);
    double lowerProbability = beta.inverseCumulativeProbability(BELOW_ONE_SD);
    double upperProbability = beta.inverseCumulativeProbability(ABOVE_ONE_SD);
    // (2) The draws at those cumulative probabilities.
    int s = sorted.length;
    int lowerRank = (int) Math.max(Math.floor(lowerProbability * s), 1);
    int upperRank = (int) Math.min(Math.ceil(upperProbability * s), s);
    // (3) Half their distance: a one-standard-deviation error.
    return sorted[upperRank - 1] / 2 - sorted[lowerRank - 1] / 2;
  }
}

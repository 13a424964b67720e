package org.hullbound.diagnostics;

/**
 * The posterior probability that an unknown lies above (or below) a value, estimated as the share
 * of draws beyond it, with its Monte Carlo standard error.
 *
 * <p>The share is the mean of the indicator draws {@code I(x > value)}, so its error is the
 * standard error of a mean, with the effective sample size of the indicator draws themselves
 * (split chains, not rank-normalised), as Vehtari et al. (2021, "Rank-normalization, folding, and
 * localization: an improved R-hat for assessing convergence of MCMC", section 4.3) estimate the
 * error of any mean; for independent draws it is close to the binomial {@code sqrt(p (1 - p) /
 * S)}. When every draw lies on one side the indicator is constant and the error is NaN: the
 * draws say only that the probability is near 0 or 1.
 *
 * @param estimate the share of draws strictly beyond the value
 * @param mcse its Monte Carlo standard error; NaN when every draw is on one side
 * @param ess the effective sample size of the indicator draws; NaN likewise
 */
public record TailShare(double estimate, double mcse, double ess) {

  /** The share of {@code draws} strictly above {@code value} ({@code above}) or strictly below. */
  public static TailShare of(Draws draws, double value, boolean above) {
    draws.requireFinite();
    double[][] indicator = new double[draws.chainCount()][draws.length()];
    double count = 0;
    for (int c = 0; c < indicator.length; c++) {
      double[] chain = draws.chain(c);
      for (int i = 0; i < chain.length; i++) {
        boolean beyond = above ? chain[i] > value : chain[i] < value;
        indicator[c][i] = beyond ? 1.0 : 0.0;
        count += indicator[c][i];
      }
    }
    double total = (double) indicator.length * draws.length();
    double share = count / total;
    if (count == 0 || count == total) {
      return new TailShare(share, Double.NaN, Double.NaN);
    }
    Draws indicators = Draws.of(indicator);
    return new TailShare(
        share, MonteCarloStandardError.mean(indicators), EffectiveSampleSize.mean(indicators));
  }
}

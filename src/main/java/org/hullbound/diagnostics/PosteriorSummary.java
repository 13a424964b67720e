package org.hullbound.diagnostics;

import java.util.ArrayList;
import java.util.List;

/**
 * Builds the {@link VariableSummary} of one unknown from its draws: moments, quantiles,
 * rank-normalised split R-hat, bulk and tail effective sample size, Monte Carlo standard errors.
 *
 * <p>One call gives everything a report needs, and never throws for draws that are merely
 * awkward: constant draws, too few draws and non-finite draws each give a summary whose {@link
 * VariableSummary#state()} and notes say what could not be computed. Methods: Vehtari, Gelman,
 * Simpson, Carpenter and Buerkner (2021), Bayesian Analysis 16(2).
 */
public final class PosteriorSummary {
  /** Fewest draws per chain for split-chain diagnostics: 2 per half. */
  public static final int MINIMUM_DRAWS_PER_CHAIN = 4;

  private PosteriorSummary() {}

  /**
   * Summarises draws held chain x iteration.
   *
   * @param name the unknown's name, non-blank
   * @param draws {@code draws[c][i]}, iteration {@code i} of chain {@code c}; chains of equal
   *     length
   * @throws IllegalArgumentException if the name is blank or the array is null, empty or ragged
   */
  public static VariableSummary of(String name, double[][] draws) {
    return of(name, Draws.of(draws));
  }

  /** Summarises validated draws; see {@link #of(String, double[][])}. */
  public static VariableSummary of(String name, Draws draws) {
    int m = draws.chainCount();
    int n = draws.length();
    List<String> notes = new ArrayList<>();
    double nan = Double.NaN;
    try {
      draws.requireFinite();
    } catch (NonFiniteDrawException e) {
      notes.add(
          "draw "
              + e.iteration()
              + " of chain "
              + e.chain()
              + " (0-based) is "
              + e.value()
              + ", one of "
              + nonFiniteCount(draws)
              + " non-finite draws; nothing was computed");
      return new VariableSummary(
          name, m, n, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan,
          VariableSummary.State.NON_FINITE, notes);
    }

    double[] sorted = draws.sorted();
    double mean = Moments.mean(sorted);
    double sd = Moments.standardDeviation(sorted, 0, sorted.length);
    double q025 = Quantiles.of(sorted, 0.025);
    double q50 = Quantiles.of(sorted, 0.5);
    double q975 = Quantiles.of(sorted, 0.975);

    if (draws.isConstant()) {
      notes.add(
          (sorted.length == 1 ? "the only draw is " : "all " + sorted.length + " draws equal ")
              + sorted[0]
              + ", so R-hat, effective sample size and Monte Carlo error are undefined");
      return new VariableSummary(
          name, m, n, mean, 0, q025, q50, q975, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan,
          VariableSummary.State.CONSTANT, notes);
    }
    if (n < MINIMUM_DRAWS_PER_CHAIN) {
      notes.add(
          n
              + " draw"
              + (n == 1 ? "" : "s")
              + " per chain are too few for split-chain diagnostics (at least "
              + MINIMUM_DRAWS_PER_CHAIN
              + " needed), so R-hat, effective sample size and Monte Carlo error are undefined");
      return new VariableSummary(
          name, m, n, mean, sd, q025, q50, q975, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan,
          VariableSummary.State.TOO_SHORT, notes);
    }

    if (draws.splitDropsMiddle()) {
      notes.add(
          "chains have odd length "
              + n
              + ": the middle draw (0-based iteration "
              + n / 2
              + ") of each chain is left out of the split-chain diagnostics");
    }
    // Each transform is made once and shared by the diagnostics that use it; the public
    // functions of this package compute the same values one by one.
    Draws split = draws.split();
    double[] splitSorted = split.sorted();
    Draws scores = RankNormalization.normalScores(split);
    RankNormalizedRhat rhat = Rhat.ofNormalScores(scores, Rhat.foldedNormalScores(split));
    if (rhat.bulk() == Double.POSITIVE_INFINITY) {
      notes.add("every half-chain is constant but they differ: the chains are stuck apart");
    }
    if (twoValued(sorted)) {
      return twoValued(name, draws, sorted, split, splitSorted, scores, rhat, mean, sd, notes);
    }
    if (Double.isNaN(rhat.tail())) {
      notes.add(
          "the draws folded around their median are all equal, so tail R-hat and hence R-hat"
              + " are undefined");
    }
    double essBulk = EffectiveSampleSize.of(scores);
    double essLower = EffectiveSampleSize.quantileOfSplit(split, splitSorted, 0.05);
    double essUpper = EffectiveSampleSize.quantileOfSplit(split, splitSorted, 0.95);
    double essTail =
        Double.isNaN(essLower) || Double.isNaN(essUpper) ? nan : Math.min(essLower, essUpper);
    if (Double.isNaN(essTail)) {
      notes.add(
          "the 5% or the 95% quantile lies in a run of tied draws at an end, so tail effective"
              + " sample size is undefined");
    }
    double essMean = EffectiveSampleSize.of(split);
    double mcseMean = sd / Math.sqrt(essMean);
    double mcseQ025 = quantileError(split, splitSorted, sorted, 0.025);
    double mcseQ50 = quantileError(split, splitSorted, sorted, 0.5);
    double mcseQ975 = quantileError(split, splitSorted, sorted, 0.975);
    if (Double.isNaN(mcseQ025) || Double.isNaN(mcseQ50) || Double.isNaN(mcseQ975)) {
      notes.add(
          "a quantile lies in a run of tied draws at an end, so its Monte Carlo error is"
              + " undefined");
    }
    return new VariableSummary(
        name,
        m,
        n,
        mean,
        sd,
        q025,
        q50,
        q975,
        rhat.max(),
        rhat.bulk(),
        rhat.tail(),
        essBulk,
        essTail,
        essMean,
        mcseMean,
        mcseQ025,
        mcseQ50,
        mcseQ975,
        VariableSummary.State.COMPLETE,
        notes);
  }

  /** Whether every draw is one of two values (the draws are known not to be constant). */
  private static boolean twoValued(double[] sorted) {
    double low = sorted[0];
    double high = sorted[sorted.length - 1];
    for (double x : sorted) {
      if (x != low && x != high) {
        return false;
      }
    }
    return true;
  }

  /**
   * The summary of draws of two values a &lt; b (a bernoulli, a categorical over two values, a
   * whole number that the data pin to two): tail-ESS is left undefined and the verdict rests on
   * bulk-ESS and R-hat.
   *
   * <p>Why (common practice, argued here): the draws are a + (b - a) I(x = b), so everything they
   * say is the share of b. Rank normalisation maps two values to two scores, an affine map of
   * that indicator, so bulk-ESS is the effective sample size of the share itself, and bulk R-hat
   * compares the chains' shares. The tail quantiles of Vehtari et al. (2021, section 4.3) sit on
   * the two values, where the quantile indicator is either constant (undefined) or the same
   * indicator again, so tail-ESS adds nothing; folding around the median (their tail R-hat) gives
   * the same indicator or, when the median falls between the values, a constant, so R-hat is the
   * bulk R-hat here.
   */
  private static VariableSummary twoValued(
      String name, Draws draws, double[] sorted, Draws split, double[] splitSorted, Draws scores,
      RankNormalizedRhat rhat, double mean, double sd, List<String> notes) {
    double nan = Double.NaN;
    notes.add(
        "the draws take two values only (" + plain(sorted[0]) + " and "
            + plain(sorted[sorted.length - 1]) + "): their distribution is the share at the upper value, measured by bulk-ESS, so"
            + " tail-ESS is not defined and convergence is judged on bulk-ESS and R-hat");
    double essMean = EffectiveSampleSize.of(split);
    return new VariableSummary(
        name,
        draws.chainCount(),
        draws.length(),
        mean,
        sd,
        Quantiles.of(sorted, 0.025),
        Quantiles.of(sorted, 0.5),
        Quantiles.of(sorted, 0.975),
        rhat.bulk(),
        rhat.bulk(),
        rhat.tail(),
        EffectiveSampleSize.of(scores),
        nan,
        essMean,
        sd / Math.sqrt(essMean),
        quantileError(split, splitSorted, sorted, 0.025),
        quantileError(split, splitSorted, sorted, 0.5),
        quantileError(split, splitSorted, sorted, 0.975),
        VariableSummary.State.TWO_VALUED,
        notes);
  }

  /** A whole number without a decimal point ({@code 9}, as the model language writes it). */
  private static String plain(double x) {
    return x == Math.rint(x) && Math.abs(x) < 1e15 ? Long.toString((long) x) : Double.toString(x);
  }

  private static double quantileError(
      Draws split, double[] splitSorted, double[] sorted, double p) {
    double ess = EffectiveSampleSize.quantileOfSplit(split, splitSorted, p);
    return MonteCarloStandardError.quantileGivenEss(sorted, p, ess);
  }

  private static long nonFiniteCount(Draws draws) {
    long count = 0;
    for (double[] chain : draws.values()) {
      for (double x : chain) {
        if (!Double.isFinite(x)) {
          count++;
        }
      }
    }
    return count;
  }
}

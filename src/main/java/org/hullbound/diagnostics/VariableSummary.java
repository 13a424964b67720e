package org.hullbound.diagnostics;

import java.util.List;

/**
 * The posterior summary and convergence diagnostics of one scalar unknown, as built by {@link
 * PosteriorSummary#of(String, double[][])}.
 *
 * <p>One immutable record per unknown is what the report, the verdicts and the CSV summary are
 * made from. Values that are undefined for the draws at hand are NaN, and {@link #state()} and
 * {@link #notes()} say why. Definitions: Vehtari, Gelman, Simpson, Carpenter and Buerkner (2021),
 * Bayesian Analysis 16(2); quantiles by Hyndman and Fan (1996) definition 7.
 *
 * @param name the unknown's name, e.g. {@code beta[3]}
 * @param chains number of chains
 * @param drawsPerChain draws per chain
 * @param mean mean of all draws
 * @param sd standard deviation of all draws (divisor S - 1)
 * @param q025 2.5% quantile
 * @param q50 median
 * @param q975 97.5% quantile
 * @param rhat rank-normalised split R-hat, the larger of bulk and tail
 * @param rhatBulk rank-normalised split R-hat of the draws
 * @param rhatTail rank-normalised split R-hat of the draws folded around the median
 * @param essBulk bulk effective sample size
 * @param essTail tail effective sample size (smaller of those at the 5% and 95% quantiles)
 * @param essMean effective sample size of the mean (split chains, not rank-normalised)
 * @param mcseMean Monte Carlo standard error of the mean
 * @param mcseQ025 Monte Carlo standard error of the 2.5% quantile
 * @param mcseQ50 Monte Carlo standard error of the median
 * @param mcseQ975 Monte Carlo standard error of the 97.5% quantile
 * @param state whether everything could be computed, and if not why
 * @param notes plain sentences on what was done or left undefined, empty when nothing to say
 */
public record VariableSummary(
    String name,
    int chains,
    int drawsPerChain,
    double mean,
    double sd,
    double q025,
    double q50,
    double q975,
    double rhat,
    double rhatBulk,
    double rhatTail,
    double essBulk,
    double essTail,
    double essMean,
    double mcseMean,
    double mcseQ025,
    double mcseQ50,
    double mcseQ975,
    State state,
    List<String> notes) {

  /** Whether the diagnostics could be computed, and if not, why. */
  public enum State {
    /** Everything was computed (single values may still be NaN; the notes say which and why). */
    COMPLETE,
    /** All draws are equal: mean and quantiles are that value, sd 0; R-hat, ESS, MCSE NaN. */
    CONSTANT,
    /**
     * Everything was computed but tail-ESS, which draws of two values only do not have: their
     * whole distribution is the share at the upper value, whose effective sample size is the
     * bulk-ESS, so convergence is judged on bulk-ESS and R-hat alone.
     */
    TWO_VALUED,
    /** Fewer than 4 draws per chain: moments and quantiles only; R-hat, ESS, MCSE NaN. */
    TOO_SHORT,
    /** Some draws are NaN or infinite: nothing is computed, every statistic is NaN. */
    NON_FINITE
  }

  /** Validates the name and copies the notes. */
  public VariableSummary {
    if (name == null || name.isBlank()) {
      throw new IllegalArgumentException("name must be a non-blank string, got '" + name + "'");
    }
    if (state == null) {
      throw new IllegalArgumentException("state must not be null");
    }
    if (notes == null) {
      throw new IllegalArgumentException("notes must not be null (use an empty list)");
    }
    notes = List.copyOf(notes);
  }
}

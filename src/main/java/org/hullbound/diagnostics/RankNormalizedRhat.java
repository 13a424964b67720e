package org.hullbound.diagnostics;

/**
 * The two rank-normalised split R-hat values of one unknown and the larger of them, which is the
 * one to report (Vehtari, Gelman, Simpson, Carpenter and Buerkner 2021, Bayesian Analysis 16(2),
 * section 4.2).
 *
 * @param bulk split R-hat of the rank-normalised draws: chains disagree in location
 * @param tail split R-hat of the rank-normalised folded draws {@code |x - median|}: chains
 *     disagree in scale
 */
public record RankNormalizedRhat(double bulk, double tail) {

  /** The larger of bulk and tail; NaN if either is NaN. */
  public double max() {
    if (Double.isNaN(bulk) || Double.isNaN(tail)) {
      return Double.NaN;
    }
    return Math.max(bulk, tail);
  }
}

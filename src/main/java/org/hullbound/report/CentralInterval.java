package org.hullbound.report;

import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.Quantiles;

/**
 * The central interval of probability {@code level} of an unknown's pooled draws: from the
 * (1 - level)/2 to the (1 + level)/2 quantile (Hyndman and Fan 1996, type 7, as {@link Quantiles}).
 *
 * <p>The summary's own columns hold the 2.5% and 97.5% quantiles; a report at another level needs
 * its own quantiles, computed here from the draws so that page, terminal and CSV agree.
 *
 * @param level the probability between the ends, in (0, 1)
 * @param lower the lower end, NaN when a draw is not finite
 * @param upper the upper end, NaN when a draw is not finite
 */
public record CentralInterval(double level, double lower, double upper) {

  /** The interval of {@code draws} at {@code level}; NaN ends when some draw is not finite. */
  public static CentralInterval of(Draws draws, double level) {
    if (draws == null || !(level > 0 && level < 1)) {
      throw new IllegalArgumentException(
          "draws must not be null and level must lie in (0, 1), got " + level);
    }
    if (!draws.isFinite()) {
      return new CentralInterval(level, Double.NaN, Double.NaN);
    }
    double[] sorted = draws.sorted();
    return new CentralInterval(
        level, Quantiles.of(sorted, (1 - level) / 2), Quantiles.of(sorted, (1 + level) / 2));
  }

  /** The level as a reader writes it: "95%", "90%", "99.5%". */
  public String percent() {
    return percent(level);
  }

  /** {@code level} as a reader writes it: "95%", "90%", "99.5%". */
  public static String percent(double level) {
    return new java.math.BigDecimal(Double.toString(level * 100))
            .round(new java.math.MathContext(6))
            .stripTrailingZeros()
            .toPlainString()
        + "%";
  }
}

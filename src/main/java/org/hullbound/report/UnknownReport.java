package org.hullbound.report;

import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;

/**
 * Everything the report shows about one unknown: its draws, its summary, and how it was updated.
 *
 * <p>The draws are held as a validated copy ({@link Draws}) so the plots and the table row cannot
 * disagree; the update and evaluations per draw come from the Gibbs driver, which alone knows them.
 *
 * @param summary the posterior summary and diagnostics of the draws
 * @param draws the draws, chain by iteration
 * @param update the name of the updater, e.g. "adaptive rejection"
 * @param evaluationsPerDraw mean log-density evaluations per draw, NaN when not applicable
 */
public record UnknownReport(
    VariableSummary summary, Draws draws, String update, double evaluationsPerDraw) {

  /** Checks that nothing is null and that the summary describes draws of this shape. */
  public UnknownReport {
    if (summary == null || draws == null) {
      throw new IllegalArgumentException("summary and draws must not be null");
    }
    if (summary.chains() != draws.chainCount() || summary.drawsPerChain() != draws.length()) {
      throw new IllegalArgumentException(
          "summary of "
              + summary.chains()
              + " x "
              + summary.drawsPerChain()
              + " draws does not match draws of "
              + draws.chainCount()
              + " x "
              + draws.length());
    }
    update = update == null ? "" : update;
    if (evaluationsPerDraw < 0) {
      throw new IllegalArgumentException(
          "evaluationsPerDraw must be >= 0 or NaN, got " + evaluationsPerDraw);
    }
  }

  /**
   * Summarises {@code draws} ({@code draws[c][i]}, chains of equal length) with {@link
   * PosteriorSummary} and keeps them for the plots.
   *
   * @throws IllegalArgumentException if the name is blank or the draws are empty or ragged
   */
  public static UnknownReport of(
      String name, double[][] draws, String update, double evaluationsPerDraw) {
    Draws checked = Draws.of(draws);
    return new UnknownReport(
        PosteriorSummary.of(name, checked), checked, update, evaluationsPerDraw);
  }

  /** The unknown's name, as in the summary. */
  public String name() {
    return summary.name();
  }
}

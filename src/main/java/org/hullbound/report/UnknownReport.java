package org.hullbound.report;

import java.util.Optional;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;

/**
 * Everything the report shows about one unknown: its draws, its summary, and how it was updated.
 *
 * <p>The draws are held as a validated copy ({@link Draws}) so the plots and the table row cannot
 * disagree; the update facts come from the Gibbs driver, which alone knows them, and are the same
 * {@link UpdateFacts} the terminal {@link SummaryTable} shows.
 *
 * @param summary the posterior summary and diagnostics of the draws
 * @param draws the draws, chain by iteration
 * @param update which update drew the unknown and at what cost, when known
 */
public record UnknownReport(VariableSummary summary, Draws draws, Optional<UpdateFacts> update) {

  /** Checks that nothing is null and that the summary describes draws of this shape. */
  public UnknownReport {
    if (summary == null || draws == null || update == null) {
      throw new IllegalArgumentException(
          "summary, draws and update must not be null (use Optional.empty() for no update facts)");
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
              + draws.length()
              + " for '"
              + summary.name()
              + "'");
    }
  }

  /** The entry for a summary already computed from {@code draws}; {@code facts} may be null. */
  public static UnknownReport of(VariableSummary summary, Draws draws, UpdateFacts facts) {
    return new UnknownReport(summary, draws, Optional.ofNullable(facts));
  }

  /**
   * Summarises {@code draws} ({@code draws[c][i]}, chains of equal length) with {@link
   * PosteriorSummary} and keeps them for the plots; {@code facts} may be null when not known.
   *
   * @throws IllegalArgumentException if the name is blank or the draws are empty or ragged
   */
  public static UnknownReport of(String name, double[][] draws, UpdateFacts facts) {
    Draws checked = Draws.of(draws);
    return of(PosteriorSummary.of(name, checked), checked, facts);
  }

  /** The unknown's name, as in the summary. */
  public String name() {
    return summary.name();
  }

  /**
   * The central interval at {@code level}: the summary's 2.5% and 97.5% quantiles at 0.95, else
   * computed from the draws by the same rule.
   */
  public CentralInterval interval(double level) {
    if (level == ReportOptions.DEFAULT_INTERVAL_LEVEL) {
      return new CentralInterval(level, summary.q025(), summary.q975());
    }
    return CentralInterval.of(draws, level);
  }
}

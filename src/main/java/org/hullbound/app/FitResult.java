package org.hullbound.app;

import java.nio.file.Path;
import java.util.List;
import java.util.Optional;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.report.PredictiveChecks;
import org.hullbound.report.ReportInput;
import org.hullbound.report.SummaryTable;
import org.hullbound.report.Verdicts;

/**
 * What a finished (or stopped) fit produced, for the command line to show: every file is written
 * before this is returned.
 *
 * @param modelName the model's name
 * @param settings the run's settings (its seed included)
 * @param folder the output folder
 * @param stoppedEarly whether a stop request ended the run before its last draw
 * @param keptDraws the draws per chain the summary uses (those all summarised chains reached)
 * @param summarisedChains the chains that kept draws, from 0
 * @param summary the summary table, its verdicts and its file; empty when no draw was kept
 * @param switchNotes one line per unknown whose update switched to the fallback during the run
 * @param imputed missing observations imputed
 * @param drawsFile every draw, as made
 * @param reportFile the HTML report
 */
public record FitResult(
    String modelName, RunSettings settings, Path folder, boolean stoppedEarly, int keptDraws,
    int[] summarisedChains, Optional<Summary> summary, List<String> switchNotes, long imputed,
    Path drawsFile, Path reportFile) {
  public FitResult {
    summarisedChains = summarisedChains.clone();
    switchNotes = List.copyOf(switchNotes);
  }

  @Override
  public int[] summarisedChains() {
    return summarisedChains.clone();
  }

  /**
   * The summary of a run that kept draws: the table, its verdicts, where the table is, the
   * posterior predictive checks ({@link PredictiveChecks#none()} when not asked for), and what the
   * report page was rendered from (null for a summary made outside a run).
   */
  public record Summary(
      SummaryTable table, Verdicts verdicts, Path file, PredictiveChecks checks,
      ReportInput report) {
    /** A summary without predictive checks. */
    public Summary(SummaryTable table, Verdicts verdicts, Path file) {
      this(table, verdicts, file, PredictiveChecks.none(), null);
    }
  }
}

package org.hullbound.cli;

import org.hullbound.lang.NumberSyntax;
import org.hullbound.report.SummaryTable;
import picocli.CommandLine.Option;

/**
 * {@code --level}, the probability of the central intervals, declared once for {@code fit},
 * {@code summarize} and {@code report} as a picocli mixin.
 */
public final class LevelOption {

  @Option(
      names = "--level",
      paramLabel = "P",
      description =
          "Probability of the central intervals in the summary and report, e.g. 0.9 (default:"
              + " ${DEFAULT-VALUE}).")
  double level = SummaryTable.INTERVAL_LEVEL;

  /** The level given, or the default. */
  double value() {
    return level;
  }

  /** What is wrong with the level, or null: it must lie strictly between 0 and 1. */
  String problem() {
    return level > 0 && level < 1
        ? null
        : "--level must lie strictly between 0 and 1, e.g. 0.9; got " + NumberSyntax.written(level);
  }
}

package org.hullbound.app;

import java.util.function.Function;
import org.hullbound.report.ProbabilityTable;

/**
 * The probability statements of a run ({@code fit --probability}), estimated from the kept draws
 * after the summary and before the report page is rendered, so that the page is rendered once with
 * them.
 *
 * <p>A function of the draws rather than a list of statements: the caller parses and checks its
 * statements once, before sampling, and keeps its estimates for its own output.
 */
@FunctionalInterface
public interface ProbabilitySection {

  /**
   * The table of the statements, estimated from {@code draws}, which gives the kept draws of a
   * column of draws.csv by its label, {@code [chain][draw]}.
   */
  ProbabilityTable of(Function<String, double[][]> draws);

  /** No statements: no table. */
  static ProbabilitySection none() {
    return draws -> ProbabilityTable.none();
  }
}

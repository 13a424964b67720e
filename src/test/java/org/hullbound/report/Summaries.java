package org.hullbound.report;

import java.util.List;
import org.hullbound.diagnostics.VariableSummary;

/** Hand-made summaries for report tests, so that each rule can be set off on its own. */
final class Summaries {
  private Summaries() {}

  /** A complete summary with the given convergence numbers and harmless everything else. */
  static VariableSummary converged(
      String name, double rhatBulk, double rhatTail, double essBulk, double essTail) {
    return new VariableSummary(
        name, 4, 1000, 0.5, 0.1, 0.3, 0.5, 0.7, Math.max(rhatBulk, rhatTail), rhatBulk, rhatTail,
        essBulk, essTail, essBulk, 0.1 / Math.sqrt(essBulk), 0.01, 0.005, 0.01,
        VariableSummary.State.COMPLETE, List.of());
  }

  static VariableSummary fine(String name) {
    return converged(name, 1.001, 1.002, 3800, 3500);
  }

  /** A complete summary with chosen location statistics and fine diagnostics. */
  static VariableSummary withValues(
      String name, double mean, double sd, double q025, double q50, double q975, double mcse) {
    return new VariableSummary(
        name, 4, 1000, mean, sd, q025, q50, q975, 1.001, 1.001, 1.0, 3800, 3500, 3800, mcse,
        mcse, mcse, mcse, VariableSummary.State.COMPLETE, List.of());
  }

  static VariableSummary undefined(String name, VariableSummary.State state, String note) {
    double nan = Double.NaN;
    return new VariableSummary(
        name, 4, 1000, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan,
        state, List.of(note));
  }
}

package org.hullbound.app;

import java.nio.file.Path;
import java.util.List;

/**
 * What a finished batch wrote: every unit's outcome in the request's order, and the two tables.
 *
 * @param modelName the model's name
 * @param seed the run's seed
 * @param folder the output folder
 * @param outcomes one per unit
 * @param summaryFile the summary over all units
 * @param unitsFile one row per unit
 */
public record BatchResult(
    String modelName, long seed, Path folder, List<UnitOutcome> outcomes, Path summaryFile,
    Path unitsFile) {
  public BatchResult {
    outcomes = List.copyOf(outcomes);
  }

  /** The units that failed. */
  public long failedCount() {
    return outcomes.stream().filter(UnitOutcome::failed).count();
  }

  /** The units whose verdicts found something. */
  public long flaggedCount() {
    return outcomes.stream().filter(o -> UnitOutcome.FLAGGED.equals(o.status())).count();
  }
}

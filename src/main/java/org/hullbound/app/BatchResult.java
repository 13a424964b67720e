package org.hullbound.app;

import java.nio.file.Path;
import java.util.List;

/**
 * What a batch wrote: the outcome of every unit that finished (in the request's order; every unit
 * when the batch was not stopped), and the two tables.
 *
 * @param modelName the model's name
 * @param seed the run's seed
 * @param folder the output folder
 * @param outcomes one per finished unit, in the request's order
 * @param unitCount how many units the batch has
 * @param summaryFile the summary over all units
 * @param unitsFile one row per unit
 */
public record BatchResult(
    String modelName, long seed, Path folder, List<UnitOutcome> outcomes, int unitCount,
    Path summaryFile, Path unitsFile) {
  public BatchResult {
    outcomes = List.copyOf(outcomes);
  }

  /** Whether every unit finished; false when the batch was stopped first. */
  public boolean complete() {
    return outcomes.size() == unitCount;
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

package org.hullbound.app;

import java.util.ArrayList;
import java.util.List;

/**
 * What one unit of a batch gave: its summary rows and verdict, or the error that stopped it.
 *
 * @param unit the unit's name
 * @param seed the unit's seed ({@link UnitSeeds}), with which {@code fit} alone repeats it
 * @param status {@code converged}, {@code flagged} (the verdicts found something) or {@code failed}
 * @param rows the unit's summary.csv records without the header (empty when failed)
 * @param verdict the verdict lines joined by {@code " | "}, or the error when failed
 */
public record UnitOutcome(
    String unit, long seed, String status, List<List<String>> rows, String verdict)
    implements TaskEngine.Outcome {
  public static final String CONVERGED = "converged";
  public static final String FLAGGED = "flagged";
  public static final String FAILED = "failed";

  public UnitOutcome {
    List<List<String>> copy = new ArrayList<>();
    for (List<String> row : rows) {
      copy.add(List.copyOf(row));
    }
    rows = List.copyOf(copy);
  }

  /** A unit that failed for {@code error}. */
  public static UnitOutcome failed(String unit, long seed, String error) {
    return new UnitOutcome(unit, seed, FAILED, List.of(), error);
  }

  @Override
  public boolean failed() {
    return FAILED.equals(status);
  }
}

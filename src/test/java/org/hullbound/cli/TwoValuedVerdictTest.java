package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Fits of the change-point demo {@code models/fleet_faults.hbm} with its change year narrowed to
 * two years: a two-valued discrete unknown has no tail-ESS (its tail quantiles sit on its two
 * values), and the run says so and judges it on bulk-ESS and R-hat instead of calling it doubtful;
 * the demo itself, whose change year takes many values, keeps its tail-ESS.
 */
class TwoValuedVerdictTest {
  @TempDir Path folder;

  private CliRun fit(String model, String out) throws Exception {
    Path file = folder.resolve(out + ".hbm");
    Files.writeString(file, model);
    return CliRun.of("fit", file.toString(), "--seed", "7", "--out",
        folder.resolve(out).toString());
  }

  private static String fleetFaults() throws Exception {
    return Files.readString(Path.of("models/fleet_faults.hbm"));
  }

  @Test
  void aChangeYearOfTwoPossibleYearsIsJudgedWithoutTailEss() throws Exception {
    // Years 9 and 10 both hold posterior mass (the demo's posterior mean is about 9.2).
    String twoYears =
        fleetFaults().replace("whole-uniform(lower = 2, upper = 16)",
            "whole-uniform(lower = 9, upper = 10)");
    assertFalse(twoYears.equals(fleetFaults()), "the demo's prior line changed");
    CliRun run = fit(twoYears, "two");
    assertEquals(0, run.exit(), run.toString());
    assertTrue(run.out().matches("(?s).*\nchange +\\|.* n/a +ok .*"), run.out());
    assertTrue(run.out().contains("All 3 unknowns look converged: R-hat at most 1.01, bulk-ESS and"
        + " tail-ESS at least 400 (change takes two values only: tail-ESS is not defined there, so"
        + " it is judged on bulk-ESS and R-hat alone), no fallback update."), run.out());
    List<String> summary = Files.readAllLines(folder.resolve("two/summary.csv"));
    String change =
        summary.stream().filter(line -> line.startsWith("change,")).findFirst().orElseThrow();
    assertTrue(change.contains(",two valued,\"the draws take two values only (9 and 10):"), change);
  }

  @Test
  void theDemosManyValuedChangeYearKeepsItsTailEss() throws Exception {
    CliRun run = fit(fleetFaults(), "many");
    assertEquals(0, run.exit(), run.toString());
    assertTrue(run.out().contains("All 3 unknowns look converged: R-hat at most 1.01, bulk-ESS and"
        + " tail-ESS at least 400, no fallback update."), run.out());
    String change = Files.readAllLines(folder.resolve("many/summary.csv")).stream()
        .filter(line -> line.startsWith("change,")).findFirst().orElseThrow();
    assertTrue(change.contains(",complete,"), change);
  }
}

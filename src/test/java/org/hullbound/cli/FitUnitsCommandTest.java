package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.io.PrintWriter;
import java.io.StringWriter;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code fit-units}: exit 0 when every unit was fitted, 1 when one failed (its row says why), 2 for
 * a usage error; progress on standard error unless {@code --quiet}.
 */
class FitUnitsCommandTest {
  @TempDir Path folder;

  private Path model() throws Exception {
    return Files.writeString(folder.resolve("station.hbm"),
        "model station\nindex reading\ndata y[reading] ~ normal(mean = mu, sd = 1)\n"
            + "param mu ~ normal(mean = 0, sd = 10)\n");
  }

  private Path data(String text) throws Exception {
    return Files.writeString(folder.resolve("all.csv"), text);
  }

  @Test
  void aFailedUnitMakesExitOneAndEveryUnitIsCountedOnStandardError() throws Exception {
    CliRun run = CliRun.of("fit-units", model().toString(), "--unit-column", "site",
        "--data", data("site,y\na,1.2\nb,-0.5\nc,x\na,0.3\n").toString(), "--draws", "100",
        "--burn-in", "50", "--chains", "2", "--seed", "3", "--workers", "2",
        "--out", folder.resolve("out").toString());
    assertEquals(1, run.exit(), run.toString());
    assertTrue(run.out().contains("Fitted 2 of 3 units of station (seed 3)"), run.out());
    assertTrue(run.out().contains("c (failed): "), run.out());
    assertTrue(run.err().contains("hullbound fit-units: 3 of 3 units done, 1 failed"), run.err());
    assertTrue(Files.exists(folder.resolve("out/summary.csv")));
  }

  @Test
  void quietShowsNoProgressAndAllUnitsFittedExitsZero() throws Exception {
    CliRun run = CliRun.of("fit-units", model().toString(), "--unit-column", "site",
        "--data", data("site,y\na,1.2\nb,-0.5\n").toString(), "--draws", "100", "--burn-in", "50",
        "--quiet", "--out", folder.resolve("out").toString());
    assertEquals(0, run.exit(), run.toString());
    assertFalse(run.err().contains("units done"), run.err());
  }

  @Test
  void usageErrorsExitTwoWithOneLine() throws Exception {
    CliRun workers = CliRun.of("fit-units", model().toString(), "--unit-column", "site",
        "--data", data("site,y\na,1\n").toString(), "--workers", "0");
    assertEquals(2, workers.exit(), workers.toString());
    assertEquals("hullbound fit-units: --workers must be at least 1, got 0\n", workers.err());
    CliRun spark = CliRun.of("fit-units", model().toString(), "--unit-column", "site",
        "--data", data("site,y\na,1\n").toString(), "--spark", "--out", folder.resolve("s").toString());
    assertEquals(2, spark.exit(), spark.toString());
    assertTrue(spark.err().contains("has no spark engine on its class path"), spark.err());
    CliRun neither = CliRun.of("fit-units", model().toString());
    assertEquals(2, neither.exit(), neither.toString());
  }

  @Test
  void theProgressLineCountsDoneFailedAndLeftAndEstimatesTheTimeLeft() {
    TaskProgressLine line =
        TaskProgressLine.of(new PrintWriter(new StringWriter()), false, "fit-units", "units",
            () -> 0L);
    // 12 units in 30 s: 2.5 s each, so 28 more take 70 s.
    assertEquals("hullbound fit-units: 12 of 40 units done, 1 failed, 28 left, about 1m10s left",
        line.text(12, 1, 40, Duration.ofSeconds(30)));
    assertEquals("hullbound calibrate: 40 of 40 units done",
        line.text(40, 0, 40, Duration.ofSeconds(30))
        .replace("fit-units", "calibrate"));
  }
}

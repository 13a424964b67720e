package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code check} on models with a {@code censored} clause: the demo, and faults with exit 2. */
class CensoredCheckTest {

  @Test
  void theWellsDemoSaysWhichRuleCoversEachUnknown() {
    CliRun run = CliRun.of("check", "models/wells.hbm", "--data", "models/wells.csv");
    assertEquals(0, run.exit(), run.err());
    assertTrue(run.out().contains("censored lognormal terms concave in meanlog (a censored term"),
        run.out());
    assertTrue(run.out().contains("no rule shows a censored lognormal term log-concave in log(sdlog)"),
        run.out());
  }

  @Test
  void reversedLimitsStopWithThePositionOfTheCellAndExitTwo(@TempDir Path folder)
      throws IOException {
    Path model = folder.resolve("levels.hbm");
    Files.writeString(model, """
        index sample
        data  lo[sample], hi[sample]
        data  level[sample] ~ normal(mean = m, sd = 1) censored lo[sample] .. hi[sample]
        param m ~ normal(mean = 0, sd = 10)
        """);
    Path data = folder.resolve("levels.csv");
    Files.writeString(data, "level,lo,hi\n,0.5,1.5\n,2.5,2.0\n");
    CliRun run = CliRun.of("check", model.toString(), "--data", data.toString());
    assertEquals(2, run.exit(), run.out());
    assertTrue(run.err().contains(data
        + ":3:2: the lower limit 2.5 of 'level[2]' is above its upper limit 2"),
        run.err());
    assertFalse(run.err().contains("at org.hullbound"), run.err());
  }

  @Test
  void calibrateRefusesACensoredModel() {
    CliRun run = CliRun.of("calibrate", "models/wells.hbm", "--data", "models/wells.csv",
        "--replicates", "10", "--draws", "9", "--out", "target/censored-calibration");
    assertEquals(2, run.exit(), run.out());
    assertTrue(run.err().contains("cannot simulate model wells: 'nitrate' is censored (line 13)"),
        run.err());
  }

  @Test
  void aCensoredCountStopsAtTheClause(@TempDir Path folder) throws IOException {
    Path model = folder.resolve("calls.hbm");
    Files.writeString(model, """
        data calls[day] = [3, 12] ~ poisson(rate = r) censored 10 .. inf
        index day
        param r ~ gamma(shape = 2, rate = 0.5)
        """);
    CliRun run = CliRun.of("check", model.toString());
    assertEquals(2, run.exit(), run.out());
    assertTrue(run.err().contains(model + ":1:47: censoring needs a continuous family"), run.err());
  }
}

package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code calibrate} runs its replicates on local workers with the same ranks whatever their number;
 * {@code --spark} without the Spark engine on the class path is a usage error that leaves no
 * folder.
 */
class CalibrateWorkersTest {
  @TempDir Path folder;

  private CliRun calibrate(String out, String... more) {
    String[] args = {"calibrate", "validation/beta_binomial/model.hbm", "--data",
        "validation/beta_binomial/batches.csv", "--replicates", "20", "--draws", "9", "--burn-in",
        "20", "--out", folder.resolve(out).toString()};
    String[] all = new String[args.length + more.length];
    System.arraycopy(args, 0, all, 0, args.length);
    System.arraycopy(more, 0, all, args.length, more.length);
    return CliRun.of(all);
  }

  @Test
  void oneWorkerAndTwoWriteTheSameRanks() throws Exception {
    CliRun one = calibrate("one", "--workers", "1");
    CliRun two = calibrate("two", "--workers", "2");
    assertEquals(0, one.exit(), one.toString());
    assertEquals(0, two.exit(), two.toString());
    assertArrayEquals(
        Files.readAllBytes(folder.resolve("one/ranks.csv")), Files.readAllBytes(folder.resolve("two/ranks.csv")));
    assertTrue(two.err().contains("hullbound calibrate: 20 of 20 replicates done"), two.err());
  }

  @Test
  void sparkWithoutTheEngineIsRefusedAndLeavesNoFolder() {
    CliRun spark = calibrate("spark", "--spark");
    assertEquals(2, spark.exit(), spark.toString());
    assertTrue(spark.err().startsWith("hullbound calibrate: this hullbound has no spark engine"),
        spark.err());
    assertFalse(Files.exists(folder.resolve("spark")));
  }
}

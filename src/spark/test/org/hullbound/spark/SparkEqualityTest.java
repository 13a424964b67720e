package org.hullbound.spark;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.hullbound.app.BatchResult;
import org.hullbound.app.BatchRun;
import org.hullbound.app.FolderLock;
import org.hullbound.app.ModelInputs;
import org.hullbound.app.TaskEngine;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.validation.CalibrationFiles;
import org.hullbound.validation.CalibrationResult;
import org.hullbound.validation.CalibrationSettings;
import org.hullbound.validation.CalibrationTask;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The same calibration and the same batch on two local workers and on Spark {@code local[2]} write
 * the same files, byte for byte; a unit that fails is reported and the others finish, on Spark as
 * locally.
 */
class SparkEqualityTest {
  private static SparkTasks spark;

  @TempDir Path folder;

  @BeforeAll
  static void start() {
    spark = SparkFixture.spark("local[2]");
  }

  @AfterAll
  static void stop() {
    spark.close();
  }

  @Test
  void aCalibrationWritesTheSameRankTableAndHistogramsOnSparkAsLocally() throws Exception {
    CalibrationSettings settings = new CalibrationSettings(40, 9, 1, 20, 0, 5);
    CalibrationTask task =
        CalibrationTask.of(
            new ModelInputs(Path.of("models/seedlings.hbm"), List.of(Path.of("models/seedlings.csv"))),
            settings);
    CalibrationResult local;
    try (TaskEngine engine = TaskEngine.local(2)) {
      local = task.run(engine, TaskEngine.Progress.none());
    }
    CalibrationResult onSpark = task.run(spark, TaskEngine.Progress.none());
    Path one = Files.createDirectories(folder.resolve("local"));
    Path two = Files.createDirectories(folder.resolve("spark"));
    CalibrationFiles.write(local, one);
    CalibrationFiles.write(onSpark, two);
    List<Path> files = SparkFixture.files(one);
    assertEquals(files, SparkFixture.files(two));
    assertTrue(files.contains(Path.of(CalibrationFiles.RANKS_FILE)), files.toString());
    for (Path file : files) {
      assertArrayEquals(Files.readAllBytes(one.resolve(file)), Files.readAllBytes(two.resolve(file)), file.toString());
    }
  }

  @Test
  void aBatchWritesTheSameTablesOnSparkAsLocallyAndAFailedUnitDoesNotStopTheOthers() throws Exception {
    Path model = SparkFixture.batch(folder);
    BatchResult local;
    try (TaskEngine engine = TaskEngine.local(2)) {
      local = SparkFixture.run(SparkFixture.request(folder, model, folder.resolve("local")), engine,
          TaskEngine.Progress.none());
    }
    List<int[]> told = new ArrayList<>();
    BatchResult onSpark =
        SparkFixture.run(SparkFixture.request(folder, model, folder.resolve("spark")), spark,
            (done, failed, total) -> told.add(new int[] {done, failed, total}));
    assertArrayEquals(Files.readAllBytes(local.summaryFile()), Files.readAllBytes(onSpark.summaryFile()));
    // the failed unit's message names its copy of the data, in each run's own folder
    assertEquals(
        Files.readString(local.unitsFile()).replace(folder.resolve("local").toString(), "OUT"),
        Files.readString(onSpark.unitsFile()).replace(folder.resolve("spark").toString(), "OUT"));
    assertEquals(1, onSpark.failedCount());
    assertEquals("failed", onSpark.outcomes().get(2).status());
    assertTrue(onSpark.outcomes().get(2).verdict().endsWith("y.csv:3:1: 'seven' in column 'y' is not a number"),
        onSpark.outcomes().get(2).verdict());
    assertArrayEquals(new int[] {3, 1, 3}, told.get(told.size() - 1), "the last progress: all done, one failed");
    assertEquals(List.of(Path.of("batch.txt"), Path.of(FolderLock.FILE_NAME), Path.of("summary.csv"), Path.of("units.csv"),
            Path.of("units/c/station.hbm"), Path.of("units/c/y.csv")),
        SparkFixture.files(folder.resolve("spark")), "only the failed unit's folder is kept");
    assertArrayEquals(Files.readAllBytes(folder.resolve("local/batch.txt")),
        Files.readAllBytes(folder.resolve("spark/batch.txt")), "the batch's facts name no engine");
  }

  /**
   * A batch stopped on Spark after its first unit keeps the units Spark handed back before the
   * stop, whole rows only (the running tasks are killed); a local resume fits the others, and the
   * tables equal those of the batch never stopped.
   */
  @Test
  void aBatchStoppedOnSparkKeepsItsFinishedUnitsAndResumesLocallyToTheSameTables() throws Exception {
    for (int k = 0; k < 8; k++) {
      Path unit = Files.createDirectories(folder.resolve("units/u" + k));
      Files.writeString(unit.resolve("y.csv"), "y\n" + (0.3 * k) + "\n" + (1 - 0.2 * k) + "\n0.5\n");
    }
    Path model = SparkFixture.batch(folder);
    BatchResult whole;
    try (TaskEngine engine = TaskEngine.local(2)) {
      whole = SparkFixture.run(SparkFixture.request(folder, model, folder.resolve("whole")), engine,
          TaskEngine.Progress.none());
    }
    StopSignal stop = StopSignal.create();
    Path out = folder.resolve("stopped");
    BatchResult stopped;
    try (BatchRun run = BatchRun.prepare(SparkFixture.request(folder, model, out))) {
      stopped = run.run(spark, (done, failed, total) -> stop.request(), stop);
    }
    // how many units end between the first and the job's cancel depends on the threads' timing;
    // before the stop was looked at between results, all 11 did
    assertTrue(!stopped.complete() && !stopped.outcomes().isEmpty(),
        "the first unit kept, not every unit run: " + stopped.outcomes().size());
    List<String> kept = Files.readAllLines(out.resolve("units.csv"));
    assertEquals(stopped.outcomes().size() + 1, kept.size(), kept.toString());
    assertTrue(Files.readString(out.resolve("units.csv")).endsWith("\r\n"));
    BatchResult resumed;
    try (BatchRun run = BatchRun.prepare(SparkFixture.request(folder, model, null).resuming(out));
        TaskEngine engine = TaskEngine.local(2)) {
      resumed = run.run(engine, TaskEngine.Progress.none());
    }
    assertEquals(11, resumed.outcomes().size());
    assertArrayEquals(Files.readAllBytes(whole.summaryFile()), Files.readAllBytes(resumed.summaryFile()));
    assertEquals(
        Files.readString(whole.unitsFile()).replace(whole.folder().toString(), "OUT"),
        Files.readString(resumed.unitsFile()).replace(out.toString(), "OUT"));
  }
}

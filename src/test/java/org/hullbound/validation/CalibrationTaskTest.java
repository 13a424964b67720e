package org.hullbound.validation;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.app.ModelInputs;
import org.hullbound.app.TaskEngine;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Replicates run as tasks give the ranks {@link Calibration#run} gives one after another: replicate
 * n's generator is the root's (n + 1)-th split wherever and in whatever order it runs.
 */
class CalibrationTaskTest {
  @TempDir Path folder;

  @Test
  void replicatesOnTwoWorkersGiveTheRanksAndFilesOfTheSequentialRun() throws Exception {
    Path model = Path.of("validation/beta_binomial/model.hbm");
    Path data = Path.of("validation/beta_binomial/batches.csv");
    CalibrationSettings settings = new CalibrationSettings(30, 9, 1, 20, 0, 5);
    CalibrationTask task = CalibrationTask.of(new ModelInputs(model, List.of(data)), settings);
    CalibrationResult sequential = task.calibration().run(settings, n -> { });
    CalibrationResult parallel;
    try (TaskEngine engine = TaskEngine.local(2)) {
      parallel = task.run(engine, TaskEngine.Progress.none());
    }
    assertArrayEquals(sequential.ranks(), parallel.ranks());
    assertEquals(sequential.smallestPValue(), parallel.smallestPValue());
    assertArrayEquals(sequential.ranks()[17], task.calibration().replicate(settings, 17));

    CalibrationFiles.write(sequential, Files.createDirectories(folder.resolve("one")));
    CalibrationFiles.write(parallel, Files.createDirectories(folder.resolve("two")));
    assertArrayEquals(
        Files.readAllBytes(folder.resolve("one").resolve(CalibrationFiles.RANKS_FILE)),
        Files.readAllBytes(folder.resolve("two").resolve(CalibrationFiles.RANKS_FILE)));
  }
}

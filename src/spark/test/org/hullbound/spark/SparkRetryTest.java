package org.hullbound.spark;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;
import org.apache.spark.TaskContext;
import org.hullbound.app.BatchRun;
import org.hullbound.app.TaskEngine;
import org.hullbound.app.UnitData;
import org.hullbound.app.UnitFit;
import org.hullbound.app.UnitOutcome;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A task attempt killed on purpose is retried by Spark and gives the same result: unit b's first
 * attempt throws ({@link TaskContext#attemptNumber()} 0), its second runs; seeds depend on the unit,
 * not the attempt. {@code local[2,2]}: two threads, and a task may fail once before the job does
 * (Spark's local master takes the allowed failures after the comma).
 */
class SparkRetryTest {
  /** Attempts killed; the tasks run in this JVM under a local master. */
  static final AtomicInteger KILLED = new AtomicInteger();

  private static SparkTasks spark;

  @TempDir Path folder;

  @BeforeAll
  static void start() {
    spark = SparkFixture.spark("local[2,2]");
  }

  @AfterAll
  static void stop() {
    spark.close();
  }

  @Test
  void aKilledAttemptIsRetriedAndGivesTheSameOutcomes() throws Exception {
    Path model = SparkFixture.batch(folder);
    List<UnitOutcome> local;
    List<UnitOutcome> retried;
    try (BatchRun run = BatchRun.prepare(SparkFixture.request(folder, model, folder.resolve("local")));
        TaskEngine engine = TaskEngine.local(2)) {
      local = engine.run(units(folder), run.task(), TaskEngine.Progress.none());
    }
    try (BatchRun run = BatchRun.prepare(SparkFixture.request(folder, model, folder.resolve("spark")))) {
      UnitFit fit = run.task();
      TaskEngine.Task<UnitData, UnitOutcome> flaky =
          unit -> {
            if (unit.name().equals("b") && TaskContext.get().attemptNumber() == 0) {
              KILLED.incrementAndGet();
              throw new IllegalStateException("attempt killed on purpose");
            }
            return fit.run(unit);
          };
      retried = spark.run(units(folder), flaky, TaskEngine.Progress.none());
    }
    assertEquals(1, KILLED.get(), "one attempt was killed");
    assertEquals(local.subList(0, 2), retried.subList(0, 2), "a, and b after its retry");
    // c failed in both; its message names its own run's folder
    assertEquals(local.get(2).status(), retried.get(2).status());
    assertEquals(local.get(2).seed(), retried.get(2).seed());
  }

  private static List<UnitData> units(Path folder) {
    return org.hullbound.app.BatchUnits.fromFolder(folder.resolve("units"), List.of());
  }
}

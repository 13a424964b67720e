package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.gibbs.MemoryBudget;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.StopSignal;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A fit that runs out of heap says where it was, with what it knew (issue 14: the message of a fit
 * whose rows filled the heap while binding advised keeping fewer draws). The error is injected
 * where the run hands work to its caller's code: the progress listener, called on the chains'
 * threads, and the probability statements, estimated while summarising. Running out while reading
 * the data is tested for real in a small heap ({@code cli.FitOutOfMemoryTest}).
 */
class FitRunHeapTest {
  @TempDir Path folder;

  private FitRun prepare() throws Exception {
    Path data = folder.resolve("clinics.csv");
    Files.copy(Path.of("models", "clinics.csv"), data);
    FitRequest request = new FitRequest(
        new ModelInputs(Path.of("models", "clinics.hbm"), List.of(data)), null, 2, 20, 30, null,
        5L, null, folder.resolve("out"), null, false, 0.95);
    return FitRun.prepare(request);
  }

  @Test
  void runningOutOfHeapOnAChainIsTheSamplingStageWithTheDrawsFileAndTheRowsBound()
      throws Exception {
    OutOfMemoryError full = new OutOfMemoryError("Java heap space");
    ProgressListener failing = progress -> {
      throw full;
    };
    try (FitRun run = prepare()) {
      HeapExhaustedException thrown = assertThrows(
          HeapExhaustedException.class, () -> run.run(failing, StopSignal.create()));
      assertEquals(HeapExhaustedException.Stage.SAMPLING, thrown.stage());
      assertSame(full, rootCause(thrown));
      assertEquals(1200, thrown.dataRows(), "the clinics file's rows");
      assertEquals(Files.size(folder.resolve("clinics.csv")), thrown.dataFileBytes());
      // 2 chains x 30 draws x 39 unknowns, as MemoryBudget counts them
      assertEquals(MemoryBudget.of(2, 30, 39).bytes(), thrown.keptDrawBytes());
      assertFalse(thrown.drawsAreACause(), "a few KiB of draws in any heap");
      assertEquals(folder.resolve("out").resolve("draws.csv"), thrown.drawsFile());
    }
  }

  @Test
  void runningOutOfHeapWhileSummarisingIsTheSummarisingStage() throws Exception {
    OutOfMemoryError full = new OutOfMemoryError("Java heap space");
    ProbabilitySection failing = draws -> {
      throw full;
    };
    try (FitRun run = prepare()) {
      HeapExhaustedException thrown = assertThrows(HeapExhaustedException.class,
          () -> run.run(ProgressListener.none(), StopSignal.create(), failing));
      assertEquals(HeapExhaustedException.Stage.SUMMARISING, thrown.stage());
      assertSame(full, rootCause(thrown));
      assertTrue(thrown.keptDrawBytes() > 0);
    }
  }

  /** The draws are a cause only past a quarter of the heap, and never before sampling. */
  @Test
  void theKeptDrawsAreACauseOnlyWhenTheyAreALargeShareOfTheHeapAndHeld() {
    long heap = Runtime.getRuntime().maxMemory();
    long quarter = (long) (MemoryBudget.NOTE_SHARE * heap);
    HeapExhaustedException.Facts facts = new HeapExhaustedException.Facts(1, 1, quarter + 1024);
    for (HeapExhaustedException.Stage stage : HeapExhaustedException.Stage.values()) {
      boolean held = stage == HeapExhaustedException.Stage.SAMPLING
          || stage == HeapExhaustedException.Stage.SUMMARISING;
      assertEquals(held, exhausted(stage, facts).drawsAreACause(), stage.toString());
      assertFalse(exhausted(stage, facts.withKeptDrawBytes(quarter - 1024)).drawsAreACause(),
          stage.toString());
    }
  }

  private static HeapExhaustedException exhausted(
      HeapExhaustedException.Stage stage, HeapExhaustedException.Facts facts) {
    return HeapExhaustedException.of(stage, facts, null, new OutOfMemoryError());
  }

  private static Throwable rootCause(Throwable thrown) {
    Throwable cause = thrown;
    while (cause.getCause() != null) {
      cause = cause.getCause();
    }
    return cause;
  }
}

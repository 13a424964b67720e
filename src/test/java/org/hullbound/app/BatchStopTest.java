package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.Serializable;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.io.RowWrites;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A batch loses no finished unit (issue 13's leftover, issue 14's rule that a fault loses nothing
 * already computed): a stop after some units, a unit's task that fails and a full disk each leave
 * the tables with the finished units' rows, whole; a resume fits the others with the same seeds,
 * and the resumed batch's tables equal those of a batch never stopped, byte for byte (a finished
 * batch writes them in the units' order) and row by row by their key.
 */
class BatchStopTest {
  private static final int UNITS = 6;

  @TempDir Path folder;

  /** Six units u1..u6 of four readings each, different per unit. */
  private List<UnitData> units() throws IOException {
    String[] namesAndTexts = new String[2 * UNITS];
    for (int k = 0; k < UNITS; k++) {
      namesAndTexts[2 * k] = "u" + (k + 1);
      namesAndTexts[2 * k + 1] =
          "y\n" + (0.1 * k) + "\n" + (1.5 - 0.3 * k) + "\n" + (0.7 + k) + "\n" + (-0.2 * k) + "\n";
    }
    return BatchUnits.fromFolder(BatchFixture.units(folder, namesAndTexts), List.of());
  }

  private BatchRequest request(Path out) throws IOException {
    return BatchFixture.request(BatchFixture.model(folder), units(), out, false);
  }

  /** The batch never stopped, on one worker. */
  private BatchResult uninterrupted() throws IOException {
    return BatchFixture.run(request(folder.resolve("whole")), 1);
  }

  /** Resumes the batch in {@code out} to its end on two workers. */
  private BatchResult resume(Path out) throws IOException {
    try (BatchRun run = BatchRun.prepare(request(null).resuming(out));
        TaskEngine engine = TaskEngine.local(2)) {
      assertTrue(run.resuming());
      return run.run(engine, TaskEngine.Progress.none());
    }
  }

  @Test
  void aStopAfterTwoUnitsKeepsTheirRowsWholeAndAResumeGivesTheTablesOfABatchNeverStopped()
      throws IOException {
    Path out = folder.resolve("stopped");
    StopSignal stop = StopSignal.create();
    BatchResult stopped;
    // one worker, so units run in order: the stop comes as u3 begins (what a signal then does),
    // when u1 and u2 have finished; u3's chains see it at their first sweep and u3 is given up
    try (BatchRun run = BatchRun.prepare(request(out));
        TaskEngine engine = new OnUnit("u3", TaskEngine.local(1), StopSignal::request)) {
      stopped = run.run(engine, TaskEngine.Progress.none(), stop);
    }
    assertFalse(stopped.complete());
    assertEquals(2, stopped.outcomes().size(), stopped.outcomes().toString());
    BatchResult whole = uninterrupted();
    List<String> unitRows = lines(out.resolve(BatchRun.UNITS_FILE));
    assertEquals(3, unitRows.size(), "the header and the two finished units: " + unitRows);
    assertEquals(Files.readString(out.resolve(BatchRun.UNITS_FILE)).length(),
        String.join("\r\n", unitRows).length() + 2, "every row ends with its record end");
    // the rows written so far are rows of the batch never stopped, key for key
    assertTrue(lines(whole.unitsFile()).containsAll(unitRows), unitRows.toString());
    List<String> summaryRows = lines(out.resolve(BatchRun.SUMMARY_FILE));
    assertEquals(3, summaryRows.size(), summaryRows.toString());
    assertTrue(lines(whole.summaryFile()).containsAll(summaryRows), summaryRows.toString());
    assertFalse(Files.exists(out.resolve(UnitFit.UNITS_FOLDER).resolve("u3")),
        "the unit given up left no folder");

    BatchResult resumed = resume(out);
    assertTrue(resumed.complete());
    assertEquals(whole.outcomes(), resumed.outcomes());
    assertArrayEquals(Files.readAllBytes(whole.unitsFile()),
        Files.readAllBytes(resumed.unitsFile()));
    assertArrayEquals(Files.readAllBytes(whole.summaryFile()),
        Files.readAllBytes(resumed.summaryFile()));
  }

  @Test
  void aFullDiskKeepsTheUnitsFinishedBeforeWithWholeRows() throws IOException {
    Path out = folder.resolve("full");
    // the disk fills in the middle of the third unit's summary rows: part of them reaches the
    // file, then the write fails
    int[] appends = {0};
    RowWrites fillsUp = (channel, bytes) -> {
      if (channel.size() > 0 && ++appends[0] == 5) {
        ByteBuffer part = bytes.duplicate();
        part.limit(part.position() + part.remaining() / 2);
        int written = channel.write(part);
        bytes.position(bytes.position() + written);
        throw new IOException("No space left on device");
      }
      return channel.write(bytes);
    };
    BatchStoppedException full;
    try (BatchRun run = BatchRun.prepare(request(out)); TaskEngine engine = TaskEngine.local(1)) {
      full = assertThrows(BatchStoppedException.class,
          () -> run.run(engine, TaskEngine.Progress.none(), StopSignal.create(), fillsUp));
    }
    assertTrue(full.getMessage().startsWith("cannot write " + out.resolve(BatchRun.SUMMARY_FILE)
        + ": No space left on device; the 2 of 6 units that finished are kept in "
        + out), full.getMessage());
    assertTrue(full.getMessage().endsWith("; --resume " + out + " fits the others"),
        full.getMessage());
    BatchResult whole = uninterrupted();
    String summary = Files.readString(out.resolve(BatchRun.SUMMARY_FILE));
    assertTrue(summary.endsWith("\r\n"), "whole rows only: " + summary);
    assertEquals(3, lines(out.resolve(BatchRun.SUMMARY_FILE)).size(), summary);
    assertEquals(3, lines(out.resolve(BatchRun.UNITS_FILE)).size());
    assertTrue(lines(whole.summaryFile()).containsAll(lines(out.resolve(BatchRun.SUMMARY_FILE))));

    BatchResult resumed = resume(out);
    assertArrayEquals(Files.readAllBytes(whole.summaryFile()),
        Files.readAllBytes(resumed.summaryFile()));
    assertArrayEquals(Files.readAllBytes(whole.unitsFile()),
        Files.readAllBytes(resumed.unitsFile()));
  }

  @Test
  void aUnitWhoseTaskFailsEndsTheBatchAndKeepsTheUnitsFinishedBefore() throws IOException {
    Path out = folder.resolve("crashed");
    BatchStoppedException crashed;
    try (BatchRun run = BatchRun.prepare(request(out));
        TaskEngine engine = new OnUnit("u4", TaskEngine.local(1), stopping -> {
          throw new OutOfMemoryError("the worker of u4 ran out of memory");
        })) {
      crashed = assertThrows(BatchStoppedException.class,
          () -> run.run(engine, TaskEngine.Progress.none()));
    }
    assertEquals(
        "a unit's task failed: java.lang.OutOfMemoryError: the worker of u4 ran out of memory; the"
            + " 3 of 6 units that finished are kept in " + out + " (summary.csv, units.csv);"
            + " --resume " + out + " fits the others",
        crashed.getMessage());
    assertEquals(4, lines(out.resolve(BatchRun.UNITS_FILE)).size());

    BatchResult resumed = resume(out);
    BatchResult whole = uninterrupted();
    assertArrayEquals(Files.readAllBytes(whole.summaryFile()),
        Files.readAllBytes(resumed.summaryFile()));
    assertArrayEquals(Files.readAllBytes(whole.unitsFile()),
        Files.readAllBytes(resumed.unitsFile()));
  }

  @Test
  void aTornLastRowAndSummaryRowsOfAnUnfinishedUnitAreDroppedOnResume() throws IOException {
    BatchResult whole = uninterrupted();
    // what a batch killed mid-write leaves: u1 and u2 whole, u3's summary row but no units row,
    // and half of u4's summary row
    Path out = Files.createDirectories(folder.resolve("torn"));
    Files.copy(whole.folder().resolve(BatchFacts.FILE_NAME), out.resolve(BatchFacts.FILE_NAME));
    List<String> summary = lines(whole.summaryFile());
    List<String> units = lines(whole.unitsFile());
    Files.writeString(out.resolve(BatchRun.SUMMARY_FILE),
        String.join("\r\n", summary.subList(0, 4)) + "\r\n" + summary.get(4).substring(0, 9));
    Files.writeString(out.resolve(BatchRun.UNITS_FILE),
        String.join("\r\n", units.subList(0, 3)) + "\r\n");
    BatchResult resumed = resume(out);
    assertArrayEquals(Files.readAllBytes(whole.summaryFile()),
        Files.readAllBytes(resumed.summaryFile()));
    assertArrayEquals(Files.readAllBytes(whole.unitsFile()),
        Files.readAllBytes(resumed.unitsFile()));
  }

  @Test
  void aResumeIsRefusedForOtherDataOtherSettingsAFinishedBatchAndNoBatch() throws IOException {
    BatchResult whole = uninterrupted();
    Path out = whole.folder();
    RunRefusedException finished =
        assertThrows(RunRefusedException.class,
            () -> BatchRun.prepare(request(null).resuming(out)));
    assertEquals("the batch in " + out + " is finished (every unit has its row in units.csv):"
        + " nothing to resume", finished.getMessage());

    List<String> units = lines(whole.unitsFile());
    Files.writeString(out.resolve(BatchRun.UNITS_FILE),
        String.join("\r\n", units.subList(0, 3)) + "\r\n");
    BatchRequest asked = request(null);
    BatchRequest otherDraws =
        new BatchRequest(asked.modelFile(), asked.units(), null, null, 300, null, 12L, null, false,
            null, asked.emptyCells(), false, out);
    RunRefusedException settings =
        assertThrows(RunRefusedException.class, () -> BatchRun.prepare(otherDraws));
    assertEquals("the batch in " + out + " was made with --draws 200, --seed 11; a resumed batch"
        + " keeps its settings (leave these options out)", settings.getMessage());

    List<UnitData> changed = new ArrayList<>(asked.units());
    changed.set(5, UnitData.of("u6", List.of(new DataText("y.csv", "y\n9\n"))));
    BatchRequest otherData =
        new BatchRequest(asked.modelFile(), changed, null, null, null, null, null, null, false,
            null, asked.emptyCells(), false, out);
    RunRefusedException data =
        assertThrows(RunRefusedException.class, () -> BatchRun.prepare(otherData));
    assertTrue(data.getMessage().startsWith("the model or the units' data changed since the batch in "
        + out + " was stopped"), data.getMessage());

    Path empty = Files.createDirectories(folder.resolve("empty"));
    RunRefusedException none =
        assertThrows(RunRefusedException.class,
            () -> BatchRun.prepare(request(null).resuming(empty)));
    assertTrue(none.getMessage().startsWith("no batch to resume in " + empty), none.getMessage());
    // the refusals left the stopped batch as it was, and resumable
    assertEquals(3, lines(out.resolve(BatchRun.UNITS_FILE)).size());
    assertEquals(whole.outcomes(), resume(out).outcomes());
  }

  @Test
  void aBatchHeldByAnotherRunCannotBeResumedAtTheSameTime() throws IOException {
    Path out = folder.resolve("held");
    try (BatchRun first = BatchRun.prepare(request(out))) {
      RunRefusedException inUse =
          assertThrows(RunRefusedException.class,
              () -> BatchRun.prepare(request(null).resuming(out)));
      assertTrue(inUse.getMessage().contains("is in use by another run"), inUse.getMessage());
    }
  }

  private static List<String> lines(Path file) throws IOException {
    return Files.readAllLines(file);
  }

  /**
   * A local engine that does {@code action} (with the run's stop) in the worker as {@code unit}
   * begins: requests the stop, as a signal then would, or throws an {@link OutOfMemoryError} from
   * the task (not a failed outcome), as a worker that runs out of heap does.
   */
  private static final class OnUnit implements TaskEngine {
    private final String unit;
    private final TaskEngine inner;
    private final java.util.function.Consumer<StopSignal> action;

    OnUnit(String unit, TaskEngine inner, java.util.function.Consumer<StopSignal> action) {
      this.unit = unit;
      this.inner = inner;
      this.action = action;
    }

    @Override
    public <I extends Serializable, R extends Outcome> void each(
        List<I> inputs, Task<I, R> task, Finished<R> finished, Progress progress, StopSignal stop) {
      Task<I, R> acting = new Task<>() {
        @Override
        public R run(I input) {
          return run(input, StopSignal.create());
        }

        @Override
        public R run(I input, StopSignal stopping) {
          if (((UnitData) input).name().equals(unit)) {
            action.accept(stopping);
          }
          return task.run(input, stopping);
        }
      };
      inner.each(inputs, acting, finished, progress, stop);
    }

    @Override
    public String description() {
      return "a local engine that acts as " + unit + " begins";
    }

    @Override
    public void close() {
      inner.close();
    }
  }
}

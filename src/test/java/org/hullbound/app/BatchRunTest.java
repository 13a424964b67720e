package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.StopSignal;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A batch fits each unit as {@code fit} would fit it alone with the unit's seed: the same draws
 * bit for bit whatever the workers, the order or the other units; a unit that fails is a row of
 * its own and the others finish; both input forms give the same files.
 */
class BatchRunTest {
  @TempDir Path folder;

  @Test
  void aUnitRefittedAloneWithItsSeedGivesTheSameDrawsBitForBit() throws IOException {
    Path model = BatchFixture.model(folder);
    Path units = BatchFixture.units(folder, "a", BatchFixture.A, "b", BatchFixture.B);
    Path out = folder.resolve("batch");
    BatchResult batch =
        BatchFixture.run(
            BatchFixture.request(model, BatchUnits.fromFolder(units, List.of()), out, true), 2);
    long seed = UnitSeeds.of(11, "b");
    assertEquals(seed, batch.outcomes().get(1).seed());

    Path alone = folder.resolve("alone");
    FitRequest request =
        new FitRequest(
            new ModelInputs(model, List.of(units.resolve("b/y.csv"))), null, 2, 100, 200, 1, seed,
            null, alone, null, false, 0.95);
    try (FitRun run = FitRun.prepare(request)) {
      run.run(ProgressListener.none(), StopSignal.create());
    }
    Path kept = UnitFit.folderOf(out, "b", seed);
    // Rows of different chains interleave in the order the chains' threads hand them over (the
    // alone fit runs its chains side by side, the batch's unit on one thread), so the rows are
    // compared in chain and draw order: every row, every digit.
    assertEquals(rowsInChainOrder(alone.resolve("draws.csv")),
        rowsInChainOrder(kept.resolve("draws.csv")));
    assertArrayEquals(
        Files.readAllBytes(alone.resolve("summary.csv")),
        Files.readAllBytes(kept.resolve("summary.csv")));
  }

  @Test
  void theFilesAreTheSameWhateverTheWorkersAndTheOtherUnits() throws IOException {
    Path model = BatchFixture.model(folder);
    Path units = BatchFixture.units(folder, "a", BatchFixture.A, "b", BatchFixture.B);
    List<UnitData> both = BatchUnits.fromFolder(units, List.of());
    BatchResult one =
        BatchFixture.run(BatchFixture.request(model, both, folder.resolve("w1"), false), 1);
    BatchResult two =
        BatchFixture.run(BatchFixture.request(model, both, folder.resolve("w2"), false), 2);
    assertArrayEquals(Files.readAllBytes(one.summaryFile()), Files.readAllBytes(two.summaryFile()));
    assertArrayEquals(Files.readAllBytes(one.unitsFile()), Files.readAllBytes(two.unitsFile()));

    BatchResult onlyB =
        BatchFixture.run(
            BatchFixture.request(model, both.subList(1, 2), folder.resolve("b-only"), false), 1);
    assertEquals(two.outcomes().get(1), onlyB.outcomes().get(0));
    assertFalse(Files.exists(folder.resolve("w1").resolve(UnitFit.UNITS_FOLDER)),
        "without --keep-draws no unit folder is left");
  }

  @Test
  void aUnitWithBadDataIsARowWithItsErrorAndTheOthersFinish() throws IOException {
    Path model = BatchFixture.model(folder);
    Path units =
        BatchFixture.units(folder, "a", BatchFixture.A, "b", BatchFixture.B, "c",
            BatchFixture.C_BAD);
    Path out = folder.resolve("batch");
    BatchResult batch =
        BatchFixture.run(
            BatchFixture.request(model, BatchUnits.fromFolder(units, List.of()), out, false), 2);
    assertEquals(1, batch.failedCount());
    UnitOutcome c = batch.outcomes().get(2);
    assertEquals(UnitOutcome.FAILED, c.status());
    Path copy = UnitFit.folderOf(out, "c", c.seed()).resolve("y.csv");
    assertEquals(copy + ":3:1: 'seven' in column 'y' is not a number", c.verdict());
    assertTrue(Files.exists(copy),
        "a failed unit's folder stays, so that the message's file is there");
    List<String> unitRows = Files.readAllLines(batch.unitsFile());
    assertEquals(4, unitRows.size(), unitRows.toString());
    assertTrue(unitRows.get(3).startsWith("c," + c.seed() + ",failed,"), unitRows.get(3));
    List<String> summary = Files.readAllLines(batch.summaryFile());
    assertEquals(List.of("unit", "unknown"), List.of(summary.get(0).split(",")).subList(0, 2));
    assertEquals(3, summary.size(), "one row for mu in each of a and b: " + summary);
    assertTrue(summary.get(1).startsWith("a,mu,") && summary.get(2).startsWith("b,mu,"),
        summary.toString());
  }

  @Test
  void aUnitColumnGivesTheSameFilesAsAFolderPerUnit() throws IOException {
    Path model = BatchFixture.model(folder);
    Path units = BatchFixture.units(folder, "a", BatchFixture.A, "b", BatchFixture.B);
    Path oneFile =
        Files.writeString(folder.resolve("all.csv"),
            "site,y\na,1.2\nb,-0.5\na,0.4\nb,-1.1\na,2.1\nb,0.2\na,1.7\n");
    BatchResult byFolder =
        BatchFixture.run(
            BatchFixture.request(model, BatchUnits.fromFolder(units, List.of()),
                folder.resolve("f"), false), 2);
    BatchResult byColumn =
        BatchFixture.run(
            BatchFixture.request(model, BatchUnits.byColumn(List.of(oneFile), "site"),
                folder.resolve("c"), false), 2);
    assertEquals(Files.readString(byFolder.unitsFile()), Files.readString(byColumn.unitsFile()));
    assertArrayEquals(Files.readAllBytes(byFolder.summaryFile()),
        Files.readAllBytes(byColumn.summaryFile()));
    assertArrayEquals(Files.readAllBytes(byFolder.unitsFile()),
        Files.readAllBytes(byColumn.unitsFile()));
  }

  @Test
  void formsWithoutUnitsAndEarlierBatchesAreRefusedBeforeAnyUnitRuns() throws IOException {
    Path model = BatchFixture.model(folder);
    Path oneFile = Files.writeString(folder.resolve("all.csv"), "site,y\na,1\n,2\n");
    RunRefusedException noColumn =
        assertThrows(RunRefusedException.class,
            () -> BatchUnits.byColumn(List.of(oneFile), "region"));
    assertTrue(noColumn.getMessage().contains("no --data file has a column named 'region'"),
        noColumn.getMessage());
    RunRefusedException emptyCell =
        assertThrows(RunRefusedException.class,
            () -> BatchUnits.byColumn(List.of(oneFile), "site"));
    assertTrue(emptyCell.getMessage().startsWith(oneFile + ":3: "), emptyCell.getMessage());
    assertThrows(RunRefusedException.class,
        () -> BatchUnits.fromFolder(Files.createDirectories(folder.resolve("empty")), List.of()));

    Path units = BatchFixture.units(folder, "a", BatchFixture.A);
    Path out = folder.resolve("batch");
    BatchFixture.run(BatchFixture.request(model, BatchUnits.fromFolder(units, List.of()), out,
        false), 1);
    RunRefusedException earlier =
        assertThrows(RunRefusedException.class,
            () -> BatchRun.prepare(BatchFixture.request(model,
                BatchUnits.fromFolder(units, List.of()), out, false)));
    assertTrue(earlier.getMessage().contains("holds an earlier batch"), earlier.getMessage());
  }

  /** The header, then every row sorted by its chain and draw (the file's first two columns). */
  private static List<String> rowsInChainOrder(Path draws) throws IOException {
    List<String> lines = Files.readAllLines(draws);
    List<String> rows = new ArrayList<>(lines.subList(1, lines.size()));
    rows.sort(Comparator
        .comparingLong((String row) -> Long.parseLong(row.split(",", 3)[0]))
        .thenComparingLong(row -> Long.parseLong(row.split(",", 3)[1])));
    rows.add(0, lines.get(0));
    return rows;
  }
}

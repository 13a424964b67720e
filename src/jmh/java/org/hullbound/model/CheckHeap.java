package org.hullbound.model;

import java.lang.management.MemoryPoolMXBean;
import java.util.List;
import org.hullbound.io.CsvData;
import org.hullbound.io.HeapMeasurement;

/**
 * Heap that {@code check}'s work holds, in bytes per data row per used column: reads {@code FILE}
 * for {@code MODEL} as {@code check} does, binds it, asks every unknown's update, the moves and
 * the test quantities (what {@code check} prints), lets the data table go, and reports the used
 * heap after full collections with the bound model alive, less the same before reading. Also the
 * largest heap any pool reached ({@link MemoryPoolMXBean#getPeakUsage}: garbage included, an
 * upper bound of what the run needed).
 *
 * <p>Issue 14's goal is at most 100 bytes per row per used numeric column held.
 *
 * <p>{@code java -cp target/benchmarks.jar org.hullbound.model.CheckHeap MODEL FILE}
 */
public final class CheckHeap {
  private CheckHeap() {}

  public static void main(String[] args) throws Exception {
    HeapMeasurement run = HeapMeasurement.begin(args, CheckHeap.class.getName());
    DataTable table = CsvData.read(run.dataFile(), BoundModel.readsColumn(run.model()));
    int rows = table.rowCount();
    int columns = table.heldColumnCount();
    BoundModel bound = BoundModel.bind(run.model(), List.of(table));
    table = null;
    for (Unknown unknown : bound.unknowns()) {
      bound.update(unknown.index());
      bound.dependentCount(unknown.index());
    }
    int moves = bound.moves().size();
    TestQuantities tests = TestQuantities.of(bound);
    double seconds = run.seconds();
    long peak = HeapMeasurement.peak();
    long held = run.held();
    System.out.printf(
        "%s: %d rows, %d used columns, %d unknowns, %d terms, %d moves; %.1f MB held by the"
            + " bound model, %.1f bytes per row per used column; pools' peaks summed %.1f MB;"
            + " read, bound and analysed in %.1f s (wall clock, machine load not controlled)%n",
        run.dataFile(), rows, columns, bound.unknowns().size(), bound.termCount(), moves,
        held / 1e6, (double) held / rows / columns, peak / 1e6, seconds);
    // Keeps the model and its test quantities reachable until after the measurement.
    if (bound.termCount() < tests.quantities().size()) {
      System.out.println(bound + " " + tests);
    }
  }
}

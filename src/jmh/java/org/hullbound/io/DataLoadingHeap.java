package org.hullbound.io;

import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;

/**
 * Heap held by a data table read from a file, in bytes per row per column kept: the used heap
 * after a full collection with the table alive, less the same before reading. Reads {@code FILE}
 * for {@code MODEL} as {@code check} does (only the columns the model reads are kept).
 *
 * <p>{@code java -cp target/benchmarks.jar org.hullbound.io.DataLoadingHeap MODEL FILE}
 */
public final class DataLoadingHeap {
  private DataLoadingHeap() {}

  public static void main(String[] args) throws Exception {
    HeapMeasurement run = HeapMeasurement.begin(args, DataLoadingHeap.class.getName());
    DataTable table = CsvData.read(run.dataFile(), BoundModel.readsColumn(run.model()));
    double seconds = run.seconds();
    long held = run.held();
    System.out.printf(
        "%s: %d rows, %d of %d columns kept; %.1f MB held, %.2f bytes per row per kept column;"
            + " read in %.1f s (wall clock, machine load not controlled)%n",
        run.dataFile(), table.rowCount(), table.heldColumnCount(), table.header().size(),
        held / 1e6, (double) held / table.rowCount() / table.heldColumnCount(), seconds);
    // Keeps the table reachable until after the measurement.
    if (table.rowCount() < 0) {
      System.out.println(table);
    }
  }
}

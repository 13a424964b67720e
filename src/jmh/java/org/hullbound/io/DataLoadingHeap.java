package org.hullbound.io;

import java.lang.management.ManagementFactory;
import java.lang.management.MemoryMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
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
    Path modelFile = Path.of(args[0]);
    Path dataFile = Path.of(args[1]);
    ModelFile model =
        Parser.parse(SourceText.of(modelFile.toString(), Files.readString(modelFile)));
    MemoryMXBean memory = ManagementFactory.getMemoryMXBean();
    long before = settledHeap(memory);
    long start = System.nanoTime();
    DataTable table = CsvData.read(dataFile, BoundModel.readsColumn(model));
    double seconds = (System.nanoTime() - start) / 1e9;
    long after = settledHeap(memory);
    long held = after - before;
    System.out.printf(
        "%s: %d rows, %d of %d columns kept; %.1f MB held, %.2f bytes per row per kept column;"
            + " read in %.1f s (wall clock, machine load not controlled)%n",
        dataFile, table.rowCount(), table.heldColumnCount(), table.header().size(), held / 1e6,
        (double) held / table.rowCount() / table.heldColumnCount(), seconds);
    // Keeps the table reachable until after the measurement.
    if (table.rowCount() < 0) {
      System.out.println(table);
    }
  }

  /** The used heap after five full collections, the least seen (also for {@code CheckHeap}). */
  public static long settledHeap(MemoryMXBean memory) throws InterruptedException {
    long used = Long.MAX_VALUE;
    for (int i = 0; i < 5; i++) {
      System.gc();
      Thread.sleep(100);
      used = Math.min(used, memory.getHeapMemoryUsage().getUsed());
    }
    return used;
  }
}

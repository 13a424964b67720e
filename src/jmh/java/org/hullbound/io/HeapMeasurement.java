package org.hullbound.io;

import java.lang.management.ManagementFactory;
import java.lang.management.MemoryMXBean;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.file.Files;
import java.nio.file.Path;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;

/**
 * The start of a heap harness's {@code main} ({@link DataLoadingHeap}, {@code model.CheckHeap}):
 * the model parsed from {@code MODEL}, the data file {@code FILE}, the used heap settled before
 * the work and the pools' peaks reset, and the clock started. The harness then does its work and
 * asks {@link #held()}, {@link #peak()} and {@link #seconds()}.
 *
 * @param dataFile the data file to read
 * @param model the parsed model
 * @param before the settled used heap before the work, in bytes
 * @param start {@link System#nanoTime()} when the work began
 */
public record HeapMeasurement(Path dataFile, ModelFile model, long before, long start) {
  private static final MemoryMXBean MEMORY = ManagementFactory.getMemoryMXBean();

  /**
   * Reads {@code MODEL FILE} from {@code args} and settles the heap.
   *
   * @throws IllegalArgumentException when {@code args} are not a model and a data file
   */
  public static HeapMeasurement begin(String[] args, String harness) throws Exception {
    if (args.length != 2) {
      throw new IllegalArgumentException("usage: java -cp target/benchmarks.jar " + harness + " MODEL FILE");
    }
    Path modelFile = Path.of(args[0]);
    ModelFile model =
        Parser.parse(SourceText.of(modelFile.toString(), Files.readString(modelFile)));
    long before = settledHeap();
    for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
      pool.resetPeakUsage();
    }
    return new HeapMeasurement(Path.of(args[1]), model, before, System.nanoTime());
  }

  /** Seconds since the work began (wall clock). */
  public double seconds() {
    return (System.nanoTime() - start) / 1e9;
  }

  /** The settled used heap now, less the same before the work: what the work's results hold. */
  public long held() throws InterruptedException {
    return settledHeap() - before;
  }

  /**
   * The heap pools' peaks since the work began, summed: garbage included, an upper bound of what
   * the work needed.
   */
  public static long peak() {
    long peak = 0;
    for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
      if (pool.getType() == MemoryType.HEAP) {
        peak += pool.getPeakUsage().getUsed();
      }
    }
    return peak;
  }

  /** The used heap after five full collections, the least seen. */
  private static long settledHeap() throws InterruptedException {
    long used = Long.MAX_VALUE;
    for (int i = 0; i < 5; i++) {
      System.gc();
      Thread.sleep(100);
      used = Math.min(used, MEMORY.getHeapMemoryUsage().getUsed());
    }
    return used;
  }
}

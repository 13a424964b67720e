package org.hullbound.app;

import java.nio.file.Path;
import java.util.function.Supplier;
import org.hullbound.gibbs.MemoryBudget;

/**
 * A run ran out of Java heap, with where it was and what it held, so that the message can say what
 * helps: a heap filled while the data were read, bound or compiled is filled by the data's rows,
 * and keeping fewer draws cannot help it; a heap filled while sampling or summarising is filled
 * by the kept draws only when they are a large share of it ({@link MemoryBudget#NOTE_SHARE}).
 * (Issue 14: a {@code fit} of a 200 MB file that ran out while binding was told to keep fewer
 * draws.)
 */
public final class HeapExhaustedException extends RuntimeException {
  /** Where the run was when the heap ran out. */
  public enum Stage {
    /** Reading the data files and binding the model to them. */
    READING,
    /** Compiling the model's conditionals and choosing its updates. */
    COMPILING,
    /** Running the chains (their first sweeps also compile the moves' lines). */
    SAMPLING,
    /** Summarising the kept draws and writing the summary and report. */
    SUMMARISING
  }

  private final Stage stage;
  private final long heapBytes;
  private final long dataFileBytes;
  private final long dataRows;
  private final long keptDrawBytes;
  private final transient Path drawsFile;

  private HeapExhaustedException(
      Stage stage, Facts facts, Path drawsFile, OutOfMemoryError cause) {
    super("out of memory while " + stage.name().toLowerCase(java.util.Locale.ROOT), cause);
    this.stage = stage;
    this.heapBytes = Runtime.getRuntime().maxMemory();
    this.dataFileBytes = facts.dataFileBytes();
    this.dataRows = facts.dataRows();
    this.keptDrawBytes = facts.keptDrawBytes();
    this.drawsFile = drawsFile;
  }

  /**
   * What the run knew when the heap ran out: the data files' size in bytes, the rows bound (-1
   * before binding ended) and what the kept draws hold at their peak (-1 before the settings are
   * known).
   */
  public record Facts(long dataFileBytes, long dataRows, long keptDrawBytes) {
    /** These facts with the rows bound. */
    public Facts withRows(long rows) {
      return new Facts(dataFileBytes, rows, keptDrawBytes);
    }

    /** These facts with what the kept draws hold at their peak. */
    public Facts withKeptDrawBytes(long bytes) {
      return new Facts(dataFileBytes, dataRows, bytes);
    }
  }

  /**
   * {@code work}'s result; an {@link OutOfMemoryError} it throws becomes this exception at {@code
   * stage} (what {@code work} allocated is unreachable by then, so making it is safe).
   */
  static <T> T during(Stage stage, Facts facts, Supplier<T> work) {
    try {
      return work.get();
    } catch (OutOfMemoryError full) {
      throw new HeapExhaustedException(stage, facts, null, full);
    }
  }

  /**
   * The heap ran out at {@code stage}, knowing {@code facts}; the draws made before are in {@code
   * drawsFile} (null when none was written).
   */
  public static HeapExhaustedException of(
      Stage stage, Facts facts, Path drawsFile, OutOfMemoryError cause) {
    if (stage == null || facts == null || cause == null) {
      throw new IllegalArgumentException("stage, facts and cause must not be null");
    }
    return new HeapExhaustedException(stage, facts, drawsFile, cause);
  }

  /** Where the run was. */
  public Stage stage() {
    return stage;
  }

  /** The JVM's maximum heap, {@code Runtime.maxMemory()}. */
  public long heapBytes() {
    return heapBytes;
  }

  /** The data files' size in bytes. */
  public long dataFileBytes() {
    return dataFileBytes;
  }

  /** The data rows bound, or -1 when the heap ran out before binding ended. */
  public long dataRows() {
    return dataRows;
  }

  /** What the kept draws hold at their peak ({@link MemoryBudget#bytes()}), or -1 if unknown. */
  public long keptDrawBytes() {
    return keptDrawBytes;
  }

  /**
   * Whether the kept draws are a large share of the heap ({@link MemoryBudget#NOTE_SHARE}), so that
   * keeping fewer of them helps; never before sampling, when none is held yet.
   */
  public boolean drawsAreACause() {
    return (stage == Stage.SAMPLING || stage == Stage.SUMMARISING)
        && keptDrawBytes >= 0
        && keptDrawBytes > MemoryBudget.NOTE_SHARE * heapBytes;
  }

  /** The draws file holding the draws made before the heap ran out, or null when none was. */
  public Path drawsFile() {
    return drawsFile;
  }
}

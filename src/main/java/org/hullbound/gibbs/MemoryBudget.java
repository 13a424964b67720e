package org.hullbound.gibbs;

import java.util.Locale;

/**
 * What a run will hold in memory for its kept draws, and whether that fits a heap: the figure
 * {@code fit} checks before it samples, so a run too big for the JVM is refused at once instead of
 * failing with an out-of-memory error hours later.
 *
 * <p>The estimate is {@code chains x kept draws x unknowns x 8 bytes x 3}: the {@link DrawStore}
 * grows by doubling, so it can hold up to twice the kept draws, and the summary and report keep
 * one validated copy of every unknown's draws ({@code diagnostics.Draws}) while the page is drawn;
 * the diagnostics' per-unknown working arrays (sorted, split, rank-normalised copies) are made one
 * unknown at a time and are small beside that. Sharing limits are common practice, not a published
 * rule: above {@link #REFUSE_SHARE} of the maximum heap a run is refused, above {@link
 * #NOTE_SHARE} it is noted.
 */
public final class MemoryBudget {
  /** Copies of the kept draws a run holds at its peak (store with growth room, plus the report's). */
  public static final int COPIES = 3;

  /** Above this share of the maximum heap a run is refused. */
  public static final double REFUSE_SHARE = 0.60;

  /** Above this share of the maximum heap a run is noted on standard error. */
  public static final double NOTE_SHARE = 0.25;

  /** What to do with a run of a given size. */
  public enum Decision {
    /** Small beside the heap: say nothing. */
    FITS,
    /** Fits, but is a large part of the heap: say what it will hold. */
    NOTE,
    /** Too large for the heap: refuse before sampling. */
    REFUSE
  }

  private final long chains;
  private final long draws;
  private final long unknowns;

  private MemoryBudget(long chains, long draws, long unknowns) {
    this.chains = chains;
    this.draws = draws;
    this.unknowns = unknowns;
  }

  /**
   * The budget of a run of {@code chains} chains keeping {@code draws} draws each of {@code
   * unknowns} scalar unknowns.
   *
   * @throws IllegalArgumentException if a count is negative
   */
  public static MemoryBudget of(long chains, long draws, long unknowns) {
    if (chains < 0 || draws < 0 || unknowns < 0) {
      throw new IllegalArgumentException(
          "chains, draws and unknowns must be >= 0, got " + chains + ", " + draws + ", "
              + unknowns);
    }
    return new MemoryBudget(chains, draws, unknowns);
  }

  /** Bytes of one copy of the kept draws, saturating at {@link Long#MAX_VALUE}. */
  public long drawBytes() {
    return saturatingProduct(chains, draws, unknowns, Double.BYTES);
  }

  /** Bytes the run will hold at its peak, saturating at {@link Long#MAX_VALUE}. */
  public long bytes() {
    return saturatingProduct(drawBytes(), COPIES, 1, 1);
  }

  /**
   * What to do given a maximum heap of {@code maxHeapBytes} ({@code Runtime.maxMemory()}).
   *
   * @throws IllegalArgumentException if {@code maxHeapBytes} is not positive
   */
  public Decision against(long maxHeapBytes) {
    if (maxHeapBytes <= 0) {
      throw new IllegalArgumentException("maxHeapBytes must be > 0, got " + maxHeapBytes);
    }
    // Doubles: both figures may be near Long.MAX_VALUE, where a product would overflow.
    double share = (double) bytes() / (double) maxHeapBytes;
    if (share > REFUSE_SHARE) {
      return Decision.REFUSE;
    }
    return share > NOTE_SHARE ? Decision.NOTE : Decision.FITS;
  }

  /** A byte count in binary units for people: {@code 512 bytes}, {@code 3.2 MiB}, {@code 1.5 GiB}. */
  public static String describe(long bytes) {
    if (bytes < 0) {
      throw new IllegalArgumentException("bytes must be >= 0, got " + bytes);
    }
    if (bytes < 1024) {
      return bytes + " bytes";
    }
    String[] units = {"KiB", "MiB", "GiB", "TiB", "PiB", "EiB"};
    double value = bytes;
    int unit = -1;
    while (value >= 1024 && unit < units.length - 1) {
      value /= 1024;
      unit++;
    }
    return String.format(Locale.ROOT, "%.1f %s", value, units[unit]);
  }

  private static long saturatingProduct(long a, long b, long c, long d) {
    try {
      return Math.multiplyExact(Math.multiplyExact(Math.multiplyExact(a, b), c), d);
    } catch (ArithmeticException overflow) {
      return Long.MAX_VALUE;
    }
  }
}

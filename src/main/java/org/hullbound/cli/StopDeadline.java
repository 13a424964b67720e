package org.hullbound.cli;

import java.lang.management.GarbageCollectorMXBean;
import java.lang.management.ManagementFactory;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.function.LongSupplier;

/**
 * How long the signal's hook waits for a stopped run to write its files: until they are written,
 * never longer than {@link #LIMIT_NANOS} in all, and no longer once the garbage collector has
 * taken at least {@link #THRASHING_SHARE} of the wall-clock time over the last {@link
 * #WINDOW_NANOS}. A heap so full that the collector runs back to back writes nothing more in
 * useful time: a 2.3-million-row {@code fit} whose rows nearly filled the default heap took 157 s
 * from SIGTERM to exit (issue 14), the two minutes of the wait and then some.
 *
 * <p>The collector's time is the sum of {@link GarbageCollectorMXBean#getCollectionTime()} over
 * the JVM's collectors (pauses, for the default G1); the share is common practice as a sign of a
 * heap too small for its live data (the Parallel collector's overhead limit, which G1 lacks, is
 * 98% of the time).
 */
final class StopDeadline {
  /** The longest wait in all (a large report of a healthy run can take a while). */
  static final long LIMIT_NANOS = TimeUnit.MINUTES.toNanos(2);

  /** The span over which the collector's share of the time is measured. */
  static final long WINDOW_NANOS = TimeUnit.SECONDS.toNanos(5);

  /** The collector's share of {@link #WINDOW_NANOS} from which the wait ends. */
  static final double THRASHING_SHARE = 0.5;

  /** How often the collector's time is read. */
  private static final long POLL_NANOS = TimeUnit.MILLISECONDS.toNanos(100);

  /** Samples held: a window's at the polling rate, four times over (polls are late under load). */
  private static final int SAMPLES = (int) (4 * WINDOW_NANOS / POLL_NANOS);

  /** How a wait ended: the files written, the limit reached, or the collector thrashing. */
  enum Ending {
    WRITTEN,
    LIMIT,
    THRASHING
  }

  /**
   * A wait's end, with how long it lasted and the collector's share of the last window (NaN
   * before a whole window has passed).
   */
  record Outcome(Ending ending, long waitedNanos, double collectorShare) {}

  /** Waiting on something done by another thread: true once done, false after {@code nanos}. */
  interface Waiting {
    boolean await(long nanos) throws InterruptedException;
  }

  private final LongSupplier wallNanos;
  private final LongSupplier collectorMillis;
  private final long limitNanos;

  private StopDeadline(LongSupplier wallNanos, LongSupplier collectorMillis, long limitNanos) {
    this.wallNanos = wallNanos;
    this.collectorMillis = collectorMillis;
    this.limitNanos = limitNanos;
  }

  /**
   * The JVM's clock and collectors, with the two-minute limit; made, with the collectors looked
   * up, before any signal comes.
   */
  static StopDeadline ofThisJvm() {
    List<GarbageCollectorMXBean> collectors = ManagementFactory.getGarbageCollectorMXBeans();
    return new StopDeadline(System::nanoTime, () -> collectorMillis(collectors), LIMIT_NANOS);
  }

  /** A deadline on the given clocks (tests). */
  static StopDeadline of(LongSupplier wallNanos, LongSupplier collectorMillis, long limitNanos) {
    return new StopDeadline(wallNanos, collectorMillis, limitNanos);
  }

  /**
   * Waits for {@code written} until it is done, the limit passes or the collector thrashes.
   *
   * <p>Allocates its samples first and makes no object per poll: in a heap that thrashes, every
   * allocation past the thread's own buffer waits for a collection, and linking a lambda or loading
   * a class there took seconds (measured: 11 s before the first poll in a 256 MB heap kept full).
   * The caller makes {@code written} before the signal comes.
   */
  Outcome await(Waiting written) throws InterruptedException {
    long[] times = new long[SAMPLES];
    long[] collected = new long[SAMPLES];
    long start = wallNanos.getAsLong();
    times[0] = start;
    collected[0] = collectorMillis.getAsLong();
    long newest = 0; // samples oldest .. newest are held, index modulo SAMPLES
    long oldest = 0;
    while (true) {
      long now = wallNanos.getAsLong();
      long left = limitNanos - (now - start);
      double share = share(times, collected, oldest, newest);
      if (left <= 0) {
        return new Outcome(Ending.LIMIT, now - start, share);
      }
      if (written.await(Math.min(left, POLL_NANOS))) {
        return new Outcome(Ending.WRITTEN, wallNanos.getAsLong() - start, share);
      }
      newest++;
      if (newest - oldest >= SAMPLES) {
        oldest++;
      }
      int at = (int) (newest % SAMPLES);
      times[at] = wallNanos.getAsLong();
      collected[at] = collectorMillis.getAsLong();
      // keep one sample at least a window older than the newest, none older than that one
      while (oldest + 1 < newest
          && times[at] - times[(int) ((oldest + 1) % SAMPLES)] >= WINDOW_NANOS) {
        oldest++;
      }
      share = share(times, collected, oldest, newest);
      if (share >= THRASHING_SHARE) {
        return new Outcome(Ending.THRASHING, times[at] - start, share);
      }
    }
  }

  /**
   * The collector's share of the time from sample {@code oldest} to {@code newest}, over a window.
   */
  private static double share(long[] times, long[] collected, long oldest, long newest) {
    int first = (int) (oldest % SAMPLES);
    int last = (int) (newest % SAMPLES);
    long wall = times[last] - times[first];
    if (wall < WINDOW_NANOS) {
      return Double.NaN;
    }
    return Math.min(1.0, (collected[last] - collected[first]) * 1e6 / wall);
  }

  /** The collection time of {@code collectors} so far, in milliseconds. */
  private static long collectorMillis(List<GarbageCollectorMXBean> collectors) {
    long total = 0;
    for (int k = 0; k < collectors.size(); k++) {
      total += Math.max(0, collectors.get(k).getCollectionTime());
    }
    return total;
  }
}

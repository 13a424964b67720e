package org.hullbound.cli;

import java.lang.management.GarbageCollectorMXBean;
import java.lang.management.ManagementFactory;
import java.util.ArrayDeque;
import java.util.Iterator;
import java.util.concurrent.CountDownLatch;
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

  /** The JVM's clock and collectors, with the two-minute limit. */
  static StopDeadline ofThisJvm() {
    return new StopDeadline(System::nanoTime, StopDeadline::collectorMillis, LIMIT_NANOS);
  }

  /** A deadline on the given clocks (tests). */
  static StopDeadline of(LongSupplier wallNanos, LongSupplier collectorMillis, long limitNanos) {
    return new StopDeadline(wallNanos, collectorMillis, limitNanos);
  }

  /** Waits for {@code written} under this deadline. */
  Outcome await(CountDownLatch written) throws InterruptedException {
    return await(nanos -> written.await(nanos, TimeUnit.NANOSECONDS));
  }

  /** Waits for {@code written} until it is done, the limit passes or the collector thrashes. */
  Outcome await(Waiting written) throws InterruptedException {
    long start = wallNanos.getAsLong();
    // (wall nanos, collector millis) samples, oldest first, spanning a little more than a window
    ArrayDeque<long[]> samples = new ArrayDeque<>();
    samples.add(new long[] {start, collectorMillis.getAsLong()});
    while (true) {
      long now = wallNanos.getAsLong();
      long left = limitNanos - (now - start);
      if (left <= 0) {
        return new Outcome(Ending.LIMIT, now - start, share(samples));
      }
      if (written.await(Math.min(left, POLL_NANOS))) {
        return new Outcome(Ending.WRITTEN, wallNanos.getAsLong() - start, share(samples));
      }
      samples.add(new long[] {wallNanos.getAsLong(), collectorMillis.getAsLong()});
      // keep one sample at least a window old, drop those older than it
      while (samples.size() > 2) {
        Iterator<long[]> oldest = samples.iterator();
        oldest.next();
        long[] second = oldest.next();
        if (samples.getLast()[0] - second[0] < WINDOW_NANOS) {
          break;
        }
        samples.removeFirst();
      }
      double share = share(samples);
      if (share >= THRASHING_SHARE) {
        return new Outcome(Ending.THRASHING, samples.getLast()[0] - start, share);
      }
    }
  }

  /** The collector's share of the time from the oldest to the newest sample, over a window. */
  private static double share(ArrayDeque<long[]> samples) {
    long[] first = samples.getFirst();
    long[] last = samples.getLast();
    long wall = last[0] - first[0];
    if (wall < WINDOW_NANOS) {
      return Double.NaN;
    }
    return Math.min(1.0, (last[1] - first[1]) * 1e6 / wall);
  }

  /** The collection time of every collector of this JVM so far, in milliseconds. */
  private static long collectorMillis() {
    long total = 0;
    for (GarbageCollectorMXBean collector : ManagementFactory.getGarbageCollectorMXBeans()) {
      total += Math.max(0, collector.getCollectionTime());
    }
    return total;
  }
}

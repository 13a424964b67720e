package org.hullbound.cli;

import java.io.PrintWriter;
import java.time.Duration;
import java.util.function.LongSupplier;
import org.hullbound.app.TaskEngine;

/**
 * Shows how many tasks (a batch's units, a calibration's replicates) are done, failed and left,
 * and the time left, on standard error: on a terminal one line redrawn in place, elsewhere a plain
 * line at each tenth of the work and at the end. The time left assumes the tasks left take as long
 * as those done.
 */
final class TaskProgressLine implements TaskEngine.Progress {
  private static final long REDRAW_NANOS = 200_000_000L;

  private final PrintWriter err;
  private final boolean terminal;
  private final String command;
  private final String noun;
  private final LongSupplier clock;
  private final long start;
  private long lastPrint = Long.MIN_VALUE;
  private int lastTenth = 0;
  private boolean printed;

  private TaskProgressLine(
      PrintWriter err, boolean terminal, String command, String noun, LongSupplier clock) {
    this.err = err;
    this.terminal = terminal;
    this.command = command;
    this.noun = noun;
    this.clock = clock;
    this.start = clock.getAsLong();
  }

  /**
   * A line for {@code command}'s tasks, called {@code noun} (plural), redrawn when {@code
   * terminal}.
   */
  static TaskProgressLine of(PrintWriter err, boolean terminal, String command, String noun) {
    return new TaskProgressLine(err, terminal, command, noun, System::nanoTime);
  }

  /** The same with a given clock (nanoseconds), for tests. */
  static TaskProgressLine of(
      PrintWriter err, boolean terminal, String command, String noun, LongSupplier clock) {
    return new TaskProgressLine(err, terminal, command, noun, clock);
  }

  @Override
  public synchronized void update(int done, int failed, int total) {
    long now = clock.getAsLong();
    boolean last = done >= total;
    int tenth = total == 0 ? 10 : (int) (10L * done / total);
    if (terminal ? (now - lastPrint < REDRAW_NANOS && !last) : (tenth == lastTenth && !last)) {
      return;
    }
    lastPrint = now;
    lastTenth = tenth;
    String line = text(done, failed, total, Duration.ofNanos(Math.max(0, now - start)));
    if (terminal) {
      err.print("\r" + line + "\u001b[K");
      printed = true;
    } else {
      err.println(line);
    }
    err.flush();
  }

  /** Ends the redrawn line so that what follows starts on a fresh line. */
  synchronized void finish() {
    if (terminal && printed) {
      err.print('\n');
      err.flush();
      printed = false;
    }
  }

  /** {@code hullbound fit-units: 12 of 40 units done, 1 failed, 28 left, about 1m05s left}. */
  String text(int done, int failed, int total, Duration elapsed) {
    StringBuilder line =
        new StringBuilder("hullbound ").append(command).append(": ").append(done).append(" of ")
            .append(total).append(' ').append(noun).append(" done");
    if (failed > 0) {
      line.append(", ").append(failed).append(" failed");
    }
    int left = total - done;
    if (left > 0) {
      line.append(", ").append(left).append(" left");
      if (done > 0) {
        long seconds = Math.round(elapsed.toNanos() / 1e9 / done * left);
        line.append(", about ").append(ProgressDisplay.format(Duration.ofSeconds(seconds)))
            .append(" left");
      }
    }
    return line.toString();
  }
}

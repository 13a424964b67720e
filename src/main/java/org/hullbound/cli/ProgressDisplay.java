package org.hullbound.cli;

import java.io.PrintWriter;
import java.time.Duration;
import java.util.Locale;
import java.util.function.LongSupplier;
import org.hullbound.gibbs.ChainProgress;
import org.hullbound.gibbs.ProgressListener;

/**
 * Shows the chains' progress on standard error: on a terminal one short line redrawn in place (an
 * overall bar, each chain's draws, the speed and the time left), elsewhere (a log file, CI) a
 * plain line with every chain's figures every few seconds.
 *
 * <p>Thread-safe: the chains report from their own threads; the display keeps the latest report of
 * each and prints at most at its own pace, so that printing never slows the sampling.
 */
final class ProgressDisplay implements ProgressListener {
  private static final long REDRAW_NANOS = 200_000_000L;
  private static final long PLAIN_NANOS = 5_000_000_000L;
  private static final int BAR_WIDTH = 16;
  /** The redrawn line must not wrap, or the carriage return no longer reaches its start. */
  private static final int MAX_TERMINAL_WIDTH = 79;

  private final PrintWriter err;
  private final boolean terminal;
  private final ChainProgress[] latest;
  private final LongSupplier clock;
  private long lastPrint;
  private boolean printed;
  private int lastWidth;

  private ProgressDisplay(PrintWriter err, boolean terminal, int chains, LongSupplier clock) {
    this.err = err;
    this.terminal = terminal;
    this.latest = new ChainProgress[chains];
    this.clock = clock;
    this.lastPrint = clock.getAsLong();
  }

  /** A display of {@code chains} chains writing to {@code err}, redrawn when {@code terminal}. */
  static ProgressDisplay of(PrintWriter err, boolean terminal, int chains) {
    return new ProgressDisplay(err, terminal, chains, System::nanoTime);
  }

  /** The same with a given clock (nanoseconds), for tests. */
  static ProgressDisplay of(PrintWriter err, boolean terminal, int chains, LongSupplier clock) {
    return new ProgressDisplay(err, terminal, chains, clock);
  }

  @Override
  public synchronized void progress(ChainProgress progress) {
    latest[progress.chain()] = progress;
    long now = clock.getAsLong();
    boolean allFinished = true;
    for (ChainProgress chain : latest) {
      allFinished &= chain != null && chain.finished();
    }
    if (now - lastPrint >= (terminal ? REDRAW_NANOS : PLAIN_NANOS) || allFinished) {
      lastPrint = now;
      if (terminal) {
        redraw();
      } else {
        printPlain();
      }
    }
  }

  /** Ends the redrawn line so that what follows starts on a fresh line. */
  synchronized void finish() {
    if (terminal && printed) {
      err.print('\n');
      err.flush();
      printed = false;
    }
  }

  /** {@code [######..........] 38%  draws/chain 512 480 b20% -  735/s  1m05s left}. */
  private void redraw() {
    long done = 0;
    long total = 0;
    long sweepsTotal = 0;
    for (ChainProgress chain : latest) {
      if (chain != null) {
        sweepsTotal = chain.sweepsTotal();
      }
    }
    double rate = 0;
    double drawRate = 0;
    int running = 0;
    StringBuilder cells = new StringBuilder();
    for (ChainProgress chain : latest) {
      cells.append(' ');
      total += sweepsTotal;
      if (chain == null) {
        cells.append('-');
        continue;
      }
      done += chain.sweepsDone();
      if (chain.finished()) {
        cells.append(chain.drawsDone() == chain.drawsTotal() ? "done" : chain.drawsDone());
        continue;
      }
      running++;
      rate += chain.sweepsPerSecond();
      drawRate += chain.drawsPerSecond();
      if (chain.inBurnIn()) {
        cells.append('b')
            .append(chain.burnIn() == 0 ? 100 : chain.sweepsDone() * 100 / chain.burnIn())
            .append('%');
      } else {
        cells.append(chain.drawsDone());
      }
    }
    double fraction = total == 0 ? 1 : (double) done / total;
    int filled = (int) Math.round(fraction * BAR_WIDTH);
    StringBuilder line = new StringBuilder();
    line.append('[').append("#".repeat(filled)).append(".".repeat(BAR_WIDTH - filled)).append("] ");
    line.append(String.format(Locale.ROOT, "%3d%%", Math.round(fraction * 100)));
    line.append("  draws/chain").append(cells);
    if (running > 0) {
      line.append(String.format(Locale.ROOT, "  %.0f/s", drawRate / running));
      if (rate > 0) {
        long seconds = (long) Math.ceil((total - done) / rate);
        line.append("  ").append(format(Duration.ofSeconds(seconds))).append(" left");
      }
    }
    String text = line.length() > MAX_TERMINAL_WIDTH
        ? line.substring(0, MAX_TERMINAL_WIDTH) : line.toString();
    int pad = Math.max(0, lastWidth - text.length());
    err.print('\r' + text + " ".repeat(pad));
    lastWidth = text.length();
    printed = true;
    err.flush();
  }

  /** {@code chain 1 512/1000 draws 740 draws/s 1s left | chain 2 burn-in 60/100 ...}. */
  private void printPlain() {
    StringBuilder line = new StringBuilder();
    for (int chain = 0; chain < latest.length; chain++) {
      ChainProgress progress = latest[chain];
      if (chain > 0) {
        line.append(" | ");
      }
      line.append("chain ").append(chain + 1).append(' ');
      if (progress == null) {
        line.append("waiting");
        continue;
      }
      if (progress.inBurnIn()) {
        line.append("burn-in ").append(progress.sweepsDone()).append('/').append(progress.burnIn());
      } else {
        line.append(progress.drawsDone()).append('/').append(progress.drawsTotal())
            .append(" draws");
      }
      line.append(String.format(Locale.ROOT, " %.0f draws/s", progress.drawsPerSecond()));
      if (!progress.finished()) {
        line.append(' ').append(format(progress.timeLeft())).append(" left");
      } else {
        line.append(" done");
      }
    }
    err.println(line);
    err.flush();
  }

  /** A short duration: {@code 42s}, {@code 3m05s}, {@code 1h02m}. */
  static String format(Duration duration) {
    long seconds = Math.max(0, duration.toSeconds());
    if (seconds < 60) {
      return seconds + "s";
    }
    if (seconds < 3600) {
      return String.format(Locale.ROOT, "%dm%02ds", seconds / 60, seconds % 60);
    }
    return String.format(Locale.ROOT, "%dh%02dm", seconds / 3600, (seconds % 3600) / 60);
  }
}

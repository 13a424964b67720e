package org.hullbound.cli;

import java.io.PrintWriter;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.hullbound.app.StartupGuard;
import org.hullbound.gibbs.StopSignal;

/**
 * What {@code fit} and {@code fit-units} do on Ctrl-C (SIGINT) or SIGTERM, whenever it comes:
 * before sampling, one line saying nothing was written and an immediate end; while sampling, a
 * stop request to the chains (of every running unit, for a batch) and a bounded wait until the run
 * has written its files and released its folder ({@link StopDeadline}: two minutes at most, and
 * no longer once the collector thrashes on a full heap, which ends the wait with one line). The
 * JVM then ends with the signal's own status (130 for SIGINT, 143 for SIGTERM).
 *
 * <p>A signal before sampling also releases the output folder if the run being prepared has locked
 * it ({@link StartupGuard}): the preparing thread does not get to release it itself.
 *
 * <p>Installed as the first thing the command does, so that a signal during reading or compiling
 * finds it: adding a shutdown hook while the JVM already shuts down throws "Shutdown in progress",
 * which used to surface as an internal error.
 */
final class SignalStop implements AutoCloseable {
  private final PrintWriter stderr;
  /** The command's name, as its messages begin. */
  private final String command;
  /** The line printed when a signal comes before the work begins. */
  private final String beforeWork;
  private final CountDownLatch finished = new CountDownLatch(1);
  /** The wait for {@link #finished} after a signal, made now: see {@link StopDeadline#await}. */
  private final StopDeadline deadline = StopDeadline.ofThisJvm();
  private final StopDeadline.Waiting written =
      nanos -> finished.await(nanos, TimeUnit.NANOSECONDS);
  private final Thread hook;
  /** The start-up's folder lock, released by a signal before sampling. */
  private final StartupGuard startup = StartupGuard.create();
  /** The chains' stop, once sampling began; guarded by this. */
  private StopSignal sampling;
  /** Set when a signal came before sampling; guarded by this. */
  private boolean signalled;

  private SignalStop(PrintWriter stderr, String command, String beforeWork) {
    this.stderr = stderr;
    this.command = command;
    this.beforeWork = beforeWork;
    this.hook = new Thread(this::onSignal, "hullbound-interrupt");
    // once now, on a heap with room, so that the hook's wait loads and links nothing under a
    // thrashing collector; and the line it may print
    try {
      deadline.await(nanos -> true);
    } catch (InterruptedException interrupted) {
      Thread.currentThread().interrupt();
    }
    givingUp(command, new StopDeadline.Outcome(StopDeadline.Ending.THRASHING, 0, 0.5));
  }

  /**
   * Registers {@code fit}'s hook now; when the JVM is already shutting down, one that reports so.
   */
  static SignalStop install(PrintWriter stderr) {
    return install(
        stderr, "fit", "stopped by a signal before sampling began; no file was written");
  }

  /**
   * Registers a hook for {@code command}, whose work is stopped the same way ({@code fit-units}:
   * every running unit's chains), which prints {@code beforeWork} when the signal comes first.
   */
  static SignalStop install(PrintWriter stderr, String command, String beforeWork) {
    SignalStop stop = new SignalStop(stderr, command, beforeWork);
    try {
      Runtime.getRuntime().addShutdownHook(stop.hook);
    } catch (IllegalStateException shuttingDown) {
      stop.onSignal();
    }
    return stop;
  }

  /**
   * Hands the chains' stop to the hook before the run changes any file; false when a signal
   * already came, and the caller must end without writing.
   */
  synchronized boolean beginSampling(StopSignal stop) {
    if (signalled) {
      return false;
    }
    sampling = stop;
    return true;
  }

  private void onSignal() {
    StopSignal stop;
    synchronized (this) {
      stop = sampling;
      if (stop == null) {
        if (!signalled) {
          signalled = true;
          stderr.println("hullbound " + command + ": " + beforeWork);
          stderr.flush();
        }
      }
    }
    if (stop == null) {
      // the thread preparing the run never reaches its finally once the hooks end: release the
      // folder it may have locked here
      startup.stop();
      return;
    }
    stop.request();
    try {
      StopDeadline.Outcome waited = deadline.await(written);
      if (waited.ending() != StopDeadline.Ending.WRITTEN) {
        stderr.println(givingUp(command, waited));
        stderr.flush();
      }
    } catch (InterruptedException interrupted) {
      Thread.currentThread().interrupt();
    }
  }

  /** The one line said when the hook ends the JVM before the stopped run wrote its files. */
  static String givingUp(String command, StopDeadline.Outcome waited) {
    // a StringBuilder, not string concatenation, which links a method on its first use
    StringBuilder line = new StringBuilder("hullbound ").append(command).append(": ");
    if (waited.ending() == StopDeadline.Ending.THRASHING) {
      line.append("the Java heap is full (the collector took ")
          .append(Math.round(100 * waited.collectorShare())).append("% of the last ")
          .append(TimeUnit.NANOSECONDS.toSeconds(StopDeadline.WINDOW_NANOS)).append(" s), so ");
    }
    return line.append("the run ends ").append(Math.round(waited.waitedNanos() / 1e9))
        .append(" s after the signal without waiting longer for its files: ")
        .append(command.equals("fit") ? "draws.csv keeps its" : "the batch's tables keep their")
        .append(" whole rows, and a file not yet written is missing, never half written")
        .toString();
  }

  /** The guard through which the run being prepared locks its folder. */
  StartupGuard startup() {
    return startup;
  }

  /**
   * Releases a waiting hook and removes it unless it already runs. Closed after the run (its
   * files written, its folder lock released by closing it), so a JVM ending on a signal ends
   * only then.
   */
  @Override
  public void close() {
    finished.countDown();
    try {
      Runtime.getRuntime().removeShutdownHook(hook);
    } catch (IllegalStateException shuttingDown) {
      // The JVM is already exiting (a signal): the hook is running and has just been released.
    }
  }
}

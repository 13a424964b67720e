package org.hullbound.app;

import java.io.Serializable;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorCompletionService;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import org.hullbound.gibbs.StopSignal;

/**
 * {@link TaskEngine} on a fixed pool of threads of this machine: each task runs once, with the
 * run's stop signal, and its result and the progress are handed on from the caller's thread as
 * the task ends.
 */
final class LocalTasks implements TaskEngine {
  private final int workers;
  private final ExecutorService pool;

  private LocalTasks(int workers) {
    this.workers = workers;
    this.pool =
        Executors.newFixedThreadPool(
            workers,
            runnable -> {
              Thread thread = new Thread(runnable, "hullbound-task");
              thread.setDaemon(true);
              return thread;
            });
  }

  static LocalTasks of(int workers) {
    if (workers < 1) {
      throw new IllegalArgumentException("workers must be at least 1, got " + workers);
    }
    return new LocalTasks(workers);
  }

  @Override
  public <I extends Serializable, R extends Outcome> void each(
      List<I> inputs, Task<I, R> task, Finished<R> finished, Progress progress, StopSignal stop) {
    ExecutorCompletionService<Done<R>> done = new ExecutorCompletionService<>(pool);
    for (int k = 0; k < inputs.size(); k++) {
      int index = k;
      // A task not begun when the stop comes ends at once without a result: queued tasks drain
      // in microseconds, and running ones end within a sweep (the stop reaches their chains).
      done.submit(() -> new Done<>(index, stop.isRequested() ? null : runStoppingOnFailure(
          task, inputs.get(index), stop)));
    }
    int ended = 0;
    int handed = 0;
    int failed = 0;
    RuntimeException firstFailure = null;
    Error firstError = null;
    boolean interrupted = false;
    boolean refusing = false;
    while (ended < inputs.size()) {
      Done<R> result;
      try {
        result = done.take().get();
      } catch (InterruptedException e) {
        // the caller's thread was interrupted: stop the tasks, wait for them, then say so
        interrupted = true;
        stop.request();
        continue;
      } catch (ExecutionException e) {
        ended++;
        stop.request();
        if (firstFailure == null && firstError == null) {
          if (e.getCause() instanceof RuntimeException unchecked) {
            firstFailure = unchecked;
          } else if (e.getCause() instanceof Error error) {
            firstError = error;
          } else {
            firstFailure = new IllegalStateException(e.getCause());
          }
        }
        continue;
      }
      ended++;
      if (result.value() == null || refusing) {
        // not run (stopped), or after finished refused a result: nothing more is handed on; a
        // task that ends after another task's failure is still handed on, its work being whole
        continue;
      }
      try {
        finished.accept(result.index(), result.value());
      } catch (RuntimeException refused) {
        stop.request();
        refusing = true;
        if (firstFailure == null && firstError == null) {
          firstFailure = refused;
        }
        continue;
      }
      handed++;
      failed += result.value().failed() ? 1 : 0;
      progress.update(handed, failed, inputs.size());
    }
    if (interrupted) {
      Thread.currentThread().interrupt();
      throw new IllegalStateException("interrupted while tasks ran");
    }
    if (firstError != null) {
      throw firstError;
    }
    if (firstFailure != null) {
      throw firstFailure;
    }
  }

  /**
   * Runs one task; one that throws requests the stop on its own thread before it ends, so that no
   * task begins after it (the caller's thread sees the failure only later, and a worker would
   * otherwise take the next task first).
   */
  private static <I extends Serializable, R extends Outcome> R runStoppingOnFailure(
      Task<I, R> task, I input, StopSignal stop) {
    try {
      return task.run(input, stop);
    } catch (Throwable failure) {
      stop.request();
      throw failure;
    }
  }

  /** A task's index and result; a null result for a task that a stop kept from running. */
  private record Done<R>(int index, R value) {}

  @Override
  public String description() {
    return workers + " local worker" + (workers == 1 ? "" : "s");
  }

  @Override
  public void close() {
    pool.shutdownNow();
  }
}

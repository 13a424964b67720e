package org.hullbound.app;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorCompletionService;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

/**
 * {@link TaskEngine} on a fixed pool of threads of this machine: each task runs once, results are
 * put back in input order, and the progress is told after each task from the caller's thread.
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
  public <I extends Serializable, R extends Outcome> List<R> run(
      List<I> inputs, Task<I, R> task, Progress progress) {
    ExecutorCompletionService<Integer> done = new ExecutorCompletionService<>(pool);
    List<R> results = new ArrayList<>(inputs.size());
    List<Future<Integer>> futures = new ArrayList<>();
    for (int k = 0; k < inputs.size(); k++) {
      results.add(null);
    }
    for (int k = 0; k < inputs.size(); k++) {
      int index = k;
      futures.add(done.submit(() -> {
        results.set(index, task.run(inputs.get(index)));
        return index;
      }));
    }
    int finished = 0;
    int failed = 0;
    try {
      for (int k = 0; k < inputs.size(); k++) {
        int index = done.take().get();
        finished++;
        failed += results.get(index).failed() ? 1 : 0;
        progress.update(finished, failed, inputs.size());
      }
    } catch (InterruptedException e) {
      futures.forEach(future -> future.cancel(true));
      Thread.currentThread().interrupt();
      throw new IllegalStateException("interrupted while tasks ran", e);
    } catch (ExecutionException e) {
      futures.forEach(future -> future.cancel(true));
      if (e.getCause() instanceof RuntimeException unchecked) {
        throw unchecked;
      }
      if (e.getCause() instanceof Error error) {
        throw error;
      }
      throw new IllegalStateException(e.getCause());
    }
    return results;
  }

  @Override
  public String description() {
    return workers + " local worker" + (workers == 1 ? "" : "s");
  }

  @Override
  public void close() {
    pool.shutdownNow();
  }
}

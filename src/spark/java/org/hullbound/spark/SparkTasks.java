package org.hullbound.spark;

import java.io.Serializable;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import org.apache.spark.SparkConf;
import org.apache.spark.api.java.JavaFutureAction;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.util.LongAccumulator;
import org.hullbound.app.TaskEngine;

/**
 * {@link TaskEngine} on Apache Spark: each input becomes one partition, so one Spark task, running
 * the same hullbound code as a local worker; the results are collected to the driver in input
 * order.
 *
 * <p>Why one task per input: a lost or failed attempt is retried by Spark alone and costs one
 * replicate or unit; its result is the same because every seed comes from the input. Progress is
 * read on the driver from two accumulators (tasks done, tasks whose work failed), which Spark
 * merges once per successful task, so a retried attempt is not counted twice.
 */
public final class SparkTasks implements TaskEngine {
  private static final long POLL_MILLIS = 500;

  private final JavaSparkContext context;
  private final boolean owned;

  private SparkTasks(JavaSparkContext context, boolean owned) {
    this.context = context;
    this.owned = owned;
  }

  /**
   * An engine on a new context made from {@code conf} (the master as spark-submit or the caller
   * set it, else {@code local[*]}); {@link #close} stops it.
   */
  public static SparkTasks of(SparkConf conf) {
    if (conf == null) {
      throw new IllegalArgumentException("conf must not be null");
    }
    SparkConf settled =
        conf.clone()
            .setIfMissing("spark.master", "local[*]")
            .setIfMissing("spark.app.name", "hullbound")
            // our own progress line instead of Spark's console bar
            .setIfMissing("spark.ui.showConsoleProgress", "false")
            .setIfMissing("spark.log.level", "WARN");
    JavaSparkContext context = new JavaSparkContext(settled);
    context.setLogLevel("WARN");
    return new SparkTasks(context, true);
  }

  /** An engine on an existing context, which {@link #close} leaves running. */
  public static SparkTasks on(JavaSparkContext context) {
    if (context == null) {
      throw new IllegalArgumentException("context must not be null");
    }
    return new SparkTasks(context, false);
  }

  @Override
  public <I extends Serializable, R extends Outcome> List<R> run(
      List<I> inputs, Task<I, R> task, Progress progress) {
    int total = inputs.size();
    if (total == 0) {
      return List.of();
    }
    LongAccumulator done = context.sc().longAccumulator("hullbound tasks done");
    LongAccumulator failed = context.sc().longAccumulator("hullbound tasks failed");
    JavaFutureAction<List<R>> results =
        context
            .parallelize(inputs, total)
            .map(
                input -> {
                  R result = task.run(input);
                  done.add(1);
                  if (result.failed()) {
                    failed.add(1);
                  }
                  return result;
                })
            .collectAsync();
    long shown = -1;
    while (true) {
      try {
        List<R> collected = results.get(POLL_MILLIS, TimeUnit.MILLISECONDS);
        progress.update(total, (int) (long) failed.value(), total);
        return collected;
      } catch (TimeoutException stillRunning) {
        long now = done.value();
        if (now != shown) {
          shown = now;
          progress.update((int) now, (int) (long) failed.value(), total);
        }
      } catch (InterruptedException e) {
        results.cancel(true);
        Thread.currentThread().interrupt();
        throw new IllegalStateException("interrupted while Spark tasks ran", e);
      } catch (ExecutionException e) {
        Throwable cause = e.getCause() == null ? e : e.getCause();
        String message = String.valueOf(cause.getMessage()).lines().findFirst().orElse("");
        throw new IllegalStateException("a Spark task failed for good: " + message, cause);
      }
    }
  }

  @Override
  public String description() {
    return "Spark (" + context.master() + ", default parallelism " + context.defaultParallelism() + ")";
  }

  @Override
  public void close() {
    if (owned) {
      context.stop();
    }
  }
}

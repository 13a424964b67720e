package org.hullbound.spark;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import org.apache.spark.FutureAction;
import org.apache.spark.SparkConf;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.api.java.JavaSparkContext;
import org.hullbound.app.TaskEngine;
import org.hullbound.gibbs.StopSignal;
import scala.Function0;
import scala.Function1;
import scala.Function2;
import scala.jdk.javaapi.CollectionConverters;
import scala.runtime.BoxedUnit;

/**
 * {@link TaskEngine} on Apache Spark: each input becomes one partition, so one Spark task, running
 * the same hullbound code as a local worker; each result is handed to the driver as its task
 * succeeds (Spark's job result handler, {@code SparkContext.submitJob}), so that a batch writes a
 * finished unit's rows while the others still run.
 *
 * <p>Why one task per input: a lost or failed attempt is retried by Spark alone and costs one
 * replicate or unit; its result is the same because every seed comes from the input. Spark calls
 * the result handler once per partition that succeeded, so a retried attempt is not counted or
 * handed on twice. A stop cancels the job: running tasks are killed and their units left for a
 * later run.
 */
public final class SparkTasks implements TaskEngine {
  /** How often the driver looks at the stop while no result comes in. */
  private static final long POLL_MILLIS = 50;

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
  public <I extends Serializable, R extends Outcome> void each(
      List<I> inputs, Task<I, R> task, Finished<R> finished, Progress progress, StopSignal stop) {
    int total = inputs.size();
    if (total == 0) {
      return;
    }
    // Spark calls the handler on the driver, on its scheduler's thread, once per partition that
    // succeeded (a retried attempt is handed on once); the caller's thread takes them from here.
    BlockingQueue<Map.Entry<Integer, R>> arrived = new LinkedBlockingQueue<>();
    Function1<scala.collection.Iterator<I>, R> perPartition =
        (Function1<scala.collection.Iterator<I>, R> & Serializable) partition -> task.run(partition.next());
    Function2<Object, R, BoxedUnit> handler =
        (index, result) -> {
          arrived.add(Map.entry((Integer) index, result));
          return BoxedUnit.UNIT;
        };
    Function0<BoxedUnit> nothing = () -> BoxedUnit.UNIT;
    List<Object> partitions = new ArrayList<>();
    for (int k = 0; k < total; k++) {
      partitions.add(k);
    }
    JavaRDD<I> rdd = context.parallelize(inputs, total);
    FutureAction<BoxedUnit> job =
        context.sc().submitJob(
            rdd.rdd(), perPartition, CollectionConverters.asScala(partitions).toSeq(), handler,
            nothing);
    int handed = 0;
    int failed = 0;
    RuntimeException refused = null;
    boolean cancelled = false;
    while (true) {
      if (stop.isRequested() && !cancelled) {
        // the running tasks are killed; results already in are still handed on
        cancelled = true;
        job.cancel();
      }
      Map.Entry<Integer, R> next;
      try {
        next = arrived.poll(POLL_MILLIS, TimeUnit.MILLISECONDS);
      } catch (InterruptedException e) {
        job.cancel();
        Thread.currentThread().interrupt();
        throw new IllegalStateException("interrupted while Spark tasks ran", e);
      }
      if (next != null) {
        if (refused == null) {
          try {
            finished.accept(next.getKey(), next.getValue());
            handed++;
            failed += next.getValue().failed() ? 1 : 0;
            progress.update(handed, failed, total);
          } catch (RuntimeException e) {
            refused = e;
            stop.request();
          }
        }
        continue;
      }
      if (job.isCompleted() && arrived.isEmpty()) {
        break;
      }
    }
    if (refused != null) {
      throw refused;
    }
    if (!cancelled) {
      try {
        job.get();
      } catch (Exception e) {
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

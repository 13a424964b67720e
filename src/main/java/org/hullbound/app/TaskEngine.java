package org.hullbound.app;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import org.hullbound.gibbs.StopSignal;

/**
 * Runs many independent tasks (calibration replicates, the units of a batch) and hands back their
 * results in the order of the inputs: on the local cores ({@link #local}) or on a distributed
 * engine found through {@link java.util.ServiceLoader} ({@link Factory}; Apache Spark in the
 * {@code spark} build profile).
 *
 * <p>Why an interface: the work of a task is the same hullbound code wherever it runs, and its
 * result depends only on its input (every seed is derived from the input, never from the worker,
 * the order or the attempt), so the engine changes how fast results come, never what they are.
 * A task is {@link Serializable}, with serializable inputs and results, so that an engine may
 * ship it to other machines and run it again after a lost attempt.
 */
public interface TaskEngine extends AutoCloseable {

  /** One task: a pure function of its input, run once per input (or again after a lost attempt). */
  @FunctionalInterface
  interface Task<I extends Serializable, R extends Outcome> extends Serializable {
    R run(I input);

    /**
     * Runs on {@code input}, giving up early once {@code stop} is requested (the engine's run is
     * being stopped), and then returning null: no result. A task that cannot stop early ignores
     * it. An engine that runs tasks in this process calls this form.
     */
    default R run(I input, StopSignal stop) {
      return run(input);
    }
  }

  /**
   * Told on the caller's side of each task's result as soon as it is in, with its input's index.
   */
  @FunctionalInterface
  interface Finished<R> {
    void accept(int index, R result);
  }

  /** A task's result: serializable, and saying whether the task's own work failed. */
  interface Outcome extends Serializable {
    /** Whether the work failed (and the result carries why), counted apart in the progress. */
    boolean failed();
  }

  /** Told on the caller's side how many tasks are done, of which failed, and how many in all. */
  @FunctionalInterface
  interface Progress {
    void update(int done, int failed, int total);

    /** A progress that shows nothing. */
    static Progress none() {
      return (done, failed, total) -> {};
    }
  }

  /**
   * Runs {@code task} on every input; returns the results in input order when all are done.
   * An exception a task throws (rather than returning a failed outcome) ends the whole run and is
   * rethrown here.
   */
  default <I extends Serializable, R extends Outcome> List<R> run(
      List<I> inputs, Task<I, R> task, Progress progress) {
    List<R> results = new ArrayList<>(Collections.nCopies(inputs.size(), null));
    each(inputs, task, results::set, progress, StopSignal.create());
    return results;
  }

  /**
   * Runs {@code task} on every input and hands each result to {@code finished} as it comes in
   * (on the caller's thread, one at a time, in the order the tasks end), then tells {@code
   * progress}. Returns when every task has ended, or, once {@code stop} is requested, when no task
   * runs any more: tasks not begun are not begun, running ones are asked to stop ({@link
   * Task#run(Serializable, StopSignal)}) or cancelled, and the results that still come in are
   * handed on. A task that throws (rather than returning a failed outcome), or a {@code finished}
   * that throws, requests {@code stop}; the first such exception is rethrown here after the other
   * tasks ended, so that every result finished before it has been handed on.
   */
  <I extends Serializable, R extends Outcome> void each(
      List<I> inputs, Task<I, R> task, Finished<R> finished, Progress progress, StopSignal stop);

  /** The engine's name as shown to the user, e.g. {@code 2 local workers}. */
  String description();

  /** Releases the engine's resources (threads, a Spark context). */
  @Override
  void close();

  /** An engine on {@code workers} threads of this machine. */
  static TaskEngine local(int workers) {
    return LocalTasks.of(workers);
  }

  /**
   * The distributed engine called {@code name}, from the first {@link Factory} of that name on the
   * class path.
   *
   * @throws RunRefusedException when no such engine is on the class path
   */
  static TaskEngine distributed(String name) {
    for (Factory factory : java.util.ServiceLoader.load(Factory.class)) {
      if (factory.name().equals(name)) {
        return factory.open();
      }
    }
    throw new RunRefusedException(
        "this hullbound has no " + name + " engine on its class path: build"
            + " target/spark/hullbound-spark.jar with 'mvn -B -P spark -DskipTests package' and"
            + " start it with spark-submit (docs/spark.md)");
  }

  /**
   * Makes a distributed engine; found with {@link java.util.ServiceLoader}, so that the plain
   * command-line jar carries no engine's code and the engine's jar adds one.
   */
  interface Factory {
    /** The engine's name, e.g. {@code spark}. */
    String name();

    /** A new engine, configured from its own environment (for Spark, what spark-submit set). */
    TaskEngine open();
  }
}

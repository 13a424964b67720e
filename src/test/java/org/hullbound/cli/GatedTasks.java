package org.hullbound.cli;

import java.io.Serializable;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;
import org.hullbound.app.TaskEngine;
import org.hullbound.gibbs.StopSignal;

/**
 * A test's engine for {@code fit-units} in a child JVM: one local worker whose first {@value
 * #OPEN} tasks run at once and whose later tasks wait for the run's stop before they begin (and
 * then end without a result, as a task not begun at a stop does). So a test that sees {@value
 * #OPEN} units' rows in the table knows that no further unit can finish before its signal arrives,
 * whatever the load of the machine.
 *
 * <p>Found by {@link java.util.ServiceLoader} under the name {@code spark}, the only distributed
 * engine {@code --spark} asks for, from a services file the test puts on the child's class path
 * only (never on the build's own, where {@code --spark} must find no engine).
 */
public final class GatedTasks implements TaskEngine.Factory {
  /** Tasks that run before the gate. */
  static final int OPEN = 2;

  /** The services file line that makes this the {@code spark} engine. */
  static final String SERVICE = "META-INF/services/" + TaskEngine.Factory.class.getName();

  private static final AtomicInteger STARTED = new AtomicInteger();

  @Override
  public String name() {
    return "spark";
  }

  @Override
  public TaskEngine open() {
    TaskEngine local = TaskEngine.local(1);
    return new TaskEngine() {
      @Override
      public <I extends Serializable, R extends Outcome> void each(
          List<I> inputs, Task<I, R> task, Finished<R> finished, Progress progress,
          StopSignal stop) {
        Task<I, R> gated = new Task<>() {
          @Override
          public R run(I input) {
            throw new UnsupportedOperationException("a local engine passes the stop signal");
          }

          @Override
          public R run(I input, StopSignal signal) {
            if (STARTED.incrementAndGet() > OPEN) {
              while (!signal.isRequested()) {
                try {
                  Thread.sleep(5); // waiting for a condition, not for luck: the stop ends it
                } catch (InterruptedException interrupted) {
                  Thread.currentThread().interrupt();
                  return null;
                }
              }
              return null;
            }
            return task.run(input, signal);
          }
        };
        local.each(inputs, gated, finished, progress, stop);
      }

      @Override
      public String description() {
        return local.description() + " (the first " + OPEN + " tasks, then none until a stop)";
      }

      @Override
      public void close() {
        local.close();
      }
    };
  }
}

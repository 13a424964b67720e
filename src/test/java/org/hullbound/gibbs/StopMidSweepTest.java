package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.locks.LockSupport;
import org.junit.jupiter.api.Test;

/**
 * A stop request is honoured within a bounded time even in the middle of a slow sweep: the sweep
 * is given up between two updates, and the chain's checkpoint is its last saved whole sweep, from
 * which a resumed run makes exactly the draws of a run never stopped (the reference is that run
 * itself: the claim is identity).
 */
class StopMidSweepTest {
  private static final int UNKNOWNS = 100;

  /** Nanoseconds each density evaluation waits: 0 for the reference, some for the slow run. */
  private final AtomicLong delay = new AtomicLong();

  /** When the test asked the run to stop ({@link System#nanoTime()}). */
  private volatile long requested;

  /** u_k | rest ~ N(0.3 u_(k-1), 1): a chain whose state carries from sweep to sweep. */
  private GibbsSampler sampler() {
    List<UpdateRule> rules = new ArrayList<>();
    for (int k = 0; k < UNKNOWNS; k++) {
      int previous = (k + UNKNOWNS - 1) % UNKNOWNS;
      ScalarConditional conditional =
          (u, state, slope) -> {
            long wait = delay.get();
            if (wait > 0) {
              LockSupport.parkNanos(wait);
            }
            double centre = 0.3 * state[previous];
            if (slope != null) {
              slope[0] = -(u - centre);
            }
            return -0.5 * (u - centre) * (u - centre);
          };
      rules.add(new UpdateRule.AdaptiveRejection(k, conditional, "normal in this test"));
    }
    return GibbsSampler.of(UNKNOWNS, rules, (state, rng) -> {
          for (int k = 0; k < UNKNOWNS; k++) {
            state[k] = rng.nextDouble(-1, 1);
          }
        })
        .withAdaptation(0);
  }

  /** Every kept row of the one chain, as text of its raw bits, in order. */
  private static DrawSink into(List<String> rows) {
    return (chain, draw, values) -> {
      StringBuilder row = new StringBuilder().append(draw).append(':');
      for (double value : values) {
        row.append(Double.doubleToRawLongBits(value)).append(',');
      }
      rows.add(row.toString());
    };
  }

  @Test
  void aStopDuringASlowSweepEndsTheRunSoonAndItsCheckpointResumesExactly() throws Exception {
    RunSettings settings = RunSettings.of(1, 0, 40, 1, 5L);
    List<String> reference = Collections.synchronizedList(new ArrayList<>());
    ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
        .run(sampler(), into(reference));

    // about 3 evaluations of 5 ms per update: a sweep of about 1.5 s, far longer than the grace
    delay.set(TimeUnit.MILLISECONDS.toNanos(5));
    long grace = TimeUnit.MILLISECONDS.toNanos(100);
    StopSignal stop = StopSignal.create();
    List<String> stopped = Collections.synchronizedList(new ArrayList<>());
    Thread interrupter =
        new Thread(() -> {
          LockSupport.parkNanos(TimeUnit.MILLISECONDS.toNanos(3500));
          requested = System.nanoTime();
          stop.request();
        });
    interrupter.start();
    RunOutcome outcome =
        ChainRunner.of(settings, ProgressListener.none(), stop).withStopGrace(grace)
            .run(sampler(), into(stopped));
    long afterRequest = System.nanoTime();
    interrupter.join();
    // the bound: the grace, then at most the update in progress (a few 5 ms evaluations); 700 ms
    // leaves room for a loaded machine and is less than half a sweep, so waiting for the sweep's
    // end would fail it
    long waited = afterRequest - requested;
    assertTrue(waited < TimeUnit.MILLISECONDS.toNanos(700),
        "stopped " + waited / 1_000_000 + " ms after the request");
    assertTrue(outcome.stoppedEarly());
    assertEquals(1, outcome.chainStates().size());
    ChainState checkpoint = outcome.chainStates().get(0);
    int saved = checkpoint.draws();
    assertTrue(saved <= stopped.size() && saved < 40, saved + " of " + stopped.size());

    delay.set(0);
    List<String> resumed = Collections.synchronizedList(new ArrayList<>(stopped.subList(0, saved)));
    ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
        .resume(sampler(), into(resumed), outcome.chainStates());
    assertEquals(reference, resumed);
  }
}

package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.random.RandomGenerator;
import org.junit.jupiter.api.Test;

class ChainRunnerTest {

  /** A Gaussian AR(1) chain whose sweeps take uneven time, to shuffle the thread schedule. */
  private static class Autoregression implements ChainKernel {
    private final int chain;
    private double x;
    private long sweeps;

    Autoregression(int chain, RandomGenerator rng) {
      this.chain = chain;
      this.x = rng.nextDouble(-2, 2);
    }

    @Override
    public int width() {
      return 2;
    }

    @Override
    public void sweep(RandomGenerator rng) {
      sweeps++;
      x = 0.5 * x + rng.nextGaussian();
      if ((sweeps + chain) % 7 == 0) {
        Thread.yield();
      }
    }

    @Override
    public void record(double[] out) {
      out[0] = x;
      out[1] = sweeps;
    }
  }

  private static double[][][] drawsOf(RunSettings settings) {
    DrawStore store = DrawStore.create(settings.chains(), settings.draws(), 2);
    ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
        .run(Autoregression::new, store);
    double[][][] out = new double[2][][];
    out[0] = store.draws(0);
    out[1] = store.draws(1);
    return out;
  }

  @Test
  void theSameSeedGivesTheSameDrawsBitForBitWithOneAndWithFourThreads() {
    RunSettings one = new RunSettings(4, 50, 300, 2, 20261201L, 1);
    double[][][] serial = drawsOf(one);
    double[][][] parallel = drawsOf(one.withThreads(4));
    for (int chain = 0; chain < 4; chain++) {
      assertArrayEquals(serial[0][chain], parallel[0][chain], "chain " + chain);
    }
  }

  @Test
  void differentChainsAndDifferentSeedsGiveDifferentDraws() {
    double[][][] a = drawsOf(new RunSettings(2, 0, 20, 1, 1L, 2));
    double[][][] b = drawsOf(new RunSettings(2, 0, 20, 1, 2L, 2));
    assertFalse(java.util.Arrays.equals(a[0][0], a[0][1]));
    assertFalse(java.util.Arrays.equals(a[0][0], b[0][0]));
  }

  @Test
  void burnInAndThinningDecideWhichSweepsAreKept() {
    // Sweeps 1..10 are burn-in; with thin 3 the kept sweeps are 13, 16, 19, 22.
    double[][][] draws = drawsOf(new RunSettings(1, 10, 4, 3, 5L, 1));
    assertArrayEquals(new double[] {13, 16, 19, 22}, draws[1][0]);
  }

  @Test
  void everyDrawIsHandedOnOnceWithItsChainAndNumber() {
    RunSettings settings = new RunSettings(3, 5, 40, 1, 9L, 3);
    List<String> seen = Collections.synchronizedList(new ArrayList<>());
    RunOutcome outcome =
        ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
            .run(Autoregression::new, (chain, draw, values) -> seen.add(chain + ":" + draw));
    assertEquals(120, seen.size());
    assertEquals(120, new java.util.HashSet<>(seen).size());
    assertFalse(outcome.stoppedEarly());
    assertArrayEquals(new int[] {40, 40, 40}, outcome.drawsKept());
    assertEquals(3, outcome.kernels().size());
  }

  @Test
  void aStopRequestEndsEveryChainAfterAWholeSweep() {
    RunSettings settings = new RunSettings(2, 0, 1_000_000, 1, 3L, 2);
    StopSignal stop = StopSignal.create();
    AtomicInteger handed = new AtomicInteger();
    RunOutcome outcome =
        ChainRunner.of(settings, ProgressListener.none(), stop)
            .run(
                Autoregression::new,
                (chain, draw, values) -> {
                  if (handed.incrementAndGet() == 500) {
                    stop.request();
                  }
                });
    assertTrue(outcome.stoppedEarly());
    int[] kept = outcome.drawsKept();
    assertEquals(handed.get(), kept[0] + kept[1]);
    assertTrue(kept[0] + kept[1] < 2_000_000);
  }

  @Test
  void progressIsReportedPerChainAndEndsFinished() {
    RunSettings settings = new RunSettings(2, 10, 30, 1, 3L, 2);
    ConcurrentHashMap<Integer, ChainProgress> last = new ConcurrentHashMap<>();
    ChainRunner.of(settings, progress -> last.put(progress.chain(), progress), StopSignal.create())
        .run(Autoregression::new, DrawSink.discard());
    for (int chain = 0; chain < 2; chain++) {
      ChainProgress progress = last.get(chain);
      assertTrue(progress.finished());
      assertEquals(40, progress.sweepsDone());
      assertEquals(30, progress.drawsDone());
      assertEquals(1.0, progress.fractionDone());
    }
  }

  @Test
  void aFailingKernelNamesItsChainAndSweepAndStopsTheOthers() {
    RunSettings settings = new RunSettings(3, 0, 10_000_000, 1, 3L, 3);
    KernelFactory factory =
        (chain, rng) ->
            chain != 1
                ? new Autoregression(chain, rng)
                : new Autoregression(chain, rng) {
                  private int count;

                  @Override
                  public void sweep(RandomGenerator generator) {
                    if (++count == 17) {
                      throw new ArithmeticException("log of a negative number");
                    }
                    super.sweep(generator);
                  }
                };
    ChainFailedException failure =
        assertThrows(
            ChainFailedException.class,
            () ->
                ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
                    .run(factory, DrawSink.discard()));
    assertEquals(1, failure.chain());
    assertEquals(17, failure.sweep());
    assertTrue(failure.getMessage().contains("chain 2"), failure.getMessage());
  }

  @Test
  void aFailingUpdateNamesTheUnknownAndItsMethod() {
    ScalarConditional broken = (u, state, slope) -> Double.NaN;
    GibbsSampler sampler =
        GibbsSampler.of(
                1,
                java.util.List.of(new UpdateRule.AdaptiveRejection(0, broken, "test")),
                (state, rng) -> state[0] = 0)
            .withLabels(java.util.List.of("effect[3]"));
    ChainFailedException failure =
        assertThrows(
            ChainFailedException.class,
            () ->
                ChainRunner.of(new RunSettings(1, 0, 5, 1, 1L, 1), ProgressListener.none(),
                        StopSignal.create())
                    .run(sampler, DrawSink.discard()));
    assertTrue(failure.getMessage().contains("updating effect[3] (adaptive rejection)"),
        failure.getMessage());
    assertTrue(failure.getCause() instanceof UpdateFailedException);
  }

  @Test
  void settingsRejectNonsenseNamingTheArgument() {
    IllegalArgumentException e =
        assertThrows(IllegalArgumentException.class, () -> new RunSettings(0, 1, 1, 1, 1L, 1));
    assertTrue(e.getMessage().contains("chains"));
    assertThrows(IllegalArgumentException.class, () -> new RunSettings(1, -1, 1, 1, 1L, 1));
    assertThrows(IllegalArgumentException.class, () -> new RunSettings(1, 1, 0, 1, 1L, 1));
    assertThrows(IllegalArgumentException.class, () -> new RunSettings(1, 1, 1, 0, 1L, 1));
    assertThrows(IllegalArgumentException.class, () -> new RunSettings(1, 1, 1, 1, 1L, 0));
    assertThrows(
        IllegalArgumentException.class,
        () -> new RunSettings(1, 1, Integer.MAX_VALUE, 2, 1L, 1));
  }
}

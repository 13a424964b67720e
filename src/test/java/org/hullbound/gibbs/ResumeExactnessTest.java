package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.random.RandomGenerator;
import org.hullbound.io.CsvData;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The specification of a checkpoint: a run stopped at a given sweep, saved ({@link
 * RunOutcome#chainStates()}) and resumed ({@link ChainRunner#resume}), once or twice, makes exactly
 * the draws of the same run never stopped, bit for bit and in the same order per chain, whatever
 * the thread count. The reference is the uninterrupted run itself (no outside source is needed:
 * the claim is identity).
 *
 * <p>The models cover every updater with adaptive state: {@code seedlings} (a conjugate normal
 * centre, adaptive rejection with warm starts for the spread and the effects), {@code sensors}
 * (ARMS fallback for the level and the drift, tuned during burn-in), and a bimodal conditional
 * claimed log-concave, which switches from adaptive rejection to ARMS at run time; {@code clinics}
 * and {@code extract} add the moves along lines (a shift, a rescale, direction blocks whose
 * directions are learned at the end of burn-in, between the two stops).
 */
class ResumeExactnessTest {
  private static final int BURN_IN = 50;

  /** Settings with thinning, so that the sweep-to-draw arithmetic is exercised across a stop. */
  private static RunSettings settings(int chains, int threads) {
    return new RunSettings(chains, BURN_IN, 60, 2, 11L, threads);
  }

  private static GibbsSampler model(String name) throws IOException {
    if (name.equals("switching")) {
      return GibbsSampler.of(
              1,
              List.of(new UpdateRule.AdaptiveRejection(0, BIMODAL, "claimed log-concave in this test")),
              (state, rng) -> state[0] = rng.nextDouble(-2, 2))
          .withAdaptation(BURN_IN);
    }
    Path modelFile = Path.of("models", name + ".hbm");
    BoundModel bound =
        BoundModel.bind(
            Parser.parse(
                SourceText.of(modelFile.toString(), Files.readString(modelFile, StandardCharsets.UTF_8))),
            List.of(CsvData.read(Path.of("models", name + ".csv"))));
    return ModelSampler.of(bound, Map.of()).sampler().withAdaptation(BURN_IN);
  }

  /** 0.5 N(-2, 1) + 0.5 N(2, 1), not log-concave: the hull finds out during the run. */
  private static final ScalarConditional BIMODAL =
      (u, state, slope) -> {
        double a = -0.5 * (u + 2) * (u + 2);
        double b = -0.5 * (u - 2) * (u - 2);
        double top = Math.max(a, b);
        double value = top + Math.log(Math.exp(a - top) + Math.exp(b - top));
        if (slope != null) {
          slope[0] = -Math.exp(a - value) * (u + 2) - Math.exp(b - value) * (u - 2);
        }
        return value;
      };

  /** Every kept row of every chain, in the order each chain made them (raw bits). */
  static final class Rows implements DrawSink {
    final List<List<String>> perChain = new ArrayList<>();

    Rows(int chains) {
      for (int chain = 0; chain < chains; chain++) {
        perChain.add(new ArrayList<>());
      }
    }

    @Override
    public synchronized void accept(int chain, int draw, double[] values) {
      long[] bits = new long[values.length];
      for (int k = 0; k < values.length; k++) {
        bits[k] = Double.doubleToRawLongBits(values[k]);
      }
      perChain.get(chain).add(draw + ":" + Arrays.toString(bits));
    }
  }

  /**
   * The sampler's kernels, each asking every chain to stop after its own {@code stopAfter}-th
   * sweep of this session (0: never): a deterministic stand-in for Ctrl-C.
   */
  static KernelFactory stoppingAfter(GibbsSampler sampler, long stopAfter, StopSignal stop) {
    return (chain, rng) -> {
      ResumableKernel inner = sampler.newChain(chain, rng);
      return new ResumableKernel() {
        private long sweeps;

        @Override
        public int width() {
          return inner.width();
        }

        @Override
        public void sweep(RandomGenerator generator) {
          inner.sweep(generator);
          if (++sweeps == stopAfter && chain == 0) {
            stop.request();
          }
        }

        @Override
        public void record(double[] out) {
          inner.record(out);
        }

        @Override
        public KernelState save() {
          return inner.save();
        }

        @Override
        public void restore(KernelState saved) {
          inner.restore(saved);
        }
      };
    };
  }

  /**
   * Stops once during burn-in (after 30 sweeps of chain 1) and once after it (60 sweeps later),
   * then runs to the end; compares every chain's rows and final updater states with one run.
   */
  @ParameterizedTest(name = "{0} with {1} thread(s)")
  @CsvSource({
    "seedlings, 1", "seedlings, 4", "sensors, 1", "sensors, 4", "switching, 1", "switching, 4",
    "clinics, 1", "extract, 2"
  })
  void anInterruptedAndResumedRunMakesExactlyTheDrawsOfAnUninterruptedOne(String name, int threads)
      throws IOException {
    int chains = 4;
    GibbsSampler sampler = model(name);
    RunSettings settings = settings(chains, threads);
    Rows whole = new Rows(chains);
    RunOutcome reference =
        ChainRunner.of(settings, ProgressListener.none(), StopSignal.create()).run(sampler, whole);
    assertFalse(reference.stoppedEarly());

    Rows pieces = new Rows(chains);
    List<ChainState> saved = List.of();
    RunOutcome last = null;
    long[] stops = {30, 60, 0};
    for (long stopAfter : stops) {
      StopSignal stop = StopSignal.create();
      last =
          ChainRunner.of(settings, ProgressListener.none(), stop)
              .resume(stoppingAfter(sampler, stopAfter, stop), pieces, saved);
      saved = last.chainStates();
      assertEquals(chains, saved.size(), "every chain's state is captured");
      if (stopAfter == 30) {
        assertTrue(last.stoppedEarly());
        assertEquals(30, saved.get(0).sweep(), "chain 1 stopped during burn-in");
        assertEquals(0, saved.get(0).draws());
      }
      if (stopAfter == 60) {
        assertEquals(90, saved.get(0).sweep(), "chain 1 stopped after burn-in");
        assertEquals((90 - BURN_IN) / 2, saved.get(0).draws());
      }
    }
    assertFalse(last.stoppedEarly());
    for (int chain = 0; chain < chains; chain++) {
      assertEquals(settings.draws(), whole.perChain.get(chain).size());
      assertEquals(whole.perChain.get(chain), pieces.perChain.get(chain), "chain " + (chain + 1));
      assertEquals(
          ((ResumableKernel) reference.kernels().get(chain)).save(),
          last.chainStates().get(chain).kernel(),
          "chain " + (chain + 1) + ": updaters end in the same state (counts and tuning)");
    }
    if (name.equals("switching")) {
      assertTrue(
          reference.kernels().stream()
              .anyMatch(k -> ((GibbsKernel) k).updaters().get(0).switchNote() != null),
          "the bimodal conditional switched to ARMS in some chain");
    }
  }

  @ParameterizedTest(name = "{0}")
  @CsvSource({"seedlings", "sensors"})
  void aStateThatDoesNotFitTheSamplerIsRefused(String name) throws IOException {
    GibbsSampler sampler = model(name);
    RunSettings settings = settings(2, 1);
    StopSignal stop = StopSignal.create();
    List<ChainState> saved =
        ChainRunner.of(settings, ProgressListener.none(), stop)
            .resume(stoppingAfter(sampler, 5, stop), (c, d, v) -> {}, List.of())
            .chainStates();
    ChainState first = saved.get(0);
    KernelState shorter =
        new KernelState(
            Arrays.copyOf(first.kernel().values(), first.kernel().values().length - 1),
            first.kernel().updaters());
    List<ChainState> bad =
        List.of(new ChainState(first.sweep(), first.draws(), first.generator(), shorter), saved.get(1));
    assertThrows(
        IllegalArgumentException.class,
        () -> ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
            .resume(sampler, (c, d, v) -> {}, bad));
    assertThrows(
        IllegalArgumentException.class,
        () -> ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
            .resume(sampler, (c, d, v) -> {}, List.of(first)));
  }
}

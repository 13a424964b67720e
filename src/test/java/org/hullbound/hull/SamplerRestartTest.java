package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * {@link AdaptiveRejectionSampler#restart(double...)}: one sampler serving a changing density (as a
 * Gibbs driver's full conditional changes every sweep) draws exactly what a new sampler per density
 * draws, bit for bit, so the exactness of the new sampler (the goodness-of-fit suite) carries
 * over; and it refuses what the factories refuse.
 */
class SamplerRestartTest {

  /** A density whose target the test switches, as the Gibbs state switches a conditional. */
  private static final class Switchable implements DifferentiableLogDensity {
    private Target target;

    @Override
    public Evaluation evaluate(double x) {
      return target.density().evaluate(x);
    }

    LogDensity valueOnly() {
      return x -> target.density().evaluate(x).value();
    }
  }

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  private static AdaptiveRejectionSampler make(
      Switchable density, boolean derivativeFree, HullOptions options) {
    return derivativeFree
        ? AdaptiveRejectionSampler.derivativeFree(density.valueOnly(), Support.real(), options)
        : AdaptiveRejectionSampler.withDerivatives(density, Support.real(), options);
  }

  /**
   * Real-line targets of other places, scales and shapes, each started from points that do not
   * bracket its mode on one side (so that the outward search runs too) or that do.
   */
  private static final List<Target> TARGETS =
      List.of(
          Target.normal(0, 1),
          Target.normal(40, 0.01),
          Target.logistic(-3, 2),
          Target.gumbel(1, 0.5),
          Target.normal(-1e3, 50));

  private static final double[][] STARTS = {
    {-1, 1}, {39.5, 39.9}, {-3, -2, 5}, {1.2, 0.2}, {0, 1, -1e3}
  };

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void restartedSamplerDrawsWhatANewSamplerDraws(boolean derivativeFree) {
    // 1 draw per density is the Gibbs use; 400 make the hull settle (the alias-table fast path
    // takes over after 32 quiet proposals), which a restart must drop with the old points
    for (int perDensity : new int[] {1, 400}) {
      HullOptions options = HullOptions.defaults().withMaximumHullSize(32);
      Switchable reused = new Switchable();
      Switchable fresh = new Switchable();
      RandomGenerator reusedRng = rng(97);
      RandomGenerator freshRng = rng(97);
      AdaptiveRejectionSampler sampler = null;
      long evaluationsOfNewSamplers = 0;
      for (int round = 0; round < 3; round++) {
        for (int t = 0; t < TARGETS.size(); t++) {
          reused.target = TARGETS.get(t);
          fresh.target = TARGETS.get(t);
          double[] start = STARTS[t];
          if (sampler == null) {
            sampler = make(reused, derivativeFree, options.withStartingAbscissae(start));
          } else {
            sampler.restart(start);
          }
          AdaptiveRejectionSampler expected =
              make(fresh, derivativeFree, options.withStartingAbscissae(start));
          for (int i = 0; i < perDensity; i++) {
            double want = expected.sample(freshRng);
            double got = sampler.sample(reusedRng);
            assertEquals(
                Double.doubleToRawLongBits(want), Double.doubleToRawLongBits(got),
                TARGETS.get(t) + ", round " + round + ", draw " + i + ": " + got + " instead of "
                    + want);
          }
          evaluationsOfNewSamplers += expected.statistics().evaluations();
          assertEquals(expected.statistics().hullSize(), sampler.statistics().hullSize());
        }
      }
      assertEquals(evaluationsOfNewSamplers, sampler.statistics().evaluations(),
          "the counters keep counting across restarts");
    }
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void restartRefusesWhatTheFactoriesRefuse(boolean derivativeFree) {
    Switchable density = new Switchable();
    density.target = Target.normal(0, 1);
    AdaptiveRejectionSampler sampler = make(density, derivativeFree, HullOptions.defaults());
    assertThrows(IllegalArgumentException.class, () -> sampler.restart());
    assertThrows(IllegalArgumentException.class, () -> sampler.restart((double[]) null));
    IllegalArgumentException outside =
        assertThrows(IllegalArgumentException.class, () -> sampler.restart(-1, Double.NaN));
    assertTrue(outside.getMessage().contains("NaN"), outside.getMessage());
    assertThrows(
        IllegalArgumentException.class, () -> sampler.restart(Double.POSITIVE_INFINITY, 1));
    // a density that turned bimodal is caught by the start, as by a new sampler
    density.target = AdaptiveRejectionSamplerTest.twoModes();
    assertThrows(NotLogConcaveException.class, () -> sampler.restart(-1, 0, 1));
  }

  /**
   * A restart that throws leaves no usable hull: the old one (and the settled table, built here by
   * 20000 draws first) belongs to the old density, so every draw, the abscissae and the snapshot
   * are refused, naming the failed restart, until a restart succeeds; then the draws are those of
   * a new sampler bit for bit.
   */
  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void aFailedRestartRefusesToDrawUntilARestartSucceeds(boolean derivativeFree) {
    Switchable density = new Switchable();
    density.target = Target.normal(0, 1);
    AdaptiveSampler sampler = (AdaptiveSampler) make(density, derivativeFree, HullOptions.defaults());
    RandomGenerator rng = rng(5);
    for (int i = 0; i < 20_000; i++) {
      sampler.sample(rng);
    }
    assertTrue(sampler.settledOrNull() != null, "the settled table was built before the restart");
    List<Runnable> failures =
        List.of(
            () -> {
              density.target = AdaptiveRejectionSamplerTest.twoModes();
              sampler.restart(-1, 0, 1);
            },
            () -> {
              density.target =
                  new Target("NaN", x -> new Evaluation(Double.NaN, 0), Support.real(), x -> x);
              sampler.restart(-1, 1);
            },
            () -> {
              density.target = Target.normal(0, 1);
              sampler.restart(Double.NaN);
            });
    for (Runnable failure : failures) {
      assertThrows(RuntimeException.class, failure::run);
      for (Runnable use :
          List.<Runnable>of(
              () -> sampler.sample(rng), sampler::snapshot, sampler::abscissae,
              () -> sampler.sample(rng, new double[3]))) {
        IllegalStateException refused = assertThrows(IllegalStateException.class, use::run);
        assertTrue(refused.getMessage().startsWith("the last restart failed"), refused.getMessage());
      }
    }
    density.target = Target.normal(40, 0.01);
    sampler.restart(39.9, 40.1);
    Switchable fresh = new Switchable();
    fresh.target = Target.normal(40, 0.01);
    AdaptiveRejectionSampler expected =
        make(fresh, derivativeFree, HullOptions.defaults().withStartingAbscissae(39.9, 40.1));
    RandomGenerator expectedRng = rng(6);
    RandomGenerator restartedRng = rng(6);
    for (int i = 0; i < 100; i++) {
      assertEquals(
          Double.doubleToRawLongBits(expected.sample(expectedRng)),
          Double.doubleToRawLongBits(sampler.sample(restartedRng)));
    }
  }
}

package org.hullbound.sampling;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.DoubleUnaryOperator;
import java.util.random.RandomGenerator;
import java.util.stream.Stream;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.LogisticDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.RealDistribution;
import org.apache.commons.math3.random.Well19937c;
import org.hullbound.hull.AdaptiveRejectionSampler;
import org.hullbound.hull.DifferentiableLogDensity;
import org.hullbound.hull.Evaluation;
import org.hullbound.hull.HullOptions;
import org.hullbound.hull.NotLogConcaveException;
import org.hullbound.hull.Support;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The envelope of a few tangents (adaptive rejection, Gilks and Wild 1992) against commons-math3
 * distributions, drawn as the Gibbs driver draws: fresh starting tangents for every draw, the
 * general sampler taking over from the envelope's abscissae where it hands over. Each draw is
 * independent of the others, so one KS test per target at {@link GoodnessOfFit#LEVEL} (1e-5) with
 * 16,000 draws: it rejects with probability 0.99 a CDF off by 3.64 / sqrt(16,000) = 0.029
 * anywhere (the power stated in {@link GoodnessOfFit}). Seven such tests: family-wise 7e-5.
 */
class TangentEnvelopeDrawTest {
  private static final int DRAWS = 16_000;

  /** A log-concave target: h and h', its support, the starting points and the reference. */
  record Target(String name, DoubleUnaryOperator h, DoubleUnaryOperator slope, double lower,
      double upper, double[] start, RealDistribution reference) {
    @Override
    public String toString() {
      return name;
    }

    DifferentiableLogDensity density(int[] evaluations) {
      return x -> {
        evaluations[0]++;
        return new Evaluation(h.applyAsDouble(x), slope.applyAsDouble(x));
      };
    }
  }

  static Stream<Target> targets() {
    // Log-densities up to a constant and their derivatives, from the standard formulas (any
    // handbook); the logistic's: h = -x - 2 log(1 + e^-x), h' = 1 - 2 expit(x).
    return Stream.of(
        new Target("normal(2, 3), starts one sd either side", x -> -0.5 * square((x - 2) / 3),
            x -> -(x - 2) / 9, Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY,
            new double[] {-1, 5}, new NormalDistribution(new Well19937c(1), 2, 3)),
        new Target("normal(2, 3), starts near the mode and either side",
            x -> -0.5 * square((x - 2) / 3), x -> -(x - 2) / 9, Double.NEGATIVE_INFINITY,
            Double.POSITIVE_INFINITY, new double[] {-1, 2.1, 5},
            new NormalDistribution(new Well19937c(2), 2, 3)),
        new Target("normal(2, 3), both starts left of the mode (the hull searches)",
            x -> -0.5 * square((x - 2) / 3), x -> -(x - 2) / 9, Double.NEGATIVE_INFINITY,
            Double.POSITIVE_INFINITY, new double[] {-7, -4},
            new NormalDistribution(new Well19937c(3), 2, 3)),
        new Target("logistic(0, 1)", x -> -x - 2 * Math.log1p(Math.exp(-x)),
            x -> 1 - 2 / (1 + Math.exp(-x)), Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY,
            new double[] {-1.5, 1.5}, new LogisticDistribution(new Well19937c(4), 0, 1)),
        new Target("gamma(2.5, rate 1) on (0, inf)", x -> 1.5 * Math.log(x) - x,
            x -> 1.5 / x - 1, 0, Double.POSITIVE_INFINITY, new double[] {0.5, 3},
            new GammaDistribution(new Well19937c(5), 2.5, 1)),
        new Target("beta(30, 4) on (0, 1)", x -> 29 * Math.log(x) + 3 * Math.log1p(-x),
            x -> 29 / x - 3 / (1 - x), 0, 1, new double[] {0.8, 0.95},
            new BetaDistribution(new Well19937c(6), 30, 4)),
        new Target("normal(0, 1e-6)", x -> -0.5 * square(x / 1e-6), x -> -x / 1e-12,
            Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, new double[] {-1e-6, 1.2e-6},
            new NormalDistribution(new Well19937c(7), 0, 1e-6)));
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("targets")
  void drawsFollowTheTarget(Target target) {
    RandomGenerator rng = seeded(target.name().hashCode());
    TangentEnvelopeDraw envelope = TangentEnvelopeDraw.create();
    int[] evaluations = new int[1];
    DifferentiableLogDensity density = target.density(evaluations);
    double[] sample = new double[DRAWS];
    for (int i = 0; i < DRAWS; i++) {
      sample[i] = drawLikeTheGibbsDriver(envelope, density, target, rng);
    }
    double p = GoodnessOfFit.ksPValue(sample, target.reference());
    assertTrue(p > GoodnessOfFit.LEVEL, target + ": KS p-value " + p + " (distance "
        + GoodnessOfFit.ksStatistic(sample, target.reference()::cumulativeProbability)
        + ", critical about " + GoodnessOfFit.criticalDistance(DRAWS) + ")");
  }

  /**
   * The normal with tangents one sd either side of the mode: the envelope is the two tangents
   * meeting at the mode, of mass 2 e^(1/2) sd against sqrt(2 pi) sd (worked out by hand), so a
   * proposal is accepted with probability 0.760, and the squeeze (the flat chord at h(+-1 sd)) takes
   * 2 e^(-1/2) / (2 e^(1/2)) = e^-1 = 0.368 of proposals without an evaluation. A draw therefore
   * costs 2 evaluations for the start plus about 0.8 (the three rounds that reach a third or fourth
   * evaluation, bounded here by 0.6 and 1.0), and the envelope alone decides nearly every draw.
   */
  @Test
  void aNormalFromTangentsOneSdEitherSideCostsAboutTwoPointEightEvaluations() {
    Target normal = targets().findFirst().orElseThrow();
    RandomGenerator rng = seeded(11);
    TangentEnvelopeDraw envelope = TangentEnvelopeDraw.create();
    int[] evaluations = new int[1];
    DifferentiableLogDensity density = normal.density(evaluations);
    int handedOver = 0;
    for (int i = 0; i < DRAWS; i++) {
      start(envelope, density, normal);
      if (Double.isNaN(envelope.draw(density, normal.lower(), normal.upper(), rng))) {
        handedOver++;
      }
    }
    double perDraw = (double) evaluations[0] / DRAWS;
    assertTrue(perDraw > 2.6 && perDraw < 3.0, "evaluations per draw " + perDraw);
    assertTrue(handedOver < DRAWS / 1000, handedOver + " hand-overs");
  }

  /**
   * h = -x^2 / 2 + 3 exp(-50 x^2), not log-concave: a tall spike at 0 that the tangents at +-1
   * (where it is below 1e-21) do not see. An evaluated proposal near 0 lies above the envelope: it
   * must never be accepted by the envelope, but handed over, and the general sampler then refuses
   * the density.
   */
  @Test
  void aProposalAboveTheEnvelopeIsHandedOverAndTheHullRefusesTheDensity() {
    double[] lastEvaluated = {Double.NaN};
    DifferentiableLogDensity spiked = x -> {
      lastEvaluated[0] = x;
      return new Evaluation(
          -0.5 * x * x + 3 * Math.exp(-50 * x * x), -x - 300 * x * Math.exp(-50 * x * x));
    };
    RandomGenerator rng = seeded(11);
    TangentEnvelopeDraw envelope = TangentEnvelopeDraw.create();
    int refused = 0;
    int pending = 0;
    for (int i = 0; i < 2000; i++) {
      envelope.clear();
      for (double x : new double[] {-1, 1}) {
        Evaluation e = spiked.evaluate(x);
        envelope.add(x, e.value(), e.slope());
      }
      double drawn = envelope.draw(spiked, Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY,
          rng);
      if (!Double.isNaN(drawn)) {
        // accepted by the squeeze (no evaluation: no test can see the spike there, as in any
        // adaptive rejection) or by the rejection test, below the envelope, which refinements
        // only lower from the first: 0.5 - |x|
        if (drawn == lastEvaluated[0]) {
          double h = spiked.evaluate(drawn).value();
          assertTrue(h <= 0.5 - Math.abs(drawn),
              "accepted " + drawn + " where h = " + h + " lies above the envelope");
        }
        continue;
      }
      // handed over either at the proposal above the envelope (pending) or, after a rejection
      // near the spike, when the next envelope finds the slopes rising: the hull refuses both
      assertThrows(NotLogConcaveException.class, () -> AdaptiveRejectionSampler.withDerivatives(
          spiked, Support.real(), HullOptions.defaults()
              .withStartingAbscissae(envelope.abscissae())));
      refused++;
      pending += Double.isFinite(envelope.pendingPoint()) ? 1 : 0;
    }
    // a proposal lands within 0.3 of 0 with probability about 0.3 / 3.3 (the envelope's mass
    // near its top), so 2000 draws meet one many times over
    assertTrue(refused > 50, refused + " refusals");
    assertTrue(pending > 0, "no hand-over at a proposal above the envelope");
  }

  @Test
  void tangentsThatAreNotConcaveAreHandedOverBeforeAnyProposal() {
    TangentEnvelopeDraw envelope = TangentEnvelopeDraw.create();
    // slopes that rise from left to right: no concave function has these tangents
    envelope.add(-1, 0, -0.5);
    envelope.add(1, 0, 0.5);
    int[] calls = new int[1];
    double drawn = envelope.draw(x -> {
      calls[0]++;
      return new Evaluation(0, 0);
    }, Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, seeded(11));
    assertTrue(Double.isNaN(drawn));
    assertEquals(0, calls[0], "no evaluation before a valid envelope");
    assertTrue(Double.isNaN(envelope.pendingPoint()));
    assertArrayEquals(new double[] {-1, 1}, envelope.abscissae());
  }

  @Test
  void abscissaeStayAscendingWithoutRepeatsUpToTheCapacity() {
    TangentEnvelopeDraw envelope = TangentEnvelopeDraw.create();
    assertTrue(envelope.add(3, 0, -1));
    assertTrue(envelope.add(1, 0, 1));
    assertTrue(envelope.add(2, 0, 0));
    assertTrue(envelope.add(2, 5, 5));
    assertArrayEquals(new double[] {1, 2, 3}, envelope.abscissae());
    for (int i = 3; i < TangentEnvelopeDraw.CAPACITY; i++) {
      assertTrue(envelope.add(10 + i, 0, -1));
    }
    assertFalse(envelope.add(100, 0, -1));
    envelope.clear();
    assertEquals(0, envelope.abscissae().length);
  }

  @Test
  void theSameSeedGivesTheSameDraws() {
    Target normal = targets().findFirst().orElseThrow();
    double[][] runs = new double[2][50];
    for (double[] run : runs) {
      RandomGenerator rng = seeded(11);
      TangentEnvelopeDraw envelope = TangentEnvelopeDraw.create();
      DifferentiableLogDensity density = normal.density(new int[1]);
      for (int i = 0; i < run.length; i++) {
        run[i] = drawLikeTheGibbsDriver(envelope, density, normal, rng);
      }
    }
    assertArrayEquals(runs[0], runs[1]);
  }

  /**
   * As {@code gibbs.AdaptiveRejectionUpdater} draws: the envelope from the evaluated starting
   * points, and where it hands over, the general sampler from its abscissae, accepting the
   * pending proposal once the hull has checked it.
   */
  private static double drawLikeTheGibbsDriver(TangentEnvelopeDraw envelope,
      DifferentiableLogDensity density, Target target, RandomGenerator rng) {
    start(envelope, density, target);
    double drawn = envelope.draw(density, target.lower(), target.upper(), rng);
    if (!Double.isNaN(drawn)) {
      return drawn;
    }
    AdaptiveRejectionSampler general = AdaptiveRejectionSampler.withDerivatives(density,
        new Support(target.lower(), target.upper()),
        HullOptions.defaults().withStartingAbscissae(envelope.abscissae()));
    return envelope.pendingAccepted() ? envelope.pendingPoint() : general.sample(rng);
  }

  private static void start(TangentEnvelopeDraw envelope, DifferentiableLogDensity density,
      Target target) {
    envelope.clear();
    for (double x : target.start()) {
      Evaluation e = density.evaluate(x);
      envelope.add(x, e.value(), e.slope());
    }
  }

  private static double square(double x) {
    return x * x;
  }

  private static RandomGenerator seeded(long seed) {
    return java.util.random.RandomGeneratorFactory.<RandomGenerator>of("L64X128MixRandom")
        .create(seed);
  }
}

package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.ExponentialDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.UniformRealDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Per-class specification of the sampler: reproducibility, statistics, cap and warm start, scale
 * and flatness edges, and the typed refusals of bad or non-log-concave input.
 *
 * <p>Statistical checks here are single KS tests (commons-math3 {@code KolmogorovSmirnovTest}) of
 * {@value #N} draws at level {@value #ALPHA}: each fails an exact sampler with probability 1e-5,
 * so that the 12 of them (6 checks, both forms) add at most 1.2e-4 to the false-alarm rate of the
 * whole build (DEVELOPERS.md, Tests), and detects a CDF error of 0.04 with probability above 0.98
 * (critical distance sqrt(-ln(1e-5 / 2) / 2) / sqrt(n) = 2.47 / sqrt(n) = 0.028, empirical-CDF sd at
 * most 0.5 / sqrt(n) = 0.0056; asymptotic Kolmogorov quantile, common practice).
 */
class AdaptiveRejectionSamplerTest {

  static final int N = 8000;
  static final double ALPHA = 1e-5;

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  private static double[] draws(AdaptiveRejectionSampler sampler, long seed, int n) {
    double[] x = new double[n];
    sampler.sample(rng(seed), x);
    return x;
  }

  private static void assertFits(CdfReference reference, double[] draws, String what) {
    double p = reference.ksPValue(draws);
    assertTrue(p >= ALPHA, what + ": KS p-value " + p + " below " + ALPHA);
  }

  private static CdfReference normalCdf(double mean, double sd) {
    NormalDistribution d = new NormalDistribution(null, mean, sd);
    return CdfReference.of(d::cumulativeProbability);
  }

  // ---- reproducibility and statistics

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void sameSeedGivesTheSameSequence(boolean derivativeFree) {
    Target gamma = Target.gamma(2.5, 1);
    double[] first = draws(gamma.sampler(derivativeFree, HullOptions.defaults()), 7, 500);
    double[] second = draws(gamma.sampler(derivativeFree, HullOptions.defaults()), 7, 500);
    double[] other = draws(gamma.sampler(derivativeFree, HullOptions.defaults()), 8, 500);
    assertArrayEquals(first, second);
    assertFalse(Arrays.equals(first, other));
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void statisticsAddUp(boolean derivativeFree) {
    AdaptiveRejectionSampler sampler =
        Target.normal(0, 1).sampler(derivativeFree, HullOptions.defaults());
    int start = sampler.statistics().evaluations() > 0 ? (int) sampler.statistics().evaluations() : -1;
    assertEquals(derivativeFree ? 3 : 2, start, "evaluations of the automatic start");
    assertTrue(Double.isNaN(sampler.statistics().evaluationsPerDraw()), "no draw yet");
    assertTrue(Double.isNaN(sampler.statistics().acceptanceRate()), "no proposal yet");
    draws(sampler, 3, 10_000);
    SamplerStatistics s = sampler.statistics();
    assertEquals(10_000, s.draws());
    assertEquals((double) s.evaluations() / 10_000, s.evaluationsPerDraw());
    assertEquals(10_000.0 / s.proposals(), s.acceptanceRate());
    assertEquals(s.proposals(), s.squeezeAcceptances() + s.densityAcceptances() + s.rejections());
    // every density acceptance cost one evaluation; a rejection costs one unless the envelope
    // above the hull rejected it first (on segments drawn from uniformly)
    assertTrue(s.evaluations() >= start + s.densityAcceptances(), s.toString());
    assertTrue(s.evaluations() <= start + s.densityAcceptances() + s.rejections(), s.toString());
    assertEquals(s.hullSize(), sampler.abscissae().length);
  }

  /**
   * N(+-1000, 1) from abscissae at 0 and +-1 (the mode on one side): the search doubles its step
   * outward from the starting range 1, reaching +-2^n after n steps. The tangent at 2^10 = 1024
   * falls (Gilks and Wild 1992, section 2.2); the chord from 512 to 1024 still rises, as it spans
   * the mode, so the secant form (Gilks 1992) needs one step more, to 2048. The cap on steps per
   * side is exact: that many are enough, one fewer stops the search at the last point reached
   * with a typed error naming that point and the side.
   */
  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void theOutwardSearchTakesAtMostTheStepsAllowedPerSide(boolean derivativeFree) {
    int needed = derivativeFree ? 11 : 10;
    for (double side : new double[] {1, -1}) {
      double mode = 1000 * side;
      HullOptions enough =
          HullOptions.defaults().withStartingAbscissae(0, side).withMaximumSearchSteps(needed);
      assertTrue(Math.abs(farNormal(mode, derivativeFree, enough).sample(rng(1)) - mode) < 10);
      NonIntegrableHullException e = assertThrows(NonIntegrableHullException.class,
          () -> farNormal(mode, derivativeFree, enough.withMaximumSearchSteps(needed - 1)));
      assertEquals(Math.scalb(side, needed - 1), e.x(), e.getMessage());
      assertTrue(e.getMessage().contains((side > 0 ? "upper" : "lower") + " side")
          && e.getMessage().contains("after " + (needed - 1) + " doubling steps"), e.getMessage());
    }
  }

  /**
   * The outward search's steps (the class comments: doubling steps outward, the first one the range
   * of the starting abscissae, {@code AdaptiveSampler.initialStep}): from 1 and 3 toward a mode at
   * 20, points 5, 9, 17, 33, where the slope (or the last chord) falls at last; the same mirrored.
   * The secant form first completes its start with the middle point 2.
   */
  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void theOutwardSearchDoublesItsStepFromTheRangeOfTheStart(boolean derivativeFree) {
    for (double side : new double[] {1, -1}) {
      AdaptiveRejectionSampler sampler =
          farNormal(
              20 * side,
              derivativeFree,
              HullOptions.defaults().withStartingAbscissae(side, 3 * side));
      double[] expected =
          derivativeFree ? new double[] {1, 2, 3, 5, 9, 17, 33} : new double[] {1, 3, 5, 9, 17, 33};
      for (int i = 0; i < expected.length; i++) {
        expected[i] *= side;
      }
      Arrays.sort(expected);
      assertArrayEquals(expected, sampler.abscissae(), "side " + side);
    }
  }

  private static AdaptiveRejectionSampler farNormal(
      double mode, boolean derivativeFree, HullOptions options) {
    return derivativeFree
        ? AdaptiveRejectionSampler.derivativeFree(
            x -> -0.5 * (x - mode) * (x - mode), Support.real(), options)
        : AdaptiveRejectionSampler.withDerivatives(
            x -> new Evaluation(-0.5 * (x - mode) * (x - mode), mode - x), Support.real(), options);
  }

  /**
   * Gilks (1992): the secant hull's outermost chords must fall away. A first chord that is flat
   * (h(-1) = h(0) for h = -(x + 1/2)^2 from the automatic start -1, 0, 1) does not fall, so the
   * search steps on instead of leaving a hull of infinite mass.
   */
  @Test
  void aFlatOuterChordIsNotAFallingOne() {
    AdaptiveRejectionSampler sampler = AdaptiveRejectionSampler.derivativeFree(
        x -> -(x + 0.5) * (x + 0.5), Support.real(), HullOptions.defaults());
    assertTrue(sampler.abscissae()[0] < -1, Arrays.toString(sampler.abscissae()));
    assertTrue(Double.isFinite(sampler.sample(rng(2))));
  }

  @Test
  void theFactoriesWithoutOptionsUseTheDefaultsAndSayWhichHullTheyBuild() {
    DifferentiableLogDensity normal = x -> new Evaluation(-0.5 * x * x, -x);
    AdaptiveRejectionSampler tangents = AdaptiveRejectionSampler.withDerivatives(
        normal, Support.real());
    AdaptiveRejectionSampler secants = AdaptiveRejectionSampler.derivativeFree(
        x -> -0.5 * x * x, Support.above(-5));
    assertArrayEquals(draws(AdaptiveRejectionSampler.withDerivatives(
        normal, Support.real(), HullOptions.defaults()), 4, 200), draws(tangents, 4, 200));
    assertArrayEquals(draws(AdaptiveRejectionSampler.derivativeFree(
        x -> -0.5 * x * x, Support.above(-5), HullOptions.defaults()), 4, 200),
        draws(secants, 4, 200));
    assertEquals("AdaptiveRejectionSampler[tangent hull, " + tangents.abscissae().length
        + " abscissae, support (-inf, +inf)]", tangents.toString());
    assertEquals("AdaptiveRejectionSampler[secant hull, " + secants.abscissae().length
        + " abscissae, support [-5.0, +inf)]", secants.toString());
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void evaluationsPerDrawFallBelowOnePercentAfterAHundredThousandDraws(boolean derivativeFree) {
    AdaptiveRejectionSampler sampler =
        Target.normal(0, 1).sampler(derivativeFree, HullOptions.defaults());
    draws(sampler, 11, 100_000);
    double perDraw = sampler.statistics().evaluationsPerDraw();
    assertTrue(perDraw < 0.01, "evaluations per draw " + perDraw);
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void pastTheCapNoPointIsAddedAndSamplingStaysExact(boolean derivativeFree) {
    AdaptiveRejectionSampler sampler =
        Target.normal(0, 1)
            .sampler(derivativeFree, HullOptions.defaults().withMaximumHullSize(4));
    double[] x = draws(sampler, 21, N);
    assertEquals(4, sampler.statistics().hullSize());
    assertTrue(sampler.statistics().rejections() > 10, "a 4-point hull still rejects");
    assertFits(normalCdf(0, 1), x, "normal with a 4-point hull");
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void warmStartFromPreviousAbscissaeAdaptsAtOnce(boolean derivativeFree) {
    Target gumbel = Target.gumbel(1, 2);
    AdaptiveRejectionSampler first = gumbel.sampler(derivativeFree, HullOptions.defaults());
    draws(first, 31, 2000);
    double[] abscissae = first.abscissae();
    AdaptiveRejectionSampler warm =
        gumbel.sampler(derivativeFree, HullOptions.defaults().withStartingAbscissae(abscissae));
    assertArrayEquals(abscissae, warm.abscissae());
    double[] x = draws(warm, 32, N);
    SamplerStatistics s = warm.statistics();
    assertTrue(s.evaluations() - abscissae.length < 0.01 * N, "evaluations after warm start " + s);
    assertFits(gumbel.reference(), x, "gumbel after warm start");
  }

  @Test
  void snapshotAndStartingAbscissaeAreCopies() {
    AdaptiveRejectionSampler sampler =
        Target.normal(0, 1).sampler(false, HullOptions.defaults().withStartingAbscissae(-1, 1));
    double[] a = sampler.abscissae();
    a[0] = 42;
    assertEquals(-1.0, sampler.abscissae()[0]);
    HullSnapshot snapshot = sampler.snapshot();
    draws(sampler, 1, 1000);
    assertEquals(2, snapshot.abscissae().length);
  }

  // ---- scales and flatness

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void tinyScaleNormalIsSampledFromTheDefaultStart(boolean derivativeFree) {
    // sd 1e-8 around 3, started from the default guess 0 and spread 1
    Target tiny = Target.normal(3, 1e-8);
    double[] x = draws(tiny.sampler(derivativeFree, HullOptions.defaults()), 41, N);
    assertFits(normalCdf(3, 1e-8), x, "normal(3, 1e-8)");
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void hugeScaleNormalIsSampledFromTheDefaultStart(boolean derivativeFree) {
    Target huge = Target.normal(0, 1e8);
    double[] x = draws(huge.sampler(derivativeFree, HullOptions.defaults()), 42, N);
    assertFits(normalCdf(0, 1e8), x, "normal(0, 1e8)");
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void nearFlatSegmentsOnAnIntervalGiveTheTiltedUniform(boolean derivativeFree) {
    // h = -1e-14 x on [0, 1]: slopes of 1e-14, indistinguishable from the uniform at this n
    Target nearFlat =
        new Target(
            "near-flat", x -> new Evaluation(-1e-14 * x, -1e-14), Support.between(0, 1), x -> x);
    double[] x = draws(nearFlat.sampler(derivativeFree, HullOptions.defaults()), 43, N);
    UniformRealDistribution uniform = new UniformRealDistribution(null, 0, 1);
    assertFits(CdfReference.of(uniform::cumulativeProbability), x, "near-flat on [0, 1]");
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void nearFlatTailOfAHalfLineGivesTheExponential(boolean derivativeFree) {
    // h = -1e-14 x on x > 0: exponential with mean 1e14
    ExponentialDistribution reference = new ExponentialDistribution(null, 1e14);
    Target slow =
        new Target(
            "rate 1e-14",
            x -> new Evaluation(-1e-14 * x, -1e-14),
            Support.above(0),
            reference::cumulativeProbability);
    double[] x = draws(slow.sampler(derivativeFree, HullOptions.defaults()), 44, N);
    assertFits(slow.reference(), x, "exponential, mean 1e14");
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void equalSlopesMakeTheHullExactSoNoEvaluatedPointIsRejected(boolean derivativeFree) {
    // h = -2 x: every tangent and chord is h itself (exponential, mean 0.5)
    ExponentialDistribution reference = new ExponentialDistribution(null, 0.5);
    Target linear =
        new Target(
            "rate 2",
            x -> new Evaluation(-2 * x, -2),
            Support.above(0),
            reference::cumulativeProbability);
    AdaptiveRejectionSampler sampler = linear.sampler(derivativeFree, HullOptions.defaults());
    long start = sampler.statistics().evaluations();
    double[] x = draws(sampler, 45, N);
    SamplerStatistics s = sampler.statistics();
    assertEquals(s.evaluations() - start, s.densityAcceptances(), s.toString());
    assertFits(linear.reference(), x, "exponential, mean 0.5");
    // the linear hull is h itself: its mass is 1/2 (the envelope adds the uniform segments' tops)
    HullSnapshot snapshot = sampler.snapshot();
    for (double at : new double[] {0.1, 0.7, 3.0, 20.0}) {
      assertEquals(-2 * at, snapshot.logLinearHull(at), 1e-12, "linear hull at " + at);
    }
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void constantDensityOnAnIntervalIsTheUniform(boolean derivativeFree) {
    UniformRealDistribution uniform = new UniformRealDistribution(null, -1, 3);
    Target flat =
        new Target(
            "flat", x -> new Evaluation(0, 0), Support.between(-1, 3), uniform::cumulativeProbability);
    AdaptiveRejectionSampler sampler = flat.sampler(derivativeFree, HullOptions.defaults());
    double[] x = draws(sampler, 46, N);
    assertEquals(0, sampler.statistics().rejections());
    assertFits(flat.reference(), x, "uniform on [-1, 3]");
  }

  // ---- bad input

  @Test
  void startingAbscissaeOutsideTheSupportAreRefused() {
    IllegalArgumentException e =
        assertThrows(
            IllegalArgumentException.class,
            () ->
                Target.gamma(2, 1)
                    .sampler(false, HullOptions.defaults().withStartingAbscissae(-1, 2)));
    assertTrue(e.getMessage().contains("-1.0"), e.getMessage());
  }

  @Test
  void nullArgumentsAreRefused() {
    assertThrows(
        IllegalArgumentException.class,
        () -> AdaptiveRejectionSampler.withDerivatives(null, Support.real()));
    assertThrows(
        IllegalArgumentException.class,
        () -> AdaptiveRejectionSampler.derivativeFree(x -> -x * x, null));
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void nanFromTheDensityIsATypedErrorNamingX(boolean derivativeFree) {
    Target nan =
        new Target("nan", x -> new Evaluation(Double.NaN, 0), Support.real(), x -> x);
    InvalidDensityException e =
        assertThrows(
            InvalidDensityException.class,
            () -> nan.sampler(derivativeFree, HullOptions.defaults()));
    assertTrue(e.getMessage().contains("NaN") && e.getMessage().contains("x = -1.0"), e.getMessage());
    assertEquals(-1.0, e.x());
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void nanMetWhileSamplingIsATypedError(boolean derivativeFree) {
    // a normal whose code breaks for x > 1: proposals there are beyond the squeeze, so evaluated
    Target broken =
        new Target(
            "broken",
            x -> new Evaluation(x > 1 ? Double.NaN : -0.5 * x * x, -x),
            Support.real(),
            x -> x);
    AdaptiveRejectionSampler sampler =
        broken.sampler(derivativeFree, HullOptions.defaults().withStartingAbscissae(-1, 0, 1));
    RandomGenerator rng = rng(51);
    InvalidDensityException e =
        assertThrows(
            InvalidDensityException.class,
            () -> {
              for (int i = 0; i < 100_000; i++) {
                sampler.sample(rng);
              }
            });
    assertTrue(e.x() > 1, "x = " + e.x());
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void plusInfinityFromTheDensityIsATypedError(boolean derivativeFree) {
    Target inf =
        new Target(
            "inf", x -> new Evaluation(Double.POSITIVE_INFINITY, 0), Support.real(), x -> x);
    InvalidDensityException e =
        assertThrows(
            InvalidDensityException.class,
            () -> inf.sampler(derivativeFree, HullOptions.defaults()));
    assertEquals(Double.POSITIVE_INFINITY, e.value());
  }

  @Test
  void nonFiniteSlopeIsATypedError() {
    InvalidDensityException e =
        assertThrows(
            InvalidDensityException.class,
            () ->
                AdaptiveRejectionSampler.withDerivatives(
                    x -> new Evaluation(-x * x, Double.NaN), Support.real()));
    assertTrue(e.getMessage().contains("h'(x)"), e.getMessage());
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void minusInfinityAtAStartingPointPointsAtTheSupport(boolean derivativeFree) {
    // a gamma density given the whole line: h(-1) = -inf
    Target wrongSupport =
        new Target(
            "gamma on the line",
            x ->
                x > 0
                    ? new Evaluation(Math.log(x) - x, 1 / x - 1)
                    : new Evaluation(Double.NEGATIVE_INFINITY, 0),
            Support.real(),
            x -> x);
    InvalidDensityException e =
        assertThrows(
            InvalidDensityException.class,
            () -> wrongSupport.sampler(derivativeFree, HullOptions.defaults()));
    assertTrue(e.getMessage().contains("support"), e.getMessage());
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void risingLineOnTheWholeLineIsNotIntegrable(boolean derivativeFree) {
    Target rising = new Target("h = x", x -> new Evaluation(x, 1), Support.real(), x -> x);
    NonIntegrableHullException e =
        assertThrows(
            NonIntegrableHullException.class,
            () -> rising.sampler(derivativeFree, HullOptions.defaults()));
    assertTrue(e.getMessage().contains("upper side"), e.getMessage());
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void constantOnAHalfLineIsNotIntegrable(boolean derivativeFree) {
    Target flat = new Target("h = 0", x -> new Evaluation(0, 0), Support.above(0), x -> x);
    NonIntegrableHullException e =
        assertThrows(
            NonIntegrableHullException.class,
            () -> flat.sampler(derivativeFree, HullOptions.defaults().withMaximumSearchSteps(10)));
    assertTrue(e.getMessage().contains("10 doubling steps"), e.getMessage());
  }

  // ---- not log-concave

  /** 0.5 N(-2, 1) + 0.5 N(2, 1): two modes 4 sd apart, log-convex between them. */
  static Target twoModes() {
    return new Target(
        "two modes",
        x -> {
          double a = -0.5 * (x + 2) * (x + 2);
          double b = -0.5 * (x - 2) * (x - 2);
          double top = Math.max(a, b);
          double wa = Math.exp(a - top);
          double wb = Math.exp(b - top);
          return new Evaluation(
              top + Math.log(wa + wb), (wa * -(x + 2) + wb * -(x - 2)) / (wa + wb));
        },
        Support.real(),
        x -> x);
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void twoModesAreDetectedAtTheStart(boolean derivativeFree) {
    NotLogConcaveException e =
        assertThrows(
            NotLogConcaveException.class,
            () -> twoModes().sampler(derivativeFree, HullOptions.defaults()));
    assertTrue(e.getMessage().contains("not log-concave"), e.getMessage());
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void twoModesAreDetectedWhileSamplingFromOneOfThem(boolean derivativeFree) {
    // started inside the left mode: the hull's right tail (rate about 1) reaches the right mode
    // with probability about 0.3 per proposal there, so 10^5 draws meet the violation for certain
    AdaptiveRejectionSampler sampler =
        twoModes()
            .sampler(derivativeFree, HullOptions.defaults().withStartingAbscissae(-3, -2, -1));
    RandomGenerator rng = rng(61);
    assertThrows(
        NotLogConcaveException.class,
        () -> {
          for (int i = 0; i < 100_000; i++) {
            sampler.sample(rng);
          }
        });
  }

  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void studentTWithTwoDegreesOfFreedomIsDetected(boolean derivativeFree) {
    // h = -1.5 log(1 + x^2 / 2) is log-convex for |x| > sqrt 2; the hull's tails reach there
    Target t2 =
        new Target(
            "t(2)",
            x -> new Evaluation(-1.5 * Math.log1p(0.5 * x * x), -1.5 * x / (1 + 0.5 * x * x)),
            Support.between(-1000, 1000),
            x -> x);
    AdaptiveRejectionSampler sampler = t2.sampler(derivativeFree, HullOptions.defaults());
    RandomGenerator rng = rng(62);
    NotLogConcaveException e =
        assertThrows(
            NotLogConcaveException.class,
            () -> {
              for (int i = 0; i < 100_000; i++) {
                sampler.sample(rng);
              }
            });
    assertTrue(Math.abs(e.x()) > Math.sqrt(2) - 1, "found at x = " + e.x());
  }
}

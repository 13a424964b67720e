package org.hullbound.sampling;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.DoubleUnaryOperator;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** Fixed-envelope rejection (von Neumann 1951) on a standard normal truncated to x > 5. */
class FixedEnvelopeRejectionTest {
  private static final double TAIL = 5.0;
  private static final NormalDistribution STANDARD = new NormalDistribution(0, 1);
  /** Q(5) = P(Z > 5) from commons-math3 (computed through erfc, so accurate in the tail). */
  private static final double Q5 = STANDARD.cumulativeProbability(-TAIL);
  /** log of the normalised target phi(x) / Q(5) on x > 5. */
  private static final DoubleUnaryOperator TRUNCATED_NORMAL =
      x -> -0.5 * x * x - 0.5 * Math.log(2 * Math.PI) - Math.log(Q5);

  /** A proposal from its draw and its log-density (support: the whole line, as the default). */
  private static Proposal proposal(
      java.util.function.ToDoubleFunction<RandomGenerator> draw, DoubleUnaryOperator logDensity) {
    return new Proposal() {
      @Override
      public double draw(RandomGenerator rng) {
        return draw.applyAsDouble(rng);
      }

      @Override
      public double logDensity(double x) {
        return logDensity.applyAsDouble(x);
      }
    };
  }

  /** The uniform proposal on (0, 1), by its density 1 there. */
  private static final Proposal UNIFORM = proposal(rng -> rng.nextDouble(), x -> 0);

  /** The standard Cauchy proposal, drawn by inversion of its CDF. */
  private static final Proposal CAUCHY = proposal(
      rng -> Math.tan(Math.PI * (rng.nextDouble() - 0.5)),
      x -> -Math.log(Math.PI) - Math.log1p(x * x));

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  private static FixedEnvelopeRejection tailSampler() {
    return FixedEnvelopeRejection.withComputedBound(
        TRUNCATED_NORMAL, TAIL, Double.POSITIVE_INFINITY, Proposal.exponentialTail(TAIL, 1.0));
  }

  @Test
  void computedBoundIsTheInverseMillsRatioAtFive() {
    // Source: f/g = phi(x) e^(x-5) / Q(5) is decreasing on x > 5 (its log has slope 1 - x), so
    // M = phi(5) / Q(5), the inverse Mills ratio at 5; phi and Q from commons-math3.
    double expected = STANDARD.density(TAIL) / Q5;
    FixedEnvelopeRejection sampler = tailSampler();
    assertEquals(expected, sampler.bound(), 1e-6 * expected);
    // "about 5.19, acceptance about 19%": common practice (value recalled from memory: 5.1865).
    assertEquals(5.1865, sampler.bound(), 1e-4);
    assertEquals(1 / expected, sampler.expectedAcceptance(), 1e-6 / expected);
  }

  @Test
  void drawsFollowTheTruncatedNormalAndAcceptAtOneOverM() {
    // Seed 20240501, n = 32000 draws. KS at level 1e-5 against the truncated normal CDF
    // (Q(5) - Q(x)) / Q(5) built from commons-math3; power >= 0.99 against a CDF error of
    // 3.64 / sqrt(n) = 0.020 (see GoodnessOfFit).
    FixedEnvelopeRejection sampler = tailSampler();
    RandomGenerator rng = rng(20240501L);
    int n = 32_000;
    double[] draws = new double[n];
    for (int i = 0; i < n; i++) {
      draws[i] = sampler.sample(rng);
      assertTrue(draws[i] >= TAIL, "draw below the truncation point: " + draws[i]);
    }
    double p = GoodnessOfFit.ksPValue(
        draws, x -> (Q5 - STANDARD.cumulativeProbability(-x)) / Q5);
    assertTrue(p > GoodnessOfFit.LEVEL, "KS p-value " + p);

    // Acceptance: n accepted out of P proposals; n/P has standard error sqrt(p(1-p)/P) to first
    // order (negative-binomial stopping, same asymptotic variance as a binomial count). Four
    // standard errors: false-alarm rate 6e-5; power 0.99 against a rate off by 6.3 SE = 0.0078.
    RejectionStatistics statistics = sampler.statistics();
    assertEquals(n, statistics.draws());
    assertEquals(statistics.proposals(), statistics.evaluations());
    double expected = sampler.expectedAcceptance();
    double standardError = Math.sqrt(expected * (1 - expected) / statistics.proposals());
    assertEquals(expected, statistics.acceptanceRate(), 4 * standardError);
  }

  @Test
  void givenBoundGivesTheSameSequenceAsTheComputedOne() {
    double logBound = Math.log(STANDARD.density(TAIL) / Q5);
    FixedEnvelopeRejection given = FixedEnvelopeRejection.of(
        TRUNCATED_NORMAL, TAIL, Double.POSITIVE_INFINITY, Proposal.exponentialTail(TAIL, 1.0),
        logBound);
    FixedEnvelopeRejection computed = tailSampler();
    RandomGenerator a = rng(7);
    RandomGenerator b = rng(7);
    for (int i = 0; i < 1000; i++) {
      assertEquals(given.sample(a), computed.sample(b));
    }
  }

  @Test
  void sameSeedSameSequence() {
    FixedEnvelopeRejection sampler = tailSampler();
    double[] first = new double[100];
    double[] second = new double[100];
    RandomGenerator a = rng(99);
    RandomGenerator b = rng(99);
    for (int i = 0; i < 100; i++) {
      first[i] = sampler.sample(a);
    }
    for (int i = 0; i < 100; i++) {
      second[i] = sampler.sample(b);
    }
    assertArrayEquals(first, second);
  }

  @Test
  void farTailBoundDoesNotOverflow() {
    // Unnormalised log f = -x^2/2 on x > 40, proposal 40 + Exp(40): log f - log g =
    // -x^2/2 - log 40 + 40 (x - 40) has slope 40 - x < 0, so the supremum is at x = 40:
    // -800 - log 40 (direct calculation). phi(40) itself underflows a double.
    double a = 40;
    FixedEnvelopeRejection sampler = FixedEnvelopeRejection.withComputedBound(
        x -> -0.5 * x * x, a, Double.POSITIVE_INFINITY, Proposal.exponentialTail(a, a));
    assertEquals(-0.5 * a * a - Math.log(a), sampler.logBound(), 1e-12 * a * a);
    double x = sampler.sample(rng(3));
    assertTrue(x >= a && Double.isFinite(x));
  }

  @Test
  void interiorMaximumIsFoundByTheOptimiser() {
    // Target N(0,1) on the real line, proposal Cauchy(0,1) (inversion of the Cauchy CDF).
    // Source (direct calculation): log(phi/cauchy) = -x^2/2 + log(1+x^2) + log(pi) - log(2 pi)/2
    // is largest at x = +-1, where M = sqrt(2 pi / e) = 1.5203 (a textbook value, recalled).
    DoubleUnaryOperator normal = x -> -0.5 * x * x - 0.5 * Math.log(2 * Math.PI);
    FixedEnvelopeRejection sampler = FixedEnvelopeRejection.withComputedBound(
        normal, Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, CAUCHY);
    assertEquals(Math.sqrt(2 * Math.PI / Math.E), sampler.bound(), 1e-9);
    // Seed 11, n = 16000, KS at level 1e-5 against commons-math3's N(0,1); power >= 0.99
    // against a CDF error of 3.64 / sqrt(n) = 0.029.
    RandomGenerator rng = rng(11);
    double[] draws = new double[16_000];
    for (int i = 0; i < draws.length; i++) {
      draws[i] = sampler.sample(rng);
    }
    assertTrue(GoodnessOfFit.ksPValue(draws, STANDARD) > GoodnessOfFit.LEVEL);
  }

  /**
   * The log ratio h = max(3 exp(-((y - 0.7) / 0.02)^2), 1 - (y - 0.3)^2), with y the distance
   * from the finite end (or from 0 on the whole line): a broad bump of height 1 and a peak of
   * height 3 only 0.02 wide, between the dyadic points (0.5, 0.75, ...) that sit near the ends and
   * far out. The supremum is 3 by construction; a search that saw only the broad bump would
   * return about 1. The grid of 512 points on the support's bounded transform is what finds the
   * peak (EnvelopeBound's contract: a scan whose spacing is finer than the peak).
   */
  static double narrowPeakRatio(double y) {
    return Math.max(3 * Math.exp(-Math.pow((y - 0.7) / 0.02, 2)), 1 - (y - 0.3) * (y - 0.3));
  }

  @Test
  void aNarrowPeakOfTheRatioIsFoundOnEveryShapeOfSupport() {
    // (0, 1), uniform proposal.
    assertEquals(3, FixedEnvelopeRejection.withComputedBound(
        x -> narrowPeakRatio(x), 0, 1, UNIFORM).logBound(), 1e-9);
    // (0, inf), proposal Exp(1).
    Proposal exponential = Proposal.exponentialTail(0, 1);
    assertEquals(3, FixedEnvelopeRejection.withComputedBound(
        x -> narrowPeakRatio(x) - x, 0, Double.POSITIVE_INFINITY, exponential).logBound(), 1e-9);
    // (-inf, 0), proposal -Exp(1).
    Proposal reflected = proposal(rng -> Math.log1p(-rng.nextDouble()), x -> x);
    assertEquals(3, FixedEnvelopeRejection.withComputedBound(
        x -> narrowPeakRatio(-x) + x, Double.NEGATIVE_INFINITY, 0, reflected).logBound(), 1e-9);
    // The whole line, proposal Cauchy(0, 1); the ratio falls like -y^2 on both sides.
    assertEquals(3, FixedEnvelopeRejection.withComputedBound(
        x -> narrowPeakRatio(x) + CAUCHY.logDensity(x), Double.NEGATIVE_INFINITY,
        Double.POSITIVE_INFINITY, CAUCHY).logBound(), 1e-9);
  }

  @Test
  void unboundedRatioIsAClearError() {
    // A Cauchy target under a normal proposal: f/g grows like exp(x^2/2) / x^2.
    Proposal normal =
        proposal(rng -> rng.nextGaussian(), x -> -0.5 * x * x - 0.5 * Math.log(2 * Math.PI));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> FixedEnvelopeRejection.withComputedBound(
            x -> -Math.log1p(x * x), Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, normal));
    assertTrue(e.getMessage().contains("unbounded"), e.getMessage());
    // A proposal that is zero where the target is positive: f/g = +infinity.
    IllegalArgumentException uncovered = assertThrows(IllegalArgumentException.class,
        () -> FixedEnvelopeRejection.withComputedBound(
            TRUNCATED_NORMAL, 0, Double.POSITIVE_INFINITY, Proposal.exponentialTail(TAIL, 1)));
    assertTrue(uncovered.getMessage().contains("unbounded"), uncovered.getMessage());
  }

  @Test
  void aSingularityAtAFiniteEndIsAnUnboundedRatio() {
    // beta(0.5, 1) under a uniform proposal on (0, 1): f/g = x^(-1/2) / 2 is unbounded at 0.
    Proposal uniform =
        proposal(rng -> rng.nextDouble(), x -> x >= 0 && x <= 1 ? 0 : Double.NEGATIVE_INFINITY);
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> FixedEnvelopeRejection.withComputedBound(
            x -> -0.5 * Math.log(x) - Math.log(2), 0, 1, uniform));
    assertTrue(e.getMessage().contains("unbounded"), e.getMessage());
  }

  @Test
  void aRatioThatGrowsTowardAFiniteEndIsAnErrorAtEitherEnd() {
    // log(f/g) = -log(distance to the end) / 2 inside (0, 1), but 0 at the end itself: the scan's
    // largest value is at the point nearest the end and the end is lower, so the ratio grows
    // toward the end and no finite M was found (EnvelopeBound's rule for finite ends).
    String lower = assertThrows(IllegalArgumentException.class,
        () -> FixedEnvelopeRejection.withComputedBound(
            x -> x == 0 ? 0 : -0.5 * Math.log(x), 0, 1, UNIFORM)).getMessage();
    assertTrue(lower.contains("grows toward the end 0.0"), lower);
    String upper = assertThrows(IllegalArgumentException.class,
        () -> FixedEnvelopeRejection.withComputedBound(
            x -> x == 1 ? 0 : -0.5 * Math.log1p(-x), 0, 1, UNIFORM)).getMessage();
    assertTrue(upper.contains("grows toward the end 1.0"), upper);
  }

  @Test
  void aBoundThatIsTooSmallIsDetected() {
    FixedEnvelopeRejection sampler = FixedEnvelopeRejection.of(
        TRUNCATED_NORMAL, TAIL, Double.POSITIVE_INFINITY, Proposal.exponentialTail(TAIL, 1),
        Math.log(2.0));
    EnvelopeViolationException e = assertThrows(EnvelopeViolationException.class, () -> {
      RandomGenerator rng = rng(5);
      for (int i = 0; i < 1000; i++) {
        sampler.sample(rng);
      }
    });
    // The exception carries the offending point, its log ratio log f - log g and the bound.
    double logRatio = TRUNCATED_NORMAL.applyAsDouble(e.point()) - (-(e.point() - TAIL));
    assertTrue(e.point() > TAIL, "point " + e.point());
    assertEquals(logRatio, e.logRatio(), 1e-12);
    assertEquals(Math.log(2.0), e.logBound());
    assertTrue(e.logRatio() > e.logBound());
  }

  /**
   * A target with no mass where the envelope proposes (zero beyond TAIL + 1e-9, which an
   * exponential proposal from TAIL reaches with probability 1e-9) gives up after the cap of
   * 100000 proposals, with a typed error, instead of spinning.
   */
  @Test
  void aTargetWithNoMassWhereTheEnvelopeProposesGivesUpAfterTheCap() {
    FixedEnvelopeRejection sampler = FixedEnvelopeRejection.of(
        x -> x < TAIL + 1e-9 ? 0.0 : Double.NEGATIVE_INFINITY, TAIL, Double.POSITIVE_INFINITY,
        Proposal.exponentialTail(TAIL, 1), 0.0);
    RejectionLimitException stuck =
        assertTimeoutPreemptively(java.time.Duration.ofMinutes(1),
            () -> assertThrows(RejectionLimitException.class, () -> sampler.sample(rng(3))));
    // log M = 0: the cap is max(100000, 100 e^0) = 100000, and that many proposals were made.
    assertEquals(100_000, stuck.proposals());
    assertEquals(100_000, sampler.statistics().proposals());
    // log M = log 4000: the cap is 100 M = 400000 (a correct envelope needs more than 100 M
    // proposals with probability below e^-100, as the class documents).
    FixedEnvelopeRejection wide = FixedEnvelopeRejection.of(
        x -> x < TAIL + 1e-9 ? 0.0 : Double.NEGATIVE_INFINITY, TAIL, Double.POSITIVE_INFINITY,
        Proposal.exponentialTail(TAIL, 1), Math.log(4000));
    RejectionLimitException wideStuck =
        assertThrows(RejectionLimitException.class, () -> wide.sample(rng(4)));
    assertEquals(400_000, wideStuck.proposals(), 1);
    assertTrue(stuck.getMessage().startsWith("fixed-envelope rejection: no proposal accepted"));
  }

  /**
   * log f is defined up to a constant: a bound 0.01 too small is found whatever constant log f
   * carries (the rounding of log f + 1e12 is 2 ulp(1e12) = 2.4e-4), and the right bound raises
   * nothing. The ratio is largest at x = 5 and falls at rate x - 1 >= 4, so each proposal lands
   * within 0.01 of it with probability 1 - exp(-0.0025), and 10^4 draws (about 1.3 10^4
   * proposals, acceptance 1 / M = 0.8) miss that band with probability below exp(-30).
   */
  @ParameterizedTest(name = "constant {0}")
  @ValueSource(doubles = {-1e12, -1e9, -1, 0, 1, 1e9, 1e12})
  void aBoundTooSmallByAHundredthIsDetectedWhateverTheConstant(double constant) {
    Proposal tail = Proposal.exponentialTail(TAIL, 1);
    DoubleUnaryOperator shifted = x -> TRUNCATED_NORMAL.applyAsDouble(x) + constant;
    FixedEnvelopeRejection right =
        FixedEnvelopeRejection.withComputedBound(shifted, TAIL, Double.POSITIVE_INFINITY, tail);
    RandomGenerator rng = rng(8);
    for (int i = 0; i < 10_000; i++) {
      right.sample(rng);
    }
    FixedEnvelopeRejection tooSmall =
        FixedEnvelopeRejection.of(
            shifted, TAIL, Double.POSITIVE_INFINITY, tail, right.logBound() - 0.01);
    assertThrows(EnvelopeViolationException.class, () -> {
      for (int i = 0; i < 10_000; i++) {
        tooSmall.sample(rng);
      }
    });
  }

  @Test
  void nanAndPlusInfinityFromTheDensityAreTypedErrors() {
    FixedEnvelopeRejection nan = FixedEnvelopeRejection.of(
        x -> Double.NaN, TAIL, Double.POSITIVE_INFINITY, Proposal.exponentialTail(TAIL, 1), 0);
    assertThrows(DensityEvaluationException.class, () -> nan.sample(rng(1)));
    FixedEnvelopeRejection infinite = FixedEnvelopeRejection.of(
        x -> Double.POSITIVE_INFINITY, TAIL, Double.POSITIVE_INFINITY,
        Proposal.exponentialTail(TAIL, 1), 0);
    DensityEvaluationException e =
        assertThrows(DensityEvaluationException.class, () -> infinite.sample(rng(1)));
    assertEquals(Double.POSITIVE_INFINITY, e.value());
    assertTrue(e.point() > TAIL, "point " + e.point());
    assertThrows(DensityEvaluationException.class,
        () -> FixedEnvelopeRejection.withComputedBound(
            x -> Double.NaN, TAIL, Double.POSITIVE_INFINITY, Proposal.exponentialTail(TAIL, 1)));
  }

  @Test
  void theComputedBoundChecksTheSupportFirst() {
    String message = assertThrows(IllegalArgumentException.class,
        () -> FixedEnvelopeRejection.withComputedBound(
            TRUNCATED_NORMAL, 7, TAIL, Proposal.exponentialTail(TAIL, 1))).getMessage();
    assertTrue(message.contains("lower must be < upper"), message);
  }

  @Test
  void invalidArgumentsNameTheArgument() {
    Proposal tail = Proposal.exponentialTail(TAIL, 1);
    double inf = Double.POSITIVE_INFINITY;
    assertMessage("lower", () -> FixedEnvelopeRejection.of(TRUNCATED_NORMAL, Double.NaN, inf,
        tail, 0));
    assertMessage("upper", () -> FixedEnvelopeRejection.of(TRUNCATED_NORMAL, 0, Double.NaN,
        tail, 0));
    assertMessage("lower must be < upper",
        () -> FixedEnvelopeRejection.of(TRUNCATED_NORMAL, 1, 1, tail, 0));
    assertMessage("logBound", () -> FixedEnvelopeRejection.of(TRUNCATED_NORMAL, TAIL, inf, tail,
        Double.NaN));
    assertMessage("logBound", () -> FixedEnvelopeRejection.of(TRUNCATED_NORMAL, TAIL, inf, tail,
        inf));
    assertMessage("rate", () -> Proposal.exponentialTail(TAIL, 0));
    assertMessage("rate", () -> Proposal.exponentialTail(TAIL, Double.NaN));
    assertMessage("shift", () -> Proposal.exponentialTail(Double.NaN, 1));
    assertThrows(NullPointerException.class,
        () -> FixedEnvelopeRejection.of(null, TAIL, inf, tail, 0));
    assertThrows(NullPointerException.class,
        () -> FixedEnvelopeRejection.of(TRUNCATED_NORMAL, TAIL, inf, null, 0));
  }

  @Test
  void exponentialTailProposalIsTheShiftedExponential() {
    // Source: Exp(rate) density rate e^(-rate t) (any handbook); shifted by 5.
    Proposal tail = Proposal.exponentialTail(5, 2);
    assertEquals(Math.log(2) - 2 * 1.5, tail.logDensity(6.5), 1e-15);
    assertEquals(Double.NEGATIVE_INFINITY, tail.logDensity(4.999));
    assertEquals(5, tail.lower());
    assertEquals(Double.POSITIVE_INFINITY, tail.upper());
    // Seed 4, n = 16000, KS at level 1e-5 against commons-math3's exponential (mean 1/2),
    // shifted by 5; power >= 0.99 against a CDF error of 3.64 / sqrt(n) = 0.029.
    RandomGenerator rng = rng(4);
    double[] excess = new double[16_000];
    for (int i = 0; i < excess.length; i++) {
      excess[i] = tail.draw(rng) - 5;
    }
    assertTrue(GoodnessOfFit.ksPValue(excess,
        new org.apache.commons.math3.distribution.ExponentialDistribution(0.5))
        > GoodnessOfFit.LEVEL);
  }

  private static void assertMessage(String expected, Runnable call) {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, call::run);
    assertTrue(e.getMessage().contains(expected), e.getMessage());
  }
}

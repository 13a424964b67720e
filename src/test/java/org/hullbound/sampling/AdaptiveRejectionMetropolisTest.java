package org.hullbound.sampling;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.function.DoubleSupplier;
import java.util.function.DoubleUnaryOperator;
import java.util.stream.Stream;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.ExponentialDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.random.Well19937c;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * ARMS (Gilks, Best and Tan 1995) on targets with exact draws: the exact one-transition KS test
 * and the reversibility sign test (levels and power in {@link MarkovChecks}: n = 32000 exact
 * starts, KS at level 1e-5, power 0.99 against a CDF error of 0.020).
 */
class AdaptiveRejectionMetropolisTest {
  private static final double INF = Double.POSITIVE_INFINITY;

  /** A target with its log-density, support, exact sampler, CDF and initial points. */
  record Target(String name, DoubleUnaryOperator logDensity, double lower, double upper,
      DoubleSupplier exact, DoubleUnaryOperator cdf, double[] initialPoints) {
    @Override
    public String toString() {
      return name;
    }
  }

  /**
   * 0.3 N(-3, 1) + 0.7 N(2, 0.5^2): bimodal, not log-concave. Exact draws: a uniform picks the
   * component, commons-math3 draws from it; the CDF is the weighted sum of commons-math3 CDFs.
   */
  static Target mixture(String name, double[] initialPoints, long seed) {
    NormalDistribution first = new NormalDistribution(new Well19937c(seed), -3, 1);
    NormalDistribution second = new NormalDistribution(new Well19937c(seed + 1), 2, 0.5);
    Well19937c pick = new Well19937c(seed + 2);
    DoubleUnaryOperator logDensity = x -> Math.log(0.3 * first.density(x)
        + 0.7 * second.density(x));
    return new Target(name, logDensity, -INF, INF,
        () -> pick.nextDouble() < 0.3 ? first.sample() : second.sample(),
        x -> 0.3 * first.cumulativeProbability(x) + 0.7 * second.cumulativeProbability(x),
        initialPoints);
  }

  /**
   * Student-t with 3 degrees of freedom truncated to (-2, 6): heavy-tailed, not log-concave
   * (log f = -2 log(1 + x^2/3) is convex beyond |x| = sqrt 3). Exact draws by inversion of
   * commons-math3's t CDF between F(-2) and F(6).
   */
  static Target truncatedStudent() {
    TDistribution t = new TDistribution(new Well19937c(41), 3);
    double low = t.cumulativeProbability(-2);
    double high = t.cumulativeProbability(6);
    Well19937c uniform = new Well19937c(42);
    return new Target("student-t(3) on (-2, 6)", x -> -2 * Math.log1p(x * x / 3), -2, 6,
        () -> t.inverseCumulativeProbability(low + uniform.nextDouble() * (high - low)),
        x -> (t.cumulativeProbability(x) - low) / (high - low),
        new double[] {-1.5, 0, 1.5, 4});
  }

  static Target normal() {
    NormalDistribution reference = new NormalDistribution(new Well19937c(51), 1, 2);
    return new Target("normal(1, 2), log-concave", x -> -0.125 * (x - 1) * (x - 1), -INF, INF,
        reference::sample, reference::cumulativeProbability, new double[] {-2, 1, 4});
  }

  /**
   * N(0, 1) beyond 5 (far tail, finite lower end). Exact draws by inversion through the lower
   * tail, x = -Phi^-1(U Q(5)), commons-math3; CDF (Q(5) - Q(x)) / Q(5) via its erfc-based CDF.
   */
  static Target normalTail() {
    NormalDistribution standard = new NormalDistribution(0, 1);
    double q5 = standard.cumulativeProbability(-5);
    Well19937c uniform = new Well19937c(91);
    return new Target("normal beyond 5", x -> -0.5 * x * x, 5, INF,
        () -> -standard.inverseCumulativeProbability(uniform.nextDouble() * q5),
        x -> (q5 - standard.cumulativeProbability(-x)) / q5, new double[] {5.05, 5.2, 5.6});
  }

  static Stream<Target> targets() {
    NormalDistribution narrow = new NormalDistribution(new Well19937c(92), 1e6, 1e-3);
    Well19937c uniform = new Well19937c(93);
    return Stream.of(
        normalTail(),
        new Target("uniform(0, 1), flat log-density", x -> 0.0, 0, 1, uniform::nextDouble,
            x -> x, new double[] {0.2, 0.5, 0.8}),
        new Target("normal(1e6, 1e-3), huge location, tiny scale",
            x -> -0.5 * Math.pow((x - 1e6) / 1e-3, 2), -INF, INF, narrow::sample,
            narrow::cumulativeProbability, new double[] {1e6 - 1e-3, 1e6, 1e6 + 2e-3}),
        mixture("mixture, points over both modes", new double[] {-4, -2, 0, 1.5, 2.5}, 31),
        mixture("mixture, points near one mode only", new double[] {1.5, 2, 2.5}, 35),
        truncatedStudent(),
        normal(),
        new Target("normal(0, 1), points all right of the mode", x -> -0.5 * x * x, -INF, INF,
            new NormalDistribution(new Well19937c(61), 0, 1)::sample,
            new NormalDistribution(0, 1)::cumulativeProbability, new double[] {1, 2, 3}));
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("targets")
  void oneTransitionFromExactDrawsKeepsTheTarget(Target target) {
    AdaptiveRejectionMetropolis arms = AdaptiveRejectionMetropolis.of(target.logDensity(),
        target.lower(), target.upper(), target.initialPoints(), 30);
    MarkovChecks.Pairs pairs = MarkovChecks.oneStepFromExactStarts(
        arms, target.exact(), 32_000, MarkovChecks.rng(target.name().hashCode()));
    double p = MarkovChecks.pValue(pairs, target.cdf());
    assertTrue(p > GoodnessOfFit.LEVEL, "KS p-value " + p + ", " + arms.statistics());
    assertTrue(pairs.moves() > 16_000, "moves " + pairs.moves());
    assertTrue(pairs.signTestPasses(), "up " + pairs.movesUp() + " of " + pairs.moves());
    ArmsStatistics statistics = arms.statistics();
    assertEquals(32_000, statistics.transitions());
    assertTrue(statistics.largestEnvelope() <= 30, statistics.toString());
    if (!target.name().startsWith("uniform")) {
      // A flat target is its own envelope: nothing is ever rejected.
      assertTrue(statistics.adaptiveRejections() > 0, statistics.toString());
    }
  }

  @Test
  void onALogConcaveTargetTheEnvelopeIsAHullAndNoMetropolisStepRejects() {
    // Gilks, Best and Tan (1995): for log-concave f the envelope lies above log f, so ARMS
    // reduces to adaptive rejection sampling and the Metropolis-Hastings step always accepts.
    Target target = normal();
    AdaptiveRejectionMetropolis arms = AdaptiveRejectionMetropolis.of(target.logDensity(),
        target.lower(), target.upper(), target.initialPoints(), 30);
    MarkovChecks.oneStepFromExactStarts(arms, target.exact(), 5000, MarkovChecks.rng(3));
    assertEquals(0, arms.statistics().metropolisRejections());
  }

  static Stream<Target> logConcaveTargets() {
    ExponentialDistribution exponential = new ExponentialDistribution(1);
    GammaDistribution gamma = new GammaDistribution(3, 1);
    BetaDistribution beta = new BetaDistribution(2, 5);
    NormalDistribution normal = new NormalDistribution(0, 1);
    // Exact draws are not needed: every transition is an independent exact draw (see below).
    return Stream.of(
        new Target("exponential(1) on (0, inf)", x -> -x, 0, INF, null,
            exponential::cumulativeProbability, new double[] {0.5, 1, 1.5}),
        new Target("reflected exponential(1) on (-inf, 0)", x -> x, -INF, 0, null,
            x -> 1 - exponential.cumulativeProbability(-x), new double[] {-1.5, -1, -0.5}),
        new Target("gamma(3, 1)", x -> 2 * Math.log(x) - x, 0, INF, null,
            gamma::cumulativeProbability, new double[] {1, 2, 4}),
        new Target("beta(2, 5)", x -> Math.log(x) + 4 * Math.log1p(-x), 0, 1, null,
            beta::cumulativeProbability, new double[] {0.1, 0.25, 0.5}),
        new Target("normal(0, 1), points off centre", x -> -0.5 * x * x, -INF, INF, null,
            normal::cumulativeProbability, new double[] {-1, 0.5, 2}));
  }

  /**
   * Gilks, Best and Tan (1995), section 3: for log-concave f the secant envelope lies above log f,
   * so the Metropolis-Hastings step accepts every candidate and each transition returns a fresh
   * exact draw of adaptive rejection sampling, whatever the current state. So 20000 transitions
   * from one fixed state are 20000 independent draws from f: KS against commons-math3 at level
   * 1e-5, power 0.99 against a CDF error of 3.64 / sqrt(20000) = 0.026 (GoodnessOfFit). Seed: the
   * target name's hash. The targets put the envelope's outer pieces on the left, the right and
   * both ends.
   */
  @ParameterizedTest(name = "{0}")
  @MethodSource("logConcaveTargets")
  void onLogConcaveTargetsEveryTransitionIsAnExactDraw(Target target) {
    AdaptiveRejectionMetropolis arms = AdaptiveRejectionMetropolis.of(target.logDensity(),
        target.lower(), target.upper(), target.initialPoints(), 20);
    assertTrue(Double.isNaN(arms.statistics().evaluationsPerTransition()));
    var rng = MarkovChecks.rng(target.name().hashCode());
    double current = target.initialPoints()[1];
    double[] draws = new double[20_000];
    for (int i = 0; i < draws.length; i++) {
      draws[i] = arms.next(current, rng);
      assertTrue(draws[i] > target.lower() && draws[i] < target.upper(), "draw " + draws[i]);
    }
    ArmsStatistics statistics = arms.statistics();
    assertEquals(0, statistics.metropolisRejections(), statistics.toString());
    assertEquals(20_000, statistics.transitions());
    assertEquals((double) statistics.evaluations() / 20_000, statistics.evaluationsPerTransition());
    double p = GoodnessOfFit.ksPValue(draws, target.cdf());
    assertTrue(p > GoodnessOfFit.LEVEL, "KS p-value " + p + ", " + statistics);
  }

  /**
   * A log-concave target, its normalising constant in closed form and initial points whose outer
   * secants already fall by 3 or more (so ARMS adds no search points).
   */
  record FixedEnvelopeCase(String name, DoubleUnaryOperator logDensity, double lower,
      double upper, double logNormaliser, double[] points) {
    @Override
    public String toString() {
      return name;
    }
  }

  static Stream<FixedEnvelopeCase> fixedEnvelopeCases() {
    // Normalising constants (any handbook): integral of exp(-x^2/2) = sqrt(2 pi); of x^2 e^-x on
    // (0, inf) = Gamma(3) = 2; of x (1 - x)^4 on (0, 1) = B(2, 5) = 1! 4! / 6! = 1/30.
    return Stream.of(
        new FixedEnvelopeCase("normal(0, 1)", x -> -0.5 * x * x, -INF, INF,
            0.5 * Math.log(2 * Math.PI), new double[] {-3, -1, 0.5, 2, 3.5}),
        new FixedEnvelopeCase("gamma(3, 1)", x -> 2 * Math.log(x) - x, 0, INF, Math.log(2),
            new double[] {0.5, 1.5, 3, 5, 9}),
        new FixedEnvelopeCase("beta(2, 5)", x -> Math.log(x) + 4 * Math.log1p(-x), 0, 1,
            -Math.log(30), new double[] {0.05, 0.15, 0.3, 0.5, 0.8}));
  }

  /**
   * log of the mass of the envelope of Gilks, Best and Tan (1995) through {@code (x_i, h_i)}:
   * on [x_i, x_{i+1}] the largest of L_{i,i+1} and the smaller of L_{i-1,i} and L_{i+1,i+2}
   * (undefined lines left out), beyond the outermost points L_{12} and L_{n-1,n} extended to the
   * ends. Written here from the paper's formula, evaluated pointwise between the lines' crossings
   * and integrated in closed form on each stretch where one line holds.
   */
  static double envelopeLogMass(double[] xs, double[] hs, double lower, double upper) {
    int n = xs.length;
    double[] slope = new double[n - 1];
    for (int j = 0; j + 1 < n; j++) {
      slope[j] = (hs[j + 1] - hs[j]) / (xs[j + 1] - xs[j]);
    }
    // outer pieces: exp(h + s (x - x_end)) integrated to the end, finite or infinite
    double mass = lineMass(hs[0], slope[0], xs[0] - lower)
        + lineMass(hs[n - 1], -slope[n - 2], upper - xs[n - 1]);
    for (int i = 0; i + 1 < n; i++) {
      int[] lines = {i, i - 1, i + 2 < n ? i + 1 : -1}; // own, left and right secants; -1 none
      List<Double> cuts = new ArrayList<>(List.of(xs[i], xs[i + 1]));
      for (int a : lines) {
        for (int b : lines) {
          if (a >= 0 && b > a && slope[a] != slope[b]) {
            double cross = (hs[b] - hs[a] + slope[a] * xs[a] - slope[b] * xs[b])
                / (slope[a] - slope[b]);
            if (cross > xs[i] && cross < xs[i + 1]) {
              cuts.add(cross);
            }
          }
        }
      }
      Collections.sort(cuts);
      for (int c = 0; c + 1 < cuts.size(); c++) {
        double a = cuts.get(c);
        double b = cuts.get(c + 1);
        double ea = paperEnvelope(xs, hs, slope, lines, a);
        double eb = paperEnvelope(xs, hs, slope, lines, b);
        // one line holds on [a, b]: the integral of its exp is (e^eb - e^ea) / slope
        double s = (eb - ea) / (b - a);
        mass += Math.abs(s) < 1e-12 ? Math.exp(ea) * (b - a) : (Math.exp(eb) - Math.exp(ea)) / s;
      }
    }
    return Math.log(mass);
  }

  /** max(L_own, min(L_left, L_right)) at x, a missing line (index -1) left out. */
  private static double paperEnvelope(
      double[] xs, double[] hs, double[] slope, int[] lines, double x) {
    double[] values = new double[3];
    for (int l = 0; l < 3; l++) {
      int j = lines[l];
      values[l] = j < 0 ? Double.NaN : hs[j] + slope[j] * (x - xs[j]);
    }
    double outer = Double.isNaN(values[1]) ? values[2]
        : Double.isNaN(values[2]) ? values[1] : Math.min(values[1], values[2]);
    return Double.isNaN(outer) ? values[0] : Math.max(values[0], outer);
  }

  /** Integral of exp(value - rate t) for t in (0, length), rate > 0 (length may be infinite). */
  private static double lineMass(double value, double rate, double length) {
    return Math.exp(value) * -Math.expm1(-rate * length) / rate;
  }

  /**
   * With maxPoints equal to the initial points, nothing is added and every call draws from one
   * fixed envelope: each try of the rejection step accepts with probability p = Z_f / Z_env
   * (f below the envelope, as the target is log-concave), so the rejections of N transitions are
   * a sum of N geometric counts with mean N (1 - p) / p and standard deviation sqrt(N (1 - p)) /
   * p. Z_f in closed form, Z_env integrated in the test from the paper's formula. N = 20000, seed
   * the case name's hash; within 5 standard deviations (normal approximation to the sum, level
   * 5.7e-7 a case). Power: p is 0.59 (normal) to 0.81 (gamma, beta), and a change of the
   * envelope's mass by 5% moves the mean by 11 to 16 standard deviations, so it fails with
   * probability near 1; this is what tells the envelope's shape apart, which the
   * Metropolis-Hastings step otherwise hides. Checked by breaking it once: the larger outer secant
   * instead of the smaller on inner intervals gave 76537 rejections against 13973 expected.
   */
  @ParameterizedTest(name = "{0}")
  @MethodSource("fixedEnvelopeCases")
  void aFixedEnvelopeAcceptsAtTheRatioOfTheMassesUnderItAndUnderTheTarget(
      FixedEnvelopeCase target) {
    double[] points = target.points();
    double[] hs = new double[points.length];
    for (int i = 0; i < points.length; i++) {
      hs[i] = target.logDensity().applyAsDouble(points[i]);
    }
    double p = Math.exp(target.logNormaliser()
        - envelopeLogMass(points, hs, target.lower(), target.upper()));
    assertTrue(p > 0.5 && p < 1, "acceptance " + p);
    AdaptiveRejectionMetropolis arms = AdaptiveRejectionMetropolis.of(target.logDensity(),
        target.lower(), target.upper(), points, points.length);
    var rng = MarkovChecks.rng(target.name().hashCode());
    int n = 20_000;
    double current = points[2];
    for (int i = 0; i < n; i++) {
      current = arms.next(current, rng);
    }
    ArmsStatistics statistics = arms.statistics();
    assertEquals(points.length, statistics.largestEnvelope(), "no point may be added");
    assertEquals(0, statistics.metropolisRejections(), statistics.toString());
    double mean = n * (1 - p) / p;
    double sd = Math.sqrt(n * (1 - p)) / p;
    assertEquals(mean, statistics.adaptiveRejections(), 5 * sd,
        "acceptance " + p + ", " + statistics);
  }

  @Test
  void rejectedCandidatesAreAddedUpToTheCapWhichCountsTheSearchPoints() {
    // Normal(1, 2) from -2, 1, 4: the bounded search adds one point toward each infinite end
    // (at -8 and 10, where log f is 3 or more below the top), so every call starts from 5
    // abscissae; with maxPoints 6 one rejected candidate fills the envelope and no call may go
    // beyond it (the class comment: points stop being added at maxPoints, search points counted).
    Target target = normal();
    AdaptiveRejectionMetropolis arms = AdaptiveRejectionMetropolis.of(target.logDensity(),
        target.lower(), target.upper(), target.initialPoints(), 6);
    MarkovChecks.oneStepFromExactStarts(arms, target.exact(), 2000, MarkovChecks.rng(7));
    assertTrue(arms.statistics().adaptiveRejections() > 0, arms.statistics().toString());
    assertEquals(6, arms.statistics().largestEnvelope(), arms.statistics().toString());
  }

  @Test
  void onTheMixtureTheMetropolisStepCorrects() {
    Target target = mixture("mixture", new double[] {1.5, 2, 2.5}, 71);
    AdaptiveRejectionMetropolis arms = AdaptiveRejectionMetropolis.of(target.logDensity(),
        target.lower(), target.upper(), target.initialPoints(), 10);
    MarkovChecks.oneStepFromExactStarts(arms, target.exact(), 5000, MarkovChecks.rng(4));
    assertTrue(arms.statistics().metropolisRejections() > 0, arms.statistics().toString());
  }

  @Test
  void longChainFromAFixedStartMatchesTheMixture() {
    // One chain from x = 10, seed 81: 200 transitions of burn-in, 8000 draws kept at thinning 5;
    // the kept draws' lag-one autocorrelation must be below 0.05 (see SliceSamplerTest for what
    // that does to the KS level). Power 0.99 against a CDF error of 3.64 / sqrt(8000) = 0.041.
    Target target = mixture("mixture", new double[] {-4, -2, 0, 1.5, 2.5}, 81);
    AdaptiveRejectionMetropolis arms = AdaptiveRejectionMetropolis.of(target.logDensity(),
        target.lower(), target.upper(), target.initialPoints(), 30);
    double[] draws = MarkovChecks.thinnedChain(arms, 10, 200, 5, 8000, MarkovChecks.rng(81));
    double rho = MarkovChecks.lagOneAutocorrelation(draws);
    assertTrue(Math.abs(rho) < 0.05, "lag-one autocorrelation " + rho);
    double p = GoodnessOfFit.ksPValue(draws, target.cdf());
    assertTrue(p > GoodnessOfFit.LEVEL, "KS p-value " + p);
  }

  @Test
  void sameSeedSameSequence() {
    Target target = truncatedStudent();
    AdaptiveRejectionMetropolis a = AdaptiveRejectionMetropolis.of(target.logDensity(),
        target.lower(), target.upper(), target.initialPoints(), 20);
    AdaptiveRejectionMetropolis b = AdaptiveRejectionMetropolis.of(target.logDensity(),
        target.lower(), target.upper(), target.initialPoints(), 20);
    assertArrayEquals(MarkovChecks.thinnedChain(a, 0, 0, 1, 500, MarkovChecks.rng(5)),
        MarkovChecks.thinnedChain(b, 0, 0, 1, 500, MarkovChecks.rng(5)));
    assertEquals(a.statistics(), b.statistics());
  }

  @Test
  void improperTargetsAndBadPointsAreClearErrors() {
    var rng = MarkovChecks.rng(6);
    double[] points = {-1, 0, 1};
    // log f rising toward +infinity: no finite envelope.
    AdaptiveRejectionMetropolis rising =
        AdaptiveRejectionMetropolis.of(x -> x, -INF, INF, points, 10);
    assertFailure("does not fall toward +Infinity", () -> rising.next(0, rng));
    AdaptiveRejectionMetropolis zeroAtPoint = AdaptiveRejectionMetropolis.of(
        x -> x < -0.5 ? Double.NEGATIVE_INFINITY : -x * x, -INF, INF, points, 10);
    assertFailure("initialPoints[0]", () -> zeroAtPoint.next(0, rng));
    AdaptiveRejectionMetropolis nan =
        AdaptiveRejectionMetropolis.of(x -> x > 0.5 ? Double.NaN : -x * x, -INF, INF, points, 10);
    assertThrows(DensityEvaluationException.class, () -> nan.next(0, rng));
    AdaptiveRejectionMetropolis normal =
        AdaptiveRejectionMetropolis.of(x -> -x * x, -5, 5, points, 10);
    SliceSamplerTest.assertMessage("current", () -> normal.next(7, rng));
  }

  /**
   * A target with mass only at three single points (log f = -inf between them): no candidate from
   * a continuous envelope lands on them (probability 0), so every try is rejected, and the call
   * ends at its cap with a typed failure that names the current value, the support and the
   * envelope's abscissae (issue 14: it was a raw IllegalStateException without values).
   */
  @Test
  void aTargetWithNoMassUnderTheEnvelopeEndsInATypedFailureWithItsValues() {
    var rng = MarkovChecks.rng(7);
    DoubleUnaryOperator spikes =
        x -> x == 0 ? 0 : Math.abs(x) == 1 ? -50 : Double.NEGATIVE_INFINITY;
    AdaptiveRejectionMetropolis arms =
        AdaptiveRejectionMetropolis.of(spikes, -4, 4, new double[] {-1, 0, 1}, 10);
    ArmsFailureException failure = assertThrows(ArmsFailureException.class, () -> arms.next(1, rng));
    assertTrue(failure.getMessage().startsWith("adaptive rejection Metropolis from current value 1.0"
        + " on support (-4.0, 4.0) accepted no candidate in 100000 tries"), failure.getMessage());
    assertTrue(failure.getMessage().contains("highest 0.0 at 0.0"), failure.getMessage());
    assertEquals(1.0, failure.current());
    assertEquals(10, failure.abscissae().length, "the cap of 10 abscissae was reached");
    assertEquals(100_000, arms.statistics().adaptiveRejections());
  }

  static void assertFailure(String expected, Runnable call) {
    ArmsFailureException e = assertThrows(ArmsFailureException.class, call::run);
    assertTrue(e.getMessage().contains(expected), e.getMessage());
    assertTrue(e.getMessage().contains("current value 0.0"), e.getMessage());
  }

  @Test
  void invalidArgumentsNameTheArgument() {
    DoubleUnaryOperator f = x -> -x * x;
    SliceSamplerTest.assertMessage("initialPoints must hold at least 3",
        () -> AdaptiveRejectionMetropolis.of(f, -INF, INF, new double[] {0, 1}, 10));
    SliceSamplerTest.assertMessage("strictly increasing",
        () -> AdaptiveRejectionMetropolis.of(f, -INF, INF, new double[] {0, 1, 1}, 10));
    SliceSamplerTest.assertMessage("initialPoints[2]",
        () -> AdaptiveRejectionMetropolis.of(f, 0, 2, new double[] {0.5, 1, 2}, 10));
    SliceSamplerTest.assertMessage("initialPoints[1]",
        () -> AdaptiveRejectionMetropolis.of(f, -INF, INF, new double[] {0, Double.NaN, 1}, 10));
    SliceSamplerTest.assertMessage("maxPoints",
        () -> AdaptiveRejectionMetropolis.of(f, -INF, INF, new double[] {0, 1, 2}, 2));
    SliceSamplerTest.assertMessage("initialPoints[0]",
        () -> AdaptiveRejectionMetropolis.of(f, 0, 2, new double[] {0, 1, 1.5}, 10));
    // The documented minimum: maxPoints may equal the number of initial points.
    AdaptiveRejectionMetropolis smallest =
        AdaptiveRejectionMetropolis.of(f, -INF, INF, new double[] {0, 1, 2}, 3);
    assertEquals(3, smallest.maxPoints());
    double[] points = smallest.initialPoints();
    assertArrayEquals(new double[] {0, 1, 2}, points);
    points[0] = -9; // a copy: the sampler's own points are unchanged
    assertArrayEquals(new double[] {0, 1, 2}, smallest.initialPoints());
    SliceSamplerTest.assertMessage("lower",
        () -> AdaptiveRejectionMetropolis.of(f, INF, INF, new double[] {0, 1, 2}, 5));
    assertThrows(NullPointerException.class,
        () -> AdaptiveRejectionMetropolis.of(f, -INF, INF, null, 5));
  }
}

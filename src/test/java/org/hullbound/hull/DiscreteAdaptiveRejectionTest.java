package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.LongToDoubleFunction;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.PascalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.junit.jupiter.api.Test;

/**
 * {@link DiscreteAdaptiveRejection} draws exactly from log-concave masses on the integers: chi-square
 * tests against the exact mass function (commons-math3 distributions as the reference library),
 * far tails and huge counts without overflow, and typed refusals.
 *
 * <p>Each chi-square test: seed fixed, 10^5 draws, cells of the reference with expected count at
 * least 5 (the tails pooled into the outermost cells), level 1e-5; five tests, so a correct sampler
 * fails one with probability at most 5e-5 (Bonferroni) when the random streams change. Power: a
 * sampler that moves 5% of the modal cell's mass to its neighbour (for Poisson(3.7), 1.1% of all
 * mass from 3 to 4) gives a noncentrality n sum (p' - p)^2 / p = 10^5 * 0.0112^2 * (1 / 0.224 + 1
 * / 0.207) = 117 against a critical value of about 45 (15 cells at 1e-5): the noncentral
 * chi-square has mean 132 and sd 22, so it is rejected with power about 0.9999 (normal
 * approximation, common practice); {@link #theTestRejectsASlightlyWrongSampler} checks it.
 */
class DiscreteAdaptiveRejectionTest {
  private static final double LEVEL = 1e-5;
  private static final int DRAWS = 100_000;

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  private static long[] draws(LogMass h, double lower, double upper, double guess, long seed) {
    DiscreteAdaptiveRejection sampler = DiscreteAdaptiveRejection.of(
        h, lower, upper, HullOptions.defaults().withAutomaticStart(guess, 2));
    RandomGenerator rng = rng(seed);
    long[] out = new long[DRAWS];
    for (int i = 0; i < out.length; i++) {
      out[i] = sampler.next(rng);
    }
    return out;
  }

  /**
   * The chi-square p-value of {@code draws} against the mass {@code probability} on {@code lower ..
   * upper} (the reference's support), cells merged from each end until each expects 5 draws.
   */
  static double chiSquarePValue(long[] draws, LongToDoubleFunction probability, long lower,
      long upper) {
    long mode = lower;
    for (long k = lower; k <= upper; k++) {
      if (probability.applyAsDouble(k) > probability.applyAsDouble(mode)) {
        mode = k;
      }
    }
    // cells: [lower .. first], first+1, ..., [last .. upper] with expected counts >= 5
    long first = mode;
    double below = 0;
    for (long k = lower; k < mode; k++) {
      below += probability.applyAsDouble(k);
    }
    while (first > lower && below * draws.length >= 5
        && (below - probability.applyAsDouble(first - 1)) * draws.length >= 5) {
      below -= probability.applyAsDouble(first - 1);
      first--;
    }
    long last = mode;
    double above = 1;
    for (long k = lower; k <= mode; k++) {
      above -= probability.applyAsDouble(k);
    }
    while (above * draws.length >= 10 && probability.applyAsDouble(last + 1) * draws.length >= 5
        && (above - probability.applyAsDouble(last + 1)) * draws.length >= 5) {
      above -= probability.applyAsDouble(last + 1);
      last++;
    }
    List<double[]> cells = new ArrayList<>();
    long lowest = first > lower ? first - 1 : first;
    for (long k = lowest; k <= last + 1; k++) {
      double p = k == lowest && first > lower ? below
          : k == last + 1 ? above : probability.applyAsDouble(k);
      cells.add(new double[] {p, 0});
    }
    for (long d : draws) {
      long cell = Math.max(lowest, Math.min(last + 1, d));
      cells.get((int) (cell - lowest))[1]++;
    }
    double statistic = 0;
    int used = 0;
    for (double[] cell : cells) {
      double expected = cell[0] * draws.length;
      if (expected <= 0) {
        assertEquals(0, cell[1], "draws where the mass is 0");
        continue;
      }
      statistic += (cell[1] - expected) * (cell[1] - expected) / expected;
      used++;
    }
    return 1 - new ChiSquaredDistribution(used - 1).cumulativeProbability(statistic);
  }

  @Test
  void poissonDrawsFollowTheMassFunction() {
    PoissonDistribution reference = new PoissonDistribution(3.7); // commons-math3 reference
    long[] d = draws(GeneratedLogConcaveMass.poisson(3.7), 0, Double.POSITIVE_INFINITY, 0, 11);
    assertTrue(chiSquarePValue(d, k -> reference.probability((int) k), 0, 60) > LEVEL);
  }

  @Test
  void binomialDrawsFollowTheMassFunction() {
    BinomialDistribution reference = new BinomialDistribution(40, 0.3); // commons-math3
    long[] d = draws(GeneratedLogConcaveMass.binomial(40, 0.3), 0, 40, 39, 12);
    assertTrue(chiSquarePValue(d, k -> reference.probability((int) k), 0, 40) > LEVEL);
  }

  /**
   * Negative binomial with size 3 and success probability 0.15 ({@code q = 0.85} of failures):
   * commons-math3's Pascal distribution of failures before the third success.
   */
  @Test
  void negativeBinomialDrawsFollowTheMassFunction() {
    PascalDistribution reference = new PascalDistribution(3, 0.15);
    long[] d = draws(GeneratedLogConcaveMass.negativeBinomial(3, 0.85), 0,
        Double.POSITIVE_INFINITY, 200, 13);
    assertTrue(chiSquarePValue(d, k -> reference.probability((int) k), 0, 400) > LEVEL);
  }

  /**
   * A latent count with a binomial observation of it (Poisson-binomial thinning): n ~
   * poisson(lambda = 12), y = 5 ~ binomial(n, p = 0.4), so n - y given y is poisson(lambda (1 - p))
   * = poisson(7.2) (Kingman, Poisson Processes, 1993, thinning; common practice). The log mass of
   * n is written from the two families, the reference from the closed form.
   */
  @Test
  void thinnedPoissonCountFollowsItsClosedForm() {
    LogMass h = n -> n < 5 ? Double.NEGATIVE_INFINITY
        : GeneratedLogConcaveMass.poisson(12).value(n)
            + GeneratedLogConcaveMass.binomial((int) n, 0.4).value(5) + n * Math.log(0.6);
    long[] d = draws(h, 5, Double.POSITIVE_INFINITY, 5, 14);
    PoissonDistribution reference = new PoissonDistribution(7.2);
    long[] shifted = new long[d.length];
    for (int i = 0; i < d.length; i++) {
      shifted[i] = d[i] - 5;
    }
    assertTrue(chiSquarePValue(shifted, k -> reference.probability((int) k), 0, 80) > LEVEL);
  }

  /**
   * Poisson(5) truncated to k &gt;= 300: h(300) is about -930, a mass no double holds, yet the
   * envelope, kept relative to its anchors, is sampled exactly; the reference is the same mass
   * normalised by log-sum-exp over 300 .. 600 (the terms beyond are below e^-1000 of the first).
   */
  @Test
  void farTailDrawsFollowTheTruncatedMass() {
    GeneratedLogConcaveMass poisson = GeneratedLogConcaveMass.poisson(5);
    long[] d = draws(poisson, 300, Double.POSITIVE_INFINITY, 0, 15);
    double top = poisson.value(300);
    double sum = 0;
    for (long k = 300; k <= 600; k++) {
      sum += Math.exp(poisson.value(k) - top);
    }
    double logNormaliser = top + Math.log(sum);
    assertTrue(top < -900, "the tail is far: " + top);
    for (int i = 0; i < d.length; i++) {
      d[i] -= 300;
    }
    assertTrue(chiSquarePValue(d, k -> Math.exp(poisson.value(k + 300) - logNormaliser), 0, 300)
        > LEVEL, "tail");
  }

  /**
   * The check above must reject a sampler that is slightly wrong: Poisson(3.7) draws in which one
   * in twenty draws at the mode 3 is moved to 4 (power worked out in the class comment).
   */
  @Test
  void theTestRejectsASlightlyWrongSampler() {
    PoissonDistribution reference = new PoissonDistribution(3.7);
    long[] d = draws(GeneratedLogConcaveMass.poisson(3.7), 0, Double.POSITIVE_INFINITY, 0, 11);
    int moved = 0;
    for (int i = 0; i < d.length; i++) {
      if (d[i] == 3 && moved++ % 20 == 0) {
        d[i] = 4;
      }
    }
    assertTrue(chiSquarePValue(d, k -> reference.probability((int) k), 0, 60) < LEVEL);
  }

  /**
   * Counts near 10^12: commons-math3's Poisson log mass (saddle-point form, Loader 2000) as h, and
   * the mean of 2000 draws within 5 standard errors of 10^12 (level 5.7e-7, normal approximation);
   * the envelope works on offsets from its anchors, so neither the counts nor h overflow.
   */
  @Test
  void hugeCountsNeitherOverflowNorLoseTheScale() {
    PoissonDistribution reference = new PoissonDistribution(1e12);
    // commons-math3 takes int counts: its log mass written here for long ones, the same formula
    LogMass h = k -> -0.5 * Math.log(2 * Math.PI * k) - stirlingError(k) - deviance(k, 1e12);
    DiscreteAdaptiveRejection sampler = DiscreteAdaptiveRejection.of(
        h, 0, Double.POSITIVE_INFINITY, HullOptions.defaults().withAutomaticStart(1e12, 1e6));
    RandomGenerator rng = rng(16);
    double sum = 0;
    int n = 2000;
    for (int i = 0; i < n; i++) {
      sum += sampler.next(rng);
    }
    double se = Math.sqrt(reference.getNumericalVariance() / n);
    assertEquals(1e12, sum / n, 5 * se);
  }

  /** Loader's (2000) Stirling error log(k!) - log(sqrt(2 pi k) (k/e)^k) for large k. */
  private static double stirlingError(double k) {
    double k2 = k * k;
    return (1.0 / 12 - (1.0 / 360 - 1.0 / 1260 / k2) / k2) / k;
  }

  /** Loader's deviance k log(k / m) + m - k, by a series where k is near m. */
  private static double deviance(double k, double m) {
    double v = (k - m) / (k + m);
    if (Math.abs(v) < 0.1) {
      double s = (k - m) * v;
      double ej = 2 * k * v;
      double v2 = v * v;
      for (int j = 1; j < 1000; j++) {
        ej *= v2;
        double s1 = s + ej / (2 * j + 1);
        if (s1 == s) {
          return s1;
        }
        s = s1;
      }
    }
    return k * Math.log(k / m) + m - k;
  }

  @Test
  void aOnePointRangeAlwaysGivesItsPoint() {
    DiscreteAdaptiveRejection sampler = DiscreteAdaptiveRejection.of(
        k -> 0, 7, 7, HullOptions.defaults());
    assertEquals(7, sampler.next(rng(1)));
    assertEquals(0, sampler.statistics().evaluations());
  }

  @Test
  void aMassThatIsNotLogConcaveIsRefused() {
    // two modes, at 0 and 40: the chords across the gap rise again
    LogMass twoModes = k -> Math.max(-0.5 * k * k, -0.5 * (k - 40) * (k - 40));
    assertThrows(NotLogConcaveException.class, () -> {
      DiscreteAdaptiveRejection sampler = DiscreteAdaptiveRejection.of(
          twoModes, -100, 100, HullOptions.defaults().withAutomaticStart(20, 25));
      RandomGenerator rng = rng(2);
      for (int i = 0; i < 10_000; i++) {
        sampler.next(rng);
      }
    });
  }

  @Test
  void aMassThatDoesNotFallAwayIsRefused() {
    assertThrows(NonIntegrableHullException.class,
        () -> DiscreteAdaptiveRejection.of(k -> 0.1 * k, 0, Double.POSITIVE_INFINITY,
            HullOptions.defaults()));
  }

  @Test
  void aStartWithoutMassIsNamed() {
    InvalidDensityException e = assertThrows(InvalidDensityException.class,
        () -> DiscreteAdaptiveRejection.of(k -> k < 50 ? Double.NEGATIVE_INFINITY : -k, 0, 100,
            HullOptions.defaults()));
    assertTrue(e.getMessage().contains("-Infinity at 0"), e.getMessage());
  }

  /**
   * Poisson(10^6) started at 0 with the smallest envelope allowed: the starting chords walk out by
   * doubling steps, the envelope is far above the mass near the mode, and with one proposal
   * allowed the draw gives up with the typed error rather than spinning.
   */
  @Test
  void aDrawGivesUpAtTheProposalCap() {
    DiscreteAdaptiveRejection sampler = DiscreteAdaptiveRejection.of(
        GeneratedLogConcaveMass.poisson(1e6), 0, Double.POSITIVE_INFINITY,
        HullOptions.defaults().withMaximumHullSize(3).withMaximumProposals(1));
    ProposalLimitException e = assertThrows(ProposalLimitException.class, () -> {
      RandomGenerator rng = rng(3);
      for (int i = 0; i < 100; i++) {
        sampler.next(rng);
      }
    });
    // the error lists the chords' anchors
    assertArrayEquals(Arrays.stream(sampler.anchors()).asDoubleStream().toArray(), e.abscissae());
  }

  /**
   * The counters account for every evaluation of h, every proposal and its outcome (squeeze,
   * density, rejection), and the envelope's chords; Poisson(4) on the whole half-line (a
   * bookkeeping identity, deterministic for the seed).
   */
  @Test
  void statisticsCountEveryEvaluationProposalAndOutcome() {
    long[] calls = {0};
    LogMass poisson = GeneratedLogConcaveMass.poisson(4);
    DiscreteAdaptiveRejection sampler = DiscreteAdaptiveRejection.of(
        k -> {
          calls[0]++;
          return poisson.value(k);
        },
        0, Double.POSITIVE_INFINITY, HullOptions.defaults());
    RandomGenerator rng = rng(4);
    for (int i = 0; i < 1000; i++) {
      sampler.next(rng);
    }
    SamplerStatistics s = sampler.statistics();
    assertEquals(calls[0], s.evaluations());
    assertEquals(1000, s.draws());
    assertEquals(s.proposals(), s.squeezeAcceptances() + s.densityAcceptances() + s.rejections());
    assertTrue(s.squeezeAcceptances() > 0 && s.densityAcceptances() > 0 && s.rejections() > 0, s.toString());
    assertEquals(sampler.anchors().length, s.hullSize());
    assertArrayEquals(sampler.hull().anchors(), sampler.anchors());
    DiscreteAdaptiveRejection onePoint = DiscreteAdaptiveRejection.of(k -> 0, 7, 7, HullOptions.defaults());
    onePoint.next(rng);
    onePoint.next(rng);
    assertEquals(2, onePoint.statistics().squeezeAcceptances());
    assertEquals(0, onePoint.anchors().length);
  }

  /** Range ends are whole numbers within 2^53 (the largest whole number a double holds), or infinite. */
  @Test
  void rangeEndsAreWholeNumbersWithinTwoToTheFiftyThird() {
    DiscreteAdaptiveRejection widest =
        DiscreteAdaptiveRejection.of(k -> -k, 0, 0x1p53, HullOptions.defaults());
    assertTrue(widest.next(rng(5)) >= 0);
    IllegalArgumentException upper = assertThrows(IllegalArgumentException.class,
        () -> DiscreteAdaptiveRejection.of(k -> -k, 0, 3.5, HullOptions.defaults()));
    assertTrue(upper.getMessage().startsWith("upper must be a whole number"), upper.getMessage());
    assertThrows(IllegalArgumentException.class,
        () -> DiscreteAdaptiveRejection.of(k -> -k, 0, 0x1p53 + 2, HullOptions.defaults()));
  }

  /**
   * The starting chords are checked against both neighbours as they are added: chords at -1, 0, 1
   * whose slopes rise from the first to the second; and, for a mode at -5, a chord that the search
   * adds on the left (at -2) rising less than the one at its right.
   */
  @Test
  void startingChordsOutOfOrderAreRefusedOnEitherSide() {
    LogMass risingAtZero = k -> k == -1 ? 0 : k == 0 ? -1 : k == 1 ? -1.5 : -1.5 - (k - 1);
    assertThrows(NotLogConcaveException.class,
        () -> DiscreteAdaptiveRejection.of(risingAtZero, -10, 10, HullOptions.defaults()));
    LogMass bumpAtMinusTwo = k -> k == -2 ? 0 : -0.5 * (k + 5) * (k + 5);
    NotLogConcaveException e = assertThrows(NotLogConcaveException.class,
        () -> DiscreteAdaptiveRejection.of(bumpAtMinusTwo, Double.NEGATIVE_INFINITY,
            Double.POSITIVE_INFINITY, HullOptions.defaults()));
    assertTrue(e.getMessage().contains("the chord at -1 rises by"), e.getMessage());
  }

  @Test
  void argumentsAreChecked() {
    assertThrows(IllegalArgumentException.class,
        () -> DiscreteAdaptiveRejection.of(k -> 0, 0.5, 3, HullOptions.defaults()));
    assertThrows(IllegalArgumentException.class,
        () -> DiscreteAdaptiveRejection.of(k -> 0, 3, 1, HullOptions.defaults()));
    assertThrows(IllegalArgumentException.class,
        () -> DiscreteAdaptiveRejection.of(null, 0, 1, HullOptions.defaults()));
  }
}

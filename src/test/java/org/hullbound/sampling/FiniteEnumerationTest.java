package org.hullbound.sampling;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.junit.jupiter.api.Test;

/**
 * {@link FiniteEnumeration}: exact draws by log-space enumeration. One chi-square test at level
 * 1e-5 (seed fixed, 4000 draws in 20 cells of 5% each, as each draw sums 10^4 weights; power: a
 * sampler that ignored the lowest half of the weights, or shifted the mass by half a standard
 * deviation, 25 points, leaves a noncentrality above 100 against a critical value of 48, rejected
 * with power above 0.999, normal approximation, common practice); the rest are exact checks of the log-space edges.
 */
class FiniteEnumerationTest {

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  /**
   * 10^4 points whose log weights lie near -1e5 (exp of each underflows to 0 in doubles):
   * binomial(9999, 0.5) log masses (commons-math3) shifted by -1e5. Without the largest weight
   * subtracted every weight would be 0; here the draws follow the binomial, checked by chi-square
   * in 20 cells of 5% of the reference mass each.
   */
  @Test
  void tenThousandWeightsFarBelowUnderflowAreDrawnExactly() {
    int n = 10_000;
    BinomialDistribution reference = new BinomialDistribution(n - 1, 0.5);
    double[] w = new double[n];
    for (int i = 0; i < n; i++) {
      w[i] = reference.logProbability(i) - 1e5;
    }
    assertEquals(0.0, Math.exp(w[n / 2]), "each weight alone underflows");
    RandomGenerator rng = rng(21);
    int draws = 4000;
    // 20 cells between the reference's 5% quantiles: each expects about 200 draws
    int[] edges = new int[21];
    for (int c = 1; c < 20; c++) {
      edges[c] = reference.inverseCumulativeProbability(c / 20.0);
    }
    edges[20] = n - 1;
    long[] counts = new long[20];
    for (int i = 0; i < draws; i++) {
      int k = FiniteEnumeration.draw(w, n, rng);
      int c = 0;
      while (c < 19 && k > edges[c + 1]) {
        c++;
      }
      counts[c]++;
    }
    double statistic = 0;
    for (int c = 0; c < 20; c++) {
      double p = reference.cumulativeProbability(edges[c + 1])
          - (c == 0 ? 0 : reference.cumulativeProbability(edges[c]));
      double expected = p * draws;
      statistic += (counts[c] - expected) * (counts[c] - expected) / expected;
    }
    int cells = 20;
    double pValue = 1 - new ChiSquaredDistribution(cells - 1).cumulativeProbability(statistic);
    assertTrue(pValue > 1e-5, "p = " + pValue);
  }

  @Test
  void pointsOfMassZeroAreNeverDrawn() {
    double[] w = {Double.NEGATIVE_INFINITY, -3, Double.NEGATIVE_INFINITY, -3, Double.NEGATIVE_INFINITY};
    RandomGenerator rng = rng(22);
    for (int i = 0; i < 10_000; i++) {
      int k = FiniteEnumeration.draw(w, w.length, rng);
      assertTrue(k == 1 || k == 3, "drew " + k);
    }
  }

  @Test
  void onlyTheFirstCountWeightsAreUsed() {
    double[] w = {0, 0, 1e3};
    RandomGenerator rng = rng(23);
    for (int i = 0; i < 1000; i++) {
      assertTrue(FiniteEnumeration.draw(w, 2, rng) < 2);
    }
  }

  @Test
  void hugeWeightsDoNotOverflow() {
    double[] w = {1e308, 1e308 - 1e292};
    assertEquals(0, FiniteEnumeration.draw(new double[] {1e308}, 1, rng(1)));
    int k = FiniteEnumeration.draw(w, 2, rng(1));
    assertTrue(k == 0 || k == 1);
  }

  @Test
  void invalidWeightsAreRefused() {
    assertThrows(DensityEvaluationException.class,
        () -> FiniteEnumeration.draw(new double[] {0, Double.NaN}, 2, rng(1)));
    assertThrows(DensityEvaluationException.class,
        () -> FiniteEnumeration.draw(new double[] {0, Double.POSITIVE_INFINITY}, 2, rng(1)));
    assertThrows(DensityEvaluationException.class,
        () -> FiniteEnumeration.draw(
            new double[] {Double.NEGATIVE_INFINITY, Double.NEGATIVE_INFINITY}, 2, rng(1)));
    assertThrows(IllegalArgumentException.class,
        () -> FiniteEnumeration.draw(new double[] {0}, 2, rng(1)));
  }
}

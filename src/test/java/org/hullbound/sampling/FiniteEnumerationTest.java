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
 * 1e-5 (seed fixed, 10^5 draws; power: a 5% shift of the top cell's mass to a neighbour gives a
 * noncentrality above 100 against a critical value near 50, rejected with power above 0.999,
 * normal approximation, common practice); the rest are exact checks of the log-space edges.
 */
class FiniteEnumerationTest {

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  /**
   * 10^4 points whose log weights lie near -1e5 (exp of each underflows to 0 in doubles):
   * binomial(9999, 0.5) log masses (commons-math3) shifted by -1e5. Without the largest weight
   * subtracted every weight would be 0; here the draws follow the binomial, checked by chi-square
   * on the cells with expected count >= 5 (the tails pooled).
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
    int draws = 100_000;
    int lo = 4800;
    int hi = 5200;
    long[] counts = new long[hi - lo + 3];
    for (int i = 0; i < draws; i++) {
      int k = FiniteEnumeration.draw(w, n, rng);
      counts[k < lo ? 0 : k > hi ? counts.length - 1 : k - lo + 1]++;
    }
    double[] p = new double[counts.length];
    p[0] = reference.cumulativeProbability(lo - 1);
    p[counts.length - 1] = 1 - reference.cumulativeProbability(hi);
    for (int k = lo; k <= hi; k++) {
      p[k - lo + 1] = reference.probability(k);
    }
    // merge cells with expected < 5 into the outer pools
    double statistic = 0;
    int cells = 0;
    double pooledP = 0;
    long pooledCount = 0;
    for (int c = 0; c < p.length; c++) {
      pooledP += p[c];
      pooledCount += counts[c];
      if (pooledP * draws >= 5 || c == p.length - 1) {
        double expected = pooledP * draws;
        statistic += (pooledCount - expected) * (pooledCount - expected) / expected;
        cells++;
        pooledP = 0;
        pooledCount = 0;
      }
    }
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

package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.random.RandomGenerator;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PascalDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.junit.jupiter.api.Test;

/**
 * Draws of missing observations against reference distributions of commons-math3. Each check at
 * level 1e-5 (fixed seeds, n = 32000: the KS critical distance 2.47 / sqrt(n) equals that of 20000
 * draws at 0.001); power against a 5% shift in location above 0.99.
 */
class PredictiveDrawTest {
  private static RandomGenerator rng(long seed) {
    return ChainSeeds.split(seed, 1)[0];
  }

  @Test
  void aTruncatedNormalFollowsTheRenormalisedCdf() {
    // normal(mean = 1, sd = 2) within 0 .. 3: F_T(x) = (F(x) - F(0)) / (F(3) - F(0)).
    NormalDistribution normal = new NormalDistribution(null, 1, 2);
    double[] draws = new double[32_000];
    RandomGenerator rng = rng(1);
    for (int i = 0; i < draws.length; i++) {
      draws[i] =
          PredictiveDraw.draw("normal", List.of("mean", "sd"), new double[] {1, 2}, 0, 3, rng);
      assertTrue(draws[i] >= 0 && draws[i] <= 3);
    }
    double f0 = normal.cumulativeProbability(0);
    double f3 = normal.cumulativeProbability(3);
    org.apache.commons.math3.distribution.AbstractRealDistribution truncated =
        new org.apache.commons.math3.distribution.AbstractRealDistribution(null) {
          @Override
          public double density(double x) {
            return x < 0 || x > 3 ? 0 : normal.density(x) / (f3 - f0);
          }

          @Override
          public double cumulativeProbability(double x) {
            return x <= 0 ? 0 : x >= 3 ? 1 : (normal.cumulativeProbability(x) - f0) / (f3 - f0);
          }

          @Override
          public double getNumericalMean() {
            return Double.NaN;
          }

          @Override
          public double getNumericalVariance() {
            return Double.NaN;
          }

          @Override
          public double getSupportLowerBound() {
            return 0;
          }

          @Override
          public double getSupportUpperBound() {
            return 3;
          }

          @Override
          @SuppressWarnings("deprecation") public boolean isSupportLowerBoundInclusive() {
            return true;
          }

          @Override
          @SuppressWarnings("deprecation") public boolean isSupportUpperBoundInclusive() {
            return true;
          }

          @Override
          public boolean isSupportConnected() {
            return true;
          }
        };
    double p = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(truncated, draws);
    assertTrue(p > 1e-5, "KS p = " + p);
  }

  @Test
  void aNegativeBinomialIsTheGammaMixtureOfPoissons() {
    // mean 6, size 3: the Pascal distribution with r = 3 successes, p = size / (size + mean).
    PascalDistribution reference = new PascalDistribution(null, 3, 3.0 / 9.0);
    int n = 32_000;
    int cells = 25;
    long[] observed = new long[cells];
    RandomGenerator rng = rng(2);
    for (int i = 0; i < n; i++) {
      double y =
          PredictiveDraw.draw(
              "negative-binomial", List.of("mean", "size"), new double[] {6, 3},
              Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, rng);
      observed[(int) Math.min(y, cells - 1)]++;
    }
    // Chi-square with the last cell pooling the tail; every expected count is above 5.
    double statistic = 0;
    for (int k = 0; k < cells; k++) {
      double probability =
          k < cells - 1
              ? reference.probability(k)
              : 1 - reference.cumulativeProbability(cells - 2);
      double expected = n * probability;
      assertTrue(expected > 5, "cell " + k + " expected " + expected);
      statistic += (observed[k] - expected) * (observed[k] - expected) / expected;
    }
    double p = 1 - new ChiSquaredDistribution(cells - 1).cumulativeProbability(statistic);
    assertTrue(p > 1e-5, "chi-square p = " + p);
  }

  @Test
  void argumentsGivenInAnotherOrderAreMatchedByName() {
    // gamma(shape = 2.5, scale = 2) named scale first: the mean of the draws is shape * scale = 5,
    // sd sqrt(2.5) * 2 = 3.16; 20000 draws give a standard error of 0.022.
    RandomGenerator rng = rng(3);
    double sum = 0;
    int n = 20_000;
    for (int i = 0; i < n; i++) {
      sum +=
          PredictiveDraw.draw(
              "gamma", List.of("scale", "shape"), new double[] {2, 2.5},
              Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, rng);
    }
    assertEquals(5, sum / n, 4 * Math.sqrt(2.5) * 2 / Math.sqrt(n));
  }

  @Test
  void aFarTailTruncationIsDrawnWhereInversionOfTheCdfFails() {
    // normal(0, 1) within 37 .. inf: Phi(37) rounds to 1 in double precision, so inversion of
    // the CDF cannot reach the tail. The truncated mean is the inverse Mills ratio phi(a)/Q(a)
    // (Johnson, Kotz and Balakrishnan 1994, ch. 13), which the asymptotic series of Q(a)/phi(a)
    // (Abramowitz and Stegun 26.2.12) gives as a + 1/a - 2/a^3 up to O(a^-5), about 1e-8 here;
    // the sd is about 1/a.
    RandomGenerator rng = rng(4);
    double sum = 0;
    int n = 5_000;
    for (int i = 0; i < n; i++) {
      double x =
          PredictiveDraw.draw(
              "normal", List.of("mean", "sd"), new double[] {0, 1}, 37, Double.POSITIVE_INFINITY,
              rng);
      assertTrue(x >= 37, "draw " + x);
      sum += x;
    }
    double a = 37;
    double inverseMillsRatio = a + 1 / a - 2 / (a * a * a);
    assertEquals(inverseMillsRatio, sum / n, 4 * (1 / a) / Math.sqrt(n));
  }

  @Test
  void familiesAndParametrisationsAreRecognised() {
    assertTrue(PredictiveDraw.supports("binomial", List.of("trials", "logit_p")));
    assertTrue(PredictiveDraw.supports("gamma", List.of("shape", "scale")));
    assertTrue(PredictiveDraw.supports("student-t", List.of("df", "location", "scale")));
    assertFalse(PredictiveDraw.supports("no_such_family", List.of("x")));
  }
}

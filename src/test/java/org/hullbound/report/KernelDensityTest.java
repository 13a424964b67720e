package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.apache.commons.math3.stat.descriptive.rank.Percentile.EstimationType;
import org.junit.jupiter.api.Test;

/** Gaussian kernel density estimates with Silverman's bandwidth (Silverman 1986, eq. 3.31). */
class KernelDensityTest {

  private static double[] normalDraws(long seed, int n) {
    RandomGenerator rng = RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
    double[] x = new double[n];
    for (int i = 0; i < n; i++) {
      x[i] = rng.nextGaussian();
    }
    return x;
  }

  @Test
  void bandwidthIsSilvermansRuleWithReferenceSdAndIqr() {
    // Reference: commons-math3 StandardDeviation (divisor n - 1) and Percentile with the R-7
    // (Hyndman and Fan type 7) estimator; rule h = 0.9 min(sd, IQR / 1.34) n^(-1/5).
    double[] x = normalDraws(11, 500);
    for (int i = 0; i < x.length; i++) {
      x[i] = Math.exp(x[i]); // skewed, so the IQR and sd terms differ
    }
    double sd = new StandardDeviation().evaluate(x);
    Percentile p = new Percentile().withEstimationType(EstimationType.R_7);
    double iqr = p.evaluate(x, 75) - p.evaluate(x, 25);
    double expected = 0.9 * Math.min(sd, iqr / 1.34) * Math.pow(x.length, -0.2);
    assertEquals(expected, KernelDensity.silvermanBandwidth(x), 1e-12 * expected);
    assertEquals(expected, KernelDensity.of(x).bandwidth(), 1e-12 * expected);
  }

  @Test
  void manyTiesUseTheSdWhenTheIqrIsZero() {
    double[] x = {0, 0, 0, 0, 0, 0, 0, 0, 1, 5};
    double sd = new StandardDeviation().evaluate(x);
    assertEquals(0.9 * sd * Math.pow(10, -0.2), KernelDensity.silvermanBandwidth(x), 1e-12);
  }

  @Test
  void estimateOfNormalDrawsMatchesTheNormalDensityWithinItsKnownBiasAndSpread() {
    // For N(0,1) draws and a Gaussian kernel of bandwidth h the estimate's mean and variance are
    // exact (convolutions of normals; Silverman 1986, section 3.3, with K normal):
    //   E f(x)   = phi(x; 0, 1 + h^2)
    //   Var f(x) = ( phi(x; 0, 1 + h^2/2) / (2 sqrt(pi) h) - (E f(x))^2 ) / n.
    // h is taken as the realised bandwidth (it varies by O(n^-1/2) relative, far below the
    // tolerance). Each point is checked to 4.5 sd: two-sided level 6.8e-6 per point, under 4e-5
    // for the 5 points (Bonferroni). Power: at n = 50 000 the tolerance at the mode is about
    // 0.023 (|bias| 0.002 + 4.5 sd 0.0047), so an error of 6% or more there fails, e.g. a wrong
    // normalising constant or kernel shape; the bandwidth itself is checked exactly above.
    int n = 50_000;
    double[] x = normalDraws(20260314L, n);
    KernelDensity kde = KernelDensity.of(x);
    double h = kde.bandwidth();
    NormalDistribution standard = new NormalDistribution(null, 0, 1);
    NormalDistribution smoothed = new NormalDistribution(null, 0, Math.sqrt(1 + h * h));
    NormalDistribution squared = new NormalDistribution(null, 0, Math.sqrt(1 + h * h / 2));
    for (double point : new double[] {-2, -1, 0, 0.5, 1.5}) {
      double mean = smoothed.density(point);
      double variance = (squared.density(point) / (2 * Math.sqrt(Math.PI) * h) - mean * mean) / n;
      double bias = mean - standard.density(point);
      double tolerance = Math.abs(bias) + 4.5 * Math.sqrt(variance);
      double estimate = kde.density(point);
      assertEquals(
          standard.density(point),
          estimate,
          tolerance,
          "at x = " + point + " (bias " + bias + ", sd " + Math.sqrt(variance) + ")");
    }
  }

  @Test
  void estimateIntegratesToOne() {
    // A density integrates to 1 (Silverman 1986, section 2.2); trapezoid rule on 20 001 points
    // over the data range widened by the kernel cut-off, error far below 1e-6 for a smooth curve.
    double[] x = normalDraws(5, 800);
    for (int i = 0; i < x.length; i++) {
      x[i] = x[i] * x[i] + (i % 3); // skewed and three-humped
    }
    KernelDensity kde = KernelDensity.of(x);
    double a = kde.min() - 9 * kde.bandwidth();
    double b = kde.max() + 9 * kde.bandwidth();
    int points = 20_001;
    double step = (b - a) / (points - 1);
    double sum = 0;
    for (int i = 0; i < points; i++) {
      double weight = (i == 0 || i == points - 1) ? 0.5 : 1;
      sum += weight * kde.density(a + i * step);
    }
    assertEquals(1.0, sum * step, 1e-6);
  }

  @Test
  void bandwidthScalesWithTheDataFromTinyToHuge() {
    // Silverman's rule is scale-equivariant: h(c x) = c h(x) (both sd and IQR are).
    double[] x = normalDraws(7, 300);
    double h = KernelDensity.silvermanBandwidth(x);
    for (double c : new double[] {1e-300, 1e-150, 1e150, 1e300}) {
      double[] scaled = new double[x.length];
      for (int i = 0; i < x.length; i++) {
        scaled[i] = c * x[i];
      }
      double hc = KernelDensity.silvermanBandwidth(scaled);
      assertEquals(c * h, hc, 1e-10 * c * h, "scale " + c);
    }
  }

  @Test
  void densityIsZeroFarFromTheDataAndNeverNaN() {
    KernelDensity kde = KernelDensity.of(normalDraws(3, 100));
    assertEquals(0.0, kde.density(1e6));
    assertEquals(0.0, kde.density(-Double.MAX_VALUE));
    assertEquals(0.0, kde.density(Double.POSITIVE_INFINITY));
    assertTrue(Double.isNaN(kde.density(Double.NaN)));
  }

  @Test
  void aConstantSampleHasNoBandwidthAndSaysSo() {
    IllegalArgumentException e =
        assertThrows(
            IllegalArgumentException.class, () -> KernelDensity.of(new double[] {2.5, 2.5, 2.5}));
    assertTrue(e.getMessage().contains("no spread"), e.getMessage());
    assertTrue(e.getMessage().contains("2.5"), e.getMessage());
  }

  @Test
  void nonFiniteOrTooFewValuesAreRefusedWithTheirPlace() {
    IllegalArgumentException e =
        assertThrows(
            IllegalArgumentException.class,
            () -> KernelDensity.of(new double[] {1, Double.NaN, 3}));
    assertTrue(e.getMessage().contains("index 1"), e.getMessage());
    e = assertThrows(IllegalArgumentException.class, () -> KernelDensity.of(new double[] {1}));
    assertTrue(e.getMessage().contains("at least two"), e.getMessage());
    e =
        assertThrows(
            IllegalArgumentException.class, () -> KernelDensity.of(new double[] {1, 2}, 0.0));
    assertTrue(e.getMessage().contains("bandwidth"), e.getMessage());
  }

  @Test
  void aGivenBandwidthIsUsedAsIs() {
    // One point at 0 with h = 2 is the N(0, 4) density (commons-math3 reference).
    KernelDensity kde = KernelDensity.of(new double[] {0}, 2);
    NormalDistribution reference = new NormalDistribution(null, 0, 2);
    for (double x : new double[] {-3, 0, 1.7}) {
      assertEquals(reference.density(x), kde.density(x), 1e-15);
    }
  }
}

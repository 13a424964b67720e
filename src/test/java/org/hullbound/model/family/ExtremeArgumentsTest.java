package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.PoissonDistribution;
import org.junit.jupiter.api.Test;

/** Huge and tiny scales and limiting cases: values stay finite and right, gradients finite. */
class ExtremeArgumentsTest {

  @Test
  void normalWithTinyAndHugeSd() {
    Parametrisation normal = FamilyCases.parametrisation("normal", "mean", "sd");
    double[] gradient = new double[3];
    // At x = mean: -log(sd) - log(2 pi)/2 (closed form).
    for (double sd : new double[] {1e-300, 1e300}) {
      double value = normal.logDensity(5, new double[] {5, sd}, gradient);
      assertEquals(-Math.log(sd) - 0.5 * Math.log(2 * Math.PI), value, 1e-12 * Math.abs(value));
      assertEquals(-1 / sd, gradient[2], 1e-12 / sd);
    }
    // Half a standard deviation away at sd = 1e-300: still finite and exact.
    assertEquals(-0.125 + 690.7755278982137 - 0.9189385332046727,
        normal.logDensity(0.5e-300, new double[] {0, 1e-300}), 1e-9);
  }

  @Test
  void gammaWithExtremeRates() {
    Parametrisation gamma = FamilyCases.parametrisation("gamma", "shape", "rate");
    double[] gradient = new double[3];
    // shape 2: log(rate^2 x e^{-rate x}), at x = 1/rate: 2 log(rate) - log(rate) - 1 = log(rate) - 1.
    for (double rate : new double[] {1e-250, 1e250}) {
      double value = gamma.logDensity(1 / rate, new double[] {2, rate}, gradient);
      assertEquals(Math.log(rate) - 1, value, 1e-12 * Math.abs(value));
      assertTrue(Double.isFinite(gradient[0]) && Double.isFinite(gradient[1]) && Double.isFinite(gradient[2]));
    }
  }

  @Test
  void studentTWithHugeDfIsTheNormal() {
    Parametrisation t = FamilyCases.parametrisation("student-t", "df", "location", "scale");
    Parametrisation normal = FamilyCases.parametrisation("normal", "mean", "sd");
    // The t density tends to the normal as df -> inf, with a difference O(1/df) (common practice).
    double expected = normal.logDensity(1.5, new double[] {0, 1});
    assertEquals(expected, t.logDensity(1.5, new double[] {1e10, 0, 1}), 1e-9);
    assertEquals(expected, t.logDensity(1.5, new double[] {1e14, 0, 1}), 1e-12);
    // Tails too: log P(T > 0.5) -> log Q(0.5), commons-math3 NormalDistribution (accurate at 0.5).
    double tail = Math.log(1 - new org.apache.commons.math3.distribution.NormalDistribution(null, 0, 1)
        .cumulativeProbability(0.5));
    double[] gradient = new double[3];
    for (double df : new double[] {1e9, 1e12, 1e15}) {
      assertEquals(tail, t.logProbabilityBetween(0.5, Double.POSITIVE_INFINITY, new double[] {df, 0, 1}, gradient),
          1e-8, () -> "df = " + df);
    }
  }

  @Test
  void negativeBinomialWithHugeSizeIsThePoisson() {
    Parametrisation nb = FamilyCases.parametrisation("negative-binomial", "mean", "size");
    // negative-binomial(mean, size) -> poisson(mean) as size -> inf, difference O(1/size)
    // (Johnson, Kemp and Kotz 2005, 5.3); reference commons-math3 PoissonDistribution.
    double expected = new PoissonDistribution(null, 3, 1e-15, 1000).logProbability(2);
    assertEquals(expected, nb.logDensity(2, new double[] {3, 1e12}), 1e-10);
  }

  @Test
  void binomialWithABillionTrials() {
    Parametrisation binomial = FamilyCases.parametrisation("binomial", "trials", "logit_p");
    // x = trials: trials * log expit(logit_p) exactly (C(n, n) = 1).
    double n = 1e9;
    assertEquals(n * LogSpace.logInvLogit(2), binomial.logDensity(n, new double[] {n, 2}), 1e-12 * n);
    // x = 1, logit_p = 0: log(n) + n log(1/2).
    assertEquals(Math.log(n) - n * Math.log(2), binomial.logDensity(1, new double[] {n, 0}), 1e-12 * n);
  }

  @Test
  void betaWithTinyAndHugeArguments() {
    Parametrisation beta = FamilyCases.parametrisation("beta", "a", "b");
    double[] gradient = new double[3];
    // beta(a, 1): log(a) + (a - 1) log x (closed form).
    for (double a : new double[] {1e-8, 1e8}) {
      double value = beta.logDensity(0.999, new double[] {a, 1}, gradient);
      assertEquals(Math.log(a) + (a - 1) * Math.log(0.999), value, 1e-12 * Math.max(1, Math.abs(value)));
      assertTrue(Double.isFinite(gradient[1]) && Double.isFinite(gradient[2]));
    }
  }
}

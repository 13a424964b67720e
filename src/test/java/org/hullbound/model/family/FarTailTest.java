package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.special.Gamma;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Truncation normalisers in far tails, where {@code 1 - F} underflows in double precision, against
 * asymptotic series and exact closed forms; each check names its source.
 */
class FarTailTest {
  private static final double INF = Double.POSITIVE_INFINITY;
  private final double[] gradient = new double[3];

  private static double logBetween(Parametrisation p, double lo, double hi, double[] gradient, double... args) {
    return p.logProbabilityBetween(lo, hi, args, gradient);
  }

  /**
   * Mills ratio series {@code Q(z) = phi(z)/z (1 - 1/z^2 + 3/z^4 - 15/z^6 + 105/z^8 - ...)},
   * Abramowitz and Stegun (1964) 26.2.12; the error is below the first omitted term, {@code 945/z^10}.
   */
  private static double logMillsSeries(double z) {
    double w = 1 / (z * z);
    double series = 1 - w + 3 * w * w - 15 * w * w * w + 105 * w * w * w * w;
    return -0.5 * z * z - Math.log(z) - 0.5 * Math.log(2 * Math.PI) + Math.log(series);
  }

  @ParameterizedTest
  @ValueSource(doubles = {10, 12.5, 20, 37, 40, 100, 1e3, 1e6})
  void normalUpperTailFollowsTheMillsRatioWhereOneMinusFUnderflows(double z) {
    Parametrisation normal = FamilyCases.parametrisation("normal", "mean", "sd");
    double mean = 3;
    double sd = 2;
    if (z >= 10) {
      // The obvious 1 - F(x) is useless here: commons-math3 gives exactly 0 (or 1e-23-level rounding).
      double naive = 1 - new NormalDistribution(null, mean, sd).cumulativeProbability(mean + z * sd);
      assertEquals(true, naive < 1e-20 || naive == 0.0);
    }
    double logP = logBetween(normal, mean + z * sd, INF, gradient, mean, sd);
    double relativeError = 945 / Math.pow(z, 10);
    assertEquals(logMillsSeries(z), logP, 2 * relativeError + 1e-13 * Math.abs(logP));
    // d log Q((lo - mean)/sd)/d mean = phi(z)/(sd Q(z)), from the same series. It is formed as
    // exp(log phi - log Q) of two numbers near -z^2/2, so its relative error grows like 1e-16 z^2.
    double expectedSlope = Math.exp(NormalTail.logDensity(z) - logMillsSeries(z)) / sd;
    assertEquals(expectedSlope, gradient[0], (2 * relativeError + 1e-12 + 1e-15 * z * z) * expectedSlope);
    // Lower tail, by symmetry of the normal.
    double logLower = logBetween(normal, Double.NEGATIVE_INFINITY, mean - z * sd, gradient, mean, sd);
    assertEquals(logMillsSeries(z), logLower, 2 * relativeError + 1e-13 * Math.abs(logP));
  }

  @Test
  void normalIntervalInsideTheFarTailKeepsItsRelativeAccuracy() {
    Parametrisation normal = FamilyCases.parametrisation("normal", "mean", "precision");
    double logP = logBetween(normal, 30, 31, gradient, 0, 1);
    // Q(30) - Q(31) = Q(30) (1 - Q(31)/Q(30)), both from the Mills series (A&S 26.2.12).
    double expected = logMillsSeries(30) + Math.log1p(-Math.exp(logMillsSeries(31) - logMillsSeries(30)));
    assertEquals(expected, logP, 1e-12 * Math.abs(expected));
  }

  @Test
  void halfNormalTailsAtBothEnds() {
    Parametrisation halfNormal = FamilyCases.parametrisation("half-normal", "sd");
    // Upper: 2 Q(40) by the Mills series (A&S 26.2.12).
    assertEquals(Math.log(2) + logMillsSeries(40), logBetween(halfNormal, 80, INF, gradient, 2.0), 1e-12 * 800);
    // Near 0: erf(z/sqrt 2) = z sqrt(2/pi) (1 - z^2/6 + ...), A&S 7.1.5; z = 1e-8.
    double logNearZero = logBetween(halfNormal, 0, 2e-8, gradient, 2.0);
    assertEquals(Math.log(1e-8 * Math.sqrt(2 / Math.PI)), logNearZero, 1e-13);
  }

  @Test
  void exponentialUpperTailIsExact() {
    Parametrisation exponential = FamilyCases.parametrisation("exponential", "rate");
    // S(x) = exp(-rate x): closed form.
    assertEquals(-1000.0, logBetween(exponential, 400, INF, gradient, 2.5), 1e-12);
    // d/drate of -rate lo is -lo.
    assertEquals(-400.0, gradient[0], 1e-9);
  }

  @Test
  void gammaTailsAgainstClosedFormsForWholeShape() {
    Parametrisation gamma = FamilyCases.parametrisation("gamma", "shape", "rate");
    // Q(3, x) = exp(-x)(1 + x + x^2/2) for whole shape 3 (A&S 6.5.13 with the Poisson sum 26.4.21).
    double x = 2000;
    assertEquals(-x + Math.log(1 + x + x * x / 2), logBetween(gamma, x, INF, gradient, 3, 1), 1e-12 * x);
    // d/drate of log Q(3, rate lo) at rate 1 = -lo^3 e^-lo/2 / Q = -lo^3/(2 (1 + lo + lo^2/2)).
    assertEquals(-x * x * x / (2 * (1 + x + x * x / 2)), gradient[1], 1e-9 * x);
    // P(2, x) = x^2/2 (1 - 2x/3 + ...) near 0 (A&S 6.5.29 series), x = 1e-100.
    assertEquals(2 * Math.log(1e-100) - Math.log(2), logBetween(gamma, 0, 1e-100, gradient, 2, 1), 1e-12 * 460);
  }

  @Test
  void inverseGammaLowerTailIsTheGammaUpperTail() {
    Parametrisation invGamma = FamilyCases.parametrisation("inverse-gamma", "shape", "scale");
    // F(x) = Q(shape, scale/x) (JKB 1994, 17.8.3), Q(3, 2000) exact as above.
    double y = 2000;
    assertEquals(-y + Math.log(1 + y + y * y / 2), logBetween(invGamma, 0, 1 / y, gradient, 3, 1), 1e-12 * y);
  }

  @Test
  void betaTailsAgainstClosedForms() {
    Parametrisation beta = FamilyCases.parametrisation("beta", "a", "b");
    // I_x(a, 1) = x^a (closed form).
    assertEquals(3 * Math.log(1e-120), logBetween(beta, 0, 1e-120, gradient, 3, 1), 1e-12 * 830);
    // Upper tail of beta(1, b) is (1 - x)^b.
    double x = 1 - 1e-10;
    assertEquals(4 * Math.log(1 - x), logBetween(beta, x, 1, gradient, 1, 4), 1e-10);
  }

  @Test
  void studentTailsAgainstClosedFormsForOneAndTwoDegreesOfFreedom() {
    Parametrisation student = FamilyCases.parametrisation("student-t", "df", "location", "scale");
    double[] g = new double[3];
    // df = 1 is the Cauchy: S(t) = atan(1/t)/pi.
    double t = 1e10;
    assertEquals(Math.log(Math.atan(1 / t) / Math.PI), student.logProbabilityBetween(t, INF, new double[] {1, 0, 1}, g), 1e-12 * 24);
    // df = 2: F(t) = 1/2 + t/(2 sqrt(2 + t^2)), so S(t) = 1/(sqrt(2 + t^2)(sqrt(2 + t^2) + t)).
    // (Closed form recalled from memory; checked against commons-math3 TDistribution(2) at t = 3.)
    assertEquals(new TDistribution(null, 2).cumulativeProbability(3), 0.5 + 3 / (2 * Math.sqrt(11)), 1e-14);
    double r = Math.sqrt(2 + t * t);
    assertEquals(-Math.log(r * (r + t)), student.logProbabilityBetween(t, INF, new double[] {2, 0, 1}, g), 1e-12 * 47);
  }

  @Test
  void cauchyLogisticLaplaceAndWeibullFarTails() {
    double[] g = new double[2];
    // Cauchy: S(z) = atan(1/z)/pi ~ 1/(pi z).
    Parametrisation cauchy = FamilyCases.parametrisation("cauchy", "location", "scale");
    assertEquals(-Math.log(Math.PI) - 300 * Math.log(10), cauchy.logProbabilityBetween(1e300, INF, new double[] {0, 1}, g), 1e-12 * 700);
    // Logistic: S(z) = 1/(1 + e^z), log S = -z - log1p(e^-z).
    Parametrisation logistic = FamilyCases.parametrisation("logistic", "location", "scale");
    assertEquals(-800.0, logistic.logProbabilityBetween(1600, INF, new double[] {0, 2}, g), 1e-12 * 800);
    // Laplace: S = exp(-z)/2.
    Parametrisation laplace = FamilyCases.parametrisation("laplace", "location", "scale");
    assertEquals(Math.log(0.5) - 1000, laplace.logProbabilityBetween(1001, INF, new double[] {1, 1}, g), 1e-12 * 1000);
    // Weibull: S = exp(-(x/scale)^shape).
    Parametrisation weibull = FamilyCases.parametrisation("weibull", "shape", "scale");
    assertEquals(-10000.0, weibull.logProbabilityBetween(100, INF, new double[] {2, 1}, g), 1e-12 * 10000);
  }

  @Test
  void poissonFarUpperTail() {
    Parametrisation poisson = FamilyCases.parametrisation("poisson", "rate");
    double[] g = new double[1];
    int n = 1000;
    // P(X >= n) = pmf(n) (1 + rate/(n+1) + rate^2/((n+1)(n+2)) + ...), summed directly (rate = 1).
    double sum = 0;
    double term = 1;
    for (int k = 1; k < 50; k++) {
      sum += term;
      term /= n + k;
    }
    double expected = -1 - Gamma.logGamma(n + 1) + Math.log(sum);
    assertEquals(expected, poisson.logProbabilityBetween(n, INF, new double[] {1}, g), 1e-12 * Math.abs(expected));
    // d/drate log P(X >= n) = pmf(n - 1)/P(X >= n) = n/rate (1/sum) at rate 1, from d/drate P(X <= n-1) = -pmf(n-1).
    assertEquals(n / sum, g[0], 1e-6 * n);
  }

  @Test
  void discreteRangesIncludeBothEnds() {
    Parametrisation bernoulli = FamilyCases.parametrisation("bernoulli", "p");
    double[] g = new double[1];
    assertEquals(Math.log(0.7), bernoulli.logProbabilityBetween(0, 0, new double[] {0.3}, g), 1e-15);
    assertEquals(-1 / 0.7, g[0], 1e-6);
    Parametrisation binomial = FamilyCases.parametrisation("binomial", "trials", "p");
    double[] g2 = new double[2];
    assertEquals(0.0, binomial.logProbabilityBetween(0, 12, new double[] {12, 0.4}, g2), 1e-15);
    assertEquals(Double.NEGATIVE_INFINITY, binomial.logProbabilityBetween(2.5, 2.7, new double[] {12, 0.4}, g2));
  }

  @Test
  void emptyOrReversedIntervalsAreRejected() {
    Parametrisation normal = FamilyCases.parametrisation("normal", "mean", "sd");
    IllegalArgumentException reversed = assertThrows(IllegalArgumentException.class,
        () -> normal.logProbabilityBetween(2, 1, new double[] {0, 1}, gradient));
    assertEquals("the truncation needs lo < hi, got lo = 2, hi = 1", reversed.getMessage());
    assertThrows(IllegalArgumentException.class, () -> normal.logProbabilityBetween(1, 1, new double[] {0, 1}, gradient));
    assertThrows(IllegalArgumentException.class,
        () -> normal.logProbabilityBetween(Double.NaN, 1, new double[] {0, 1}, gradient));
  }
}

package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.special.Erf;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The standard normal truncated to x &gt; a far in the tail, where inverse-CDF sampling breaks down,
 * against the published moments: mean = lambda = phi(a) / Q(a) (the inverse Mills ratio), variance
 * = 1 + a lambda - lambda^2 (Johnson, Kotz and Balakrishnan 1994, Continuous Univariate
 * Distributions vol. 1, 2nd ed., ch. 13, the section on truncated normal distributions; formulas
 * recalled from memory and cross-checked below against the erfc form).
 *
 * <p>Tolerances come from the standard errors of the sample moments, not hand-tuned constants: the
 * sample mean must lie within 4 standard errors sqrt(var / n) of lambda, the sample variance within
 * 4 standard errors sqrt((m4 - s^4) / n) of the published variance (m4 the sample fourth central
 * moment; the usual large-sample standard error of a variance, common practice). For an exact
 * sampler each check fails with probability 6.3e-5 (two-sided normal tail beyond 4).
 */
class TruncatedNormalTailTest {

  private static final int DRAWS = 40_000;

  /**
   * lambda(a) = phi(a) / Q(a) by Laplace's continued fraction for the Mills ratio, Q(a) / phi(a) =
   * 1 / (a + 1 / (a + 2 / (a + 3 / (a + ...)))) (Abramowitz and Stegun 1964, 26.2.14; equation
   * number recalled from memory), evaluated from the tail backwards; accurate for large a.
   */
  static double inverseMillsRatioContinuedFraction(double a) {
    double tail = a;
    for (int n = 200; n >= 1; n--) {
      tail = a + n / tail;
    }
    return tail;
  }

  /** lambda(a) = phi(a) / Q(a) with Q(a) = erfc(a / sqrt 2) / 2 from commons-math3 {@link Erf}. */
  static double inverseMillsRatioErfc(double a) {
    double phi = Math.exp(-0.5 * a * a) / Math.sqrt(2 * Math.PI);
    return phi / (0.5 * Erf.erfc(a / Math.sqrt(2)));
  }

  @Test
  void bothReferenceFormulasAgreeWhereBothAreAccurate() {
    for (double a : new double[] {3, 5, 10}) {
      double viaErfc = inverseMillsRatioErfc(a);
      double viaFraction = inverseMillsRatioContinuedFraction(a);
      assertEquals(viaErfc, viaFraction, 1e-12 * viaErfc, "lambda(" + a + ")");
    }
  }

  @Test
  void inverseCdfSamplingCannotReachThirtySeven() {
    // commons-math3: Phi(37) rounds to 1, so u in (Phi(37), 1) is empty and inversion fails
    assertEquals(1.0, new NormalDistribution(null, 0, 1).cumulativeProbability(37));
  }

  @ParameterizedTest(name = "x > {0}, derivative-free {1}")
  @CsvSource({"5, false", "5, true", "10, false", "10, true", "37, false", "37, true"})
  void farTailMomentsMatchThePublishedFormulas(double a, boolean derivativeFree) {
    double lambda =
        a < 20 ? inverseMillsRatioErfc(a) : inverseMillsRatioContinuedFraction(a);
    double variance = 1 - lambda * (lambda - a); // = 1 + a lambda - lambda^2, fewer cancellations
    Target tail = Target.truncatedNormal(0, 1, Support.above(a));
    AdaptiveRejectionSampler sampler = tail.sampler(derivativeFree, HullOptions.defaults());
    RandomGenerator rng = RandomGeneratorFactory.of("L64X128MixRandom").create(5150L + (long) a);

    double[] draws = new double[DRAWS];
    sampler.sample(rng, draws);
    double mean = 0;
    for (double x : draws) {
      assertTrue(x >= a, "draw " + x + " below the truncation point " + a);
      mean += (x - a) / DRAWS;
    }
    double m2 = 0;
    double m4 = 0;
    for (double x : draws) {
      double d = (x - a) - mean;
      m2 += d * d / DRAWS;
      m4 += d * d * d * d / DRAWS;
    }
    double meanError = Math.sqrt(variance / DRAWS);
    double varianceError = Math.sqrt((m4 - m2 * m2) / DRAWS);
    assertEquals(lambda - a, mean, 4 * meanError, "mean of x - a for x > " + a);
    assertEquals(variance, m2, 4 * varianceError, "variance for x > " + a);
  }
}

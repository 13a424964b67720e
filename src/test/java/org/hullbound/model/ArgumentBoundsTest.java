package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.hullbound.model.family.Scale;
import org.junit.jupiter.api.Test;

/**
 * An argument with a bounded range that moves with an unknown cuts the unknown's support: the
 * bounds a conditional reports are checked against the interval worked out by hand from the
 * argument's range (a probability in [0, 1], a rate above 0), the conditional is zero outside
 * them, and inside them it is the hand-written posterior (commons-math3 as the reference for the
 * families' log-densities).
 */
class ArgumentBoundsTest {

  private static final double[] DOSE = {0.1, 0.3, 0.5, 0.8};
  private static final int[] TRIALS = {10, 10, 10, 10};
  private static final int[] SURVIVED = {2, 4, 5, 8};

  private static final String DOSE_MODEL =
      "index obs = 1 .. 4\n"
          + "data dose[obs] = [0.1, 0.3, 0.5, 0.8]\n"
          + "data n[obs] = [10, 10, 10, 10]\n"
          + "data y[obs] = [2, 4, 5, 8] ~ binomial(trials = n[obs], p = alpha + beta * dose[obs])\n"
          + "param alpha ~ normal(mean = 0, sd = 1)\n"
          + "param beta ~ normal(mean = 0, sd = 1)\n";

  @Test
  void anAffineProbabilityCutsEachCoefficientToWhereEveryPStaysInTheUnitInterval() {
    BoundModel model = bind(DOSE_MODEL);
    ConditionalDensity alpha = model.conditional(model.unknown("alpha").index());
    ConditionalDensity beta = model.conditional(model.unknown("beta").index());
    double[] state = {0.1, 0.7};
    // By hand: 0 <= alpha + 0.7 d <= 1 for d in DOSE: alpha in [-0.07, 1 - 0.56].
    assertEquals(-0.07, alpha.lowerBound(state), 1e-15);
    assertEquals(0.44, alpha.upperBound(state), 1e-15);
    // 0 <= 0.1 + beta d <= 1: beta >= -0.1/0.8 and beta <= 0.9/0.8.
    assertEquals(-0.125, beta.lowerBound(state), 1e-15);
    assertEquals(1.125, beta.upperBound(state), 1e-15);
    // The cut moves with the other unknown: alpha = 0.9 gives beta in [-0.9/0.8, 0.1/0.8].
    state[0] = 0.9;
    assertEquals(-1.125, beta.lowerBound(state), 1e-15);
    assertEquals(0.125, beta.upperBound(state), 1e-15);
  }

  @Test
  void insideTheCutTheConditionalIsTheBinomialPosteriorAndOutsideItIsZero() {
    BoundModel model = bind(DOSE_MODEL);
    ConditionalDensity alpha = model.conditional(model.unknown("alpha").index());
    double[] state = {0.1, 0.7};
    // commons-math3 as the reference: normal(0, 1) prior plus the four binomial log masses.
    NormalDistribution prior = new NormalDistribution(null, 0, 1);
    java.util.function.DoubleUnaryOperator reference = a -> {
      double total = prior.logDensity(a);
      for (int i = 0; i < DOSE.length; i++) {
        total += new BinomialDistribution(null, TRIALS[i], a + 0.7 * DOSE[i])
            .logProbability(SURVIVED[i]);
      }
      return total;
    };
    double base = alpha.logDensity(0.2, state, null) - reference.applyAsDouble(0.2);
    for (double a : new double[] {-0.06, 0.0, 0.3, 0.43}) {
      assertEquals(base, alpha.logDensity(a, state, null) - reference.applyAsDouble(a), 1e-9);
    }
    // Just outside either end: p leaves [0, 1] for one observation, and the density is zero.
    double[] slope = new double[1];
    assertEquals(Double.NEGATIVE_INFINITY, alpha.logDensity(-0.0701, state, slope));
    assertEquals(0.0, slope[0]);
    assertEquals(Double.NEGATIVE_INFINITY, alpha.logDensity(0.4401, state, slope));
  }

  @Test
  void anObservationWithNoSuccessesKeepsTheDensityZeroWherePWouldBeNegative() {
    // y = 0 has log mass trials * log(1 - p), finite for p < 0: only the range check makes the
    // density zero there, so that no sampler can wander below p = 0.
    BoundModel model = bind(
        "data y = 0 ~ binomial(trials = 5, p = theta)\n"
            + "param theta ~ uniform(lower = -1, upper = 1)\n");
    ConditionalDensity theta = model.conditional(0);
    assertEquals(0.0, theta.lowerBound(new double[1]));
    assertEquals(Double.NEGATIVE_INFINITY, theta.logDensity(-0.2, new double[1], null));
    assertTrue(theta.logDensity(0.2, new double[1], null) > Double.NEGATIVE_INFINITY);
  }

  @Test
  void anIdentityLinkRateIsCutToWhereEveryRateStaysPositive() {
    BoundModel model = bind(
        "index t = 1 .. 3\n"
            + "data x[t] = [-2, 1, 3]\n"
            + "data y[t] = [1, 4, 6] ~ poisson(rate = a + b * x[t])\n"
            + "param a ~ normal(mean = 5, sd = 2)\n"
            + "param b ~ normal(mean = 0, sd = 1)\n");
    ConditionalDensity b = model.conditional(model.unknown("b").index());
    double[] state = {4.0, 0.0};
    // 4 + b x > 0: b < 2 from x = -2 (a negative coefficient turns the cut round), b > -4/3
    // from x = 3, b > -4 from x = 1.
    assertEquals(-4.0 / 3, b.lowerBound(state), 1e-15);
    assertEquals(2.0, b.upperBound(state), 1e-15);
    assertInstanceOf(Update.AdaptiveRejection.class, model.update(1));
    assertTrue(model.update(1).reason().contains(
        "support cut to where every poisson rate stays in (0, inf), recomputed from the other"
            + " unknowns at every draw"), model.update(1).reason());
  }

  @Test
  void anExpLinkedProbabilityIsCutToWhereTheLinearPredictorStaysAtOrBelowZero() {
    // p = exp(eta) <= 1 needs eta = a + b x <= 0: with a = -1, x = 2, b <= 0.5.
    BoundModel model = bind(
        "data y = 1 ~ bernoulli(p = exp(a + 2 * b))\n"
            + "param a ~ normal(mean = -1, sd = 1)\n"
            + "param b ~ normal(mean = 0, sd = 1)\n");
    ConditionalDensity b = model.conditional(1);
    assertEquals(0.5, b.upperBound(new double[] {-1.0, 0.0}), 1e-15);
    assertEquals(Double.NEGATIVE_INFINITY, b.lowerBound(new double[] {-1.0, 0.0}));
  }

  @Test
  void aMonomialProbabilityCutsAPositiveUnknownOnTheLogScale() {
    // p = 0.5 x <= 1 for x <= 2; x is sampled as u = log x, so u <= log 2, and the data-only cut
    // is the same at every state.
    BoundModel model = bind(
        "data y = 3 ~ binomial(trials = 10, p = 0.5 * x)\n"
            + "param x ~ gamma(shape = 2, rate = 1)\n");
    ConditionalDensity x = model.conditional(0);
    assertEquals(Scale.LOG, x.scale());
    assertEquals(Math.log(2), x.upperBound(new double[1]), 1e-15);
    assertEquals(Double.NEGATIVE_INFINITY, x.lowerBound(new double[1]));
    assertTrue(model.update(0).reason().endsWith(
        "support cut to where every binomial p stays in [0, 1]"), model.update(0).reason());
    // p = c x^2 with c = k read from another unknown: x <= 1/sqrt(k).
    BoundModel squared = bind(
        "data y = 3 ~ binomial(trials = 10, p = k * x ^ 2)\n"
            + "param x ~ gamma(shape = 2, rate = 1)\n"
            + "param k ~ gamma(shape = 2, rate = 8)\n");
    ConditionalDensity cut = squared.conditional(0);
    assertEquals(Math.log(1 / Math.sqrt(0.25)), cut.upperBound(new double[] {1.0, 0.25}), 1e-15);
  }

  @Test
  void aLogitLinkAndAPositiveMultipleCutNothing() {
    BoundModel model = bind(
        "index obs = 1 .. 2\n"
            + "data y[obs] = [1, 0] ~ bernoulli(logit_p = alpha + beta)\n"
            + "data z[obs] = [0.5, 2.0] ~ normal(mean = alpha, sd = 2 * sigma)\n"
            + "data w[obs] = [1, 3] ~ poisson(rate = beta * sigma)\n"
            + "param alpha ~ normal(mean = 0, sd = 1)\n"
            + "param beta ~ gamma(shape = 2, rate = 1)\n"
            + "param sigma ~ half-normal(sd = 1)\n");
    for (String label : new String[] {"alpha", "beta", "sigma"}) {
      int i = model.unknown(label).index();
      assertFalse(model.update(i).reason().contains("support cut"), model.update(i).reason());
    }
    ConditionalDensity sigma = model.conditional(model.unknown("sigma").index());
    assertEquals(Double.NEGATIVE_INFINITY, sigma.lowerBound(new double[] {0, 1, 1}));
    assertEquals(Double.POSITIVE_INFINITY, sigma.upperBound(new double[] {0, 1, 1}));
  }

  @Test
  void theStartIsMovedInsideTheCutWhenThePriorsCentreIsOutsideIt() {
    // alpha = beta = 0 gives p = 0 with survivors: the start moves alpha to the middle of (0, 1).
    BoundModel model = bind(DOSE_MODEL);
    double[] start = model.initialState();
    assertTrue(model.logDensity(start) > Double.NEGATIVE_INFINITY,
        "start " + java.util.Arrays.toString(start));
    assertEquals(0.5, start[model.unknown("alpha").index()]);
    assertEquals(0.0, start[model.unknown("beta").index()]);
  }
}

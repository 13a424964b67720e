package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * A non-conjugate two-parameter model against numerical integration: logistic regression
 * {@code y_i ~ bernoulli(logit_p = a + b x_i)}, {@code a, b ~ normal(0, 2.5)}, on a tiny invented
 * dataset. The posterior means and standard deviations are integrated on a 401 x 401 grid by the
 * composite Simpson rule (error far below the MCSE here); both unknowns are drawn by adaptive
 * rejection with derivatives, since each conditional is log-concave (a sum of concave terms).
 * Tolerance: 4 MCSE, as in {@link GibbsPosteriorTest}.
 */
class LogisticQuadratureTest {
  private static final double[] X = {-1.5, -1.0, -0.6, -0.2, 0.0, 0.3, 0.7, 1.1, 1.4, 2.0};
  private static final int[] Y = {0, 0, 1, 0, 0, 1, 0, 1, 1, 1};
  private static final double PRIOR_SD = 2.5;

  private static double logPosterior(double a, double b, double[] slopeA, double[] slopeB) {
    double value = -0.5 * (a * a + b * b) / (PRIOR_SD * PRIOR_SD);
    double da = -a / (PRIOR_SD * PRIOR_SD);
    double db = -b / (PRIOR_SD * PRIOR_SD);
    for (int i = 0; i < X.length; i++) {
      double eta = a + b * X[i];
      // log p = -log1p(exp(-eta)), log(1-p) = -log1p(exp(eta)), computed stably.
      double logP = eta > 0 ? -Math.log1p(Math.exp(-eta)) : eta - Math.log1p(Math.exp(eta));
      double logQ = logP - eta;
      value += Y[i] == 1 ? logP : logQ;
      double p = Math.exp(logP);
      da += Y[i] - p;
      db += (Y[i] - p) * X[i];
    }
    if (slopeA != null) {
      slopeA[0] = da;
    }
    if (slopeB != null) {
      slopeB[0] = db;
    }
    return value;
  }

  @Test
  void gibbsWithAdaptiveRejectionMatchesTheIntegratedPosterior() {
    ScalarConditional intercept = (u, state, slope) -> logPosterior(u, state[1], slope, null);
    ScalarConditional coefficient = (u, state, slope) -> logPosterior(state[0], u, null, slope);
    GibbsSampler sampler =
        GibbsSampler.of(
            2,
            List.of(
                new UpdateRule.AdaptiveRejection(0, intercept, "log-concave"),
                new UpdateRule.AdaptiveRejection(1, coefficient, "log-concave")),
            (state, rng) -> {
              state[0] = rng.nextDouble(-2, 2);
              state[1] = rng.nextDouble(-2, 2);
            });
    Fits.Fit fit = Fits.run(sampler, new RunSettings(4, 200, 2500, 1, 424242L, 2));
    // Simpson on [-8, 8]^2: the posterior is negligible past it.
    double[] truth =
        SimpsonMoments.of((a, b) -> logPosterior(a, b, null, null), -8, 8, -8, 8, 400);
    fit.assertMomentsWithinFourMcse(truth);
    for (int k = 0; k < 2; k++) {
      assertTrue(fit.reports().get(k).evaluationsPerDraw() <= 3.5,
          "evaluations per draw " + fit.reports().get(k).evaluationsPerDraw());
    }
  }
}

package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.hullbound.lang.Parser;
import org.hullbound.model.BoundModel;
import org.hullbound.model.Update;
import org.junit.jupiter.api.Test;

/**
 * A dose-response model with an identity link, {@code y_i ~ binomial(10, p_i = alpha + beta
 * d_i)}, {@code alpha, beta ~ normal(0, 1)}, fitted through the model (its support cut to where
 * every {@code p_i} stays in [0, 1], recomputed each draw from the other coefficient) against
 * numerical integration: the posterior is zero outside the region {@code 0 <= alpha <= 1}, {@code
 * 0 <= alpha + beta <= 1} (doses 0 to 1), and its means and standard deviations are integrated on
 * a 1001 x 1001 grid over [0, 1] x [-1, 1] by the composite Simpson rule (the integrand vanishes
 * continuously at the region's edges, since every observation has 0 < y < n, so the grid's
 * error, O(h^2) at the edge, is far below the MCSE). The data put the posterior against two
 * edges ({@code p} near 0.1 at dose 0 and near 0.9 at dose 1), so a support cut too wide fails
 * the hull's start and one too narrow moves the moments.
 *
 * <p>Tolerance: 4 MCSE, as in {@link GibbsPosteriorTest} (each check fails with probability
 * about 6e-5 for a correct sampler, so the four together about 2.5e-4; a bias of 5 MCSE is caught
 * with probability about 0.84 each).
 */
class ConstrainedSupportQuadratureTest {
  private static final double[] DOSE = {0.0, 0.25, 0.5, 0.75, 1.0};
  private static final int[] Y = {1, 3, 5, 8, 9};
  private static final int N = 10;

  private static final String MODEL =
      "index obs = 1 .. 5\n"
          + "data dose[obs] = [0.0, 0.25, 0.5, 0.75, 1.0]\n"
          + "data y[obs] = [1, 3, 5, 8, 9] ~ binomial(trials = 10, p = alpha + beta * dose[obs])\n"
          + "param alpha ~ normal(mean = 0, sd = 1)\n"
          + "param beta ~ normal(mean = 0, sd = 1)\n";

  /** The log posterior up to a constant; -inf outside the region where every p is in [0, 1]. */
  private static double logPosterior(double a, double b) {
    double value = -0.5 * (a * a + b * b);
    for (int i = 0; i < DOSE.length; i++) {
      double p = a + b * DOSE[i];
      if (!(p > 0 && p < 1)) {
        return Double.NEGATIVE_INFINITY;
      }
      value += Y[i] * Math.log(p) + (N - Y[i]) * Math.log1p(-p);
    }
    return value;
  }

  @Test
  void gibbsOnTheCutSupportMatchesTheIntegratedPosterior() {
    BoundModel model = BoundModel.bind(Parser.parse("dose.hbm", MODEL), List.of());
    assertInstanceOf(Update.AdaptiveRejection.class, model.update(0));
    assertInstanceOf(Update.AdaptiveRejection.class, model.update(1));
    ModelSampler sampler = ModelSampler.of(model, Map.of());
    Fits.Fit fit = Fits.run(sampler.sampler(), new RunSettings(4, 400, 2000, 1, 20261202L, 2));
    double[] truth = SimpsonMoments.of(
        ConstrainedSupportQuadratureTest::logPosterior, 0, 1, -1, 1, 1000);
    fit.assertMomentsWithinFourMcse(truth);
    for (int k = 0; k < 2; k++) {
      // Drawn by adaptive rejection throughout: the hull never found the cut conditional not
      // log-concave and switched away.
      assertTrue(fit.reports().get(k).switches().isEmpty(), fit.reports().get(k).switches()
          .toString());
    }
  }
}

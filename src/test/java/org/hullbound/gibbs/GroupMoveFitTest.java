package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.apache.commons.math3.distribution.MultivariateNormalDistribution;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.Update;
import org.junit.jupiter.api.Test;

/**
 * The shift and the rescale move leave a hierarchical normal model's posterior invariant: the
 * educational testing example (Gelman et al., Bayesian Data Analysis, 3rd ed., section 5.5, Table
 * 5.2: eight schools' estimated effects and their standard errors, known), written with the
 * effects offsetting the mean, {@code y[j] ~ normal(mu + effect[j], sigma[j])}, {@code effect[j]
 * ~ normal(0, tau)}, {@code mu ~ normal(0, 5)}, {@code tau ~ half-normal(5)}.
 *
 * <p>The reference (BDA section 5.4, eqs. 5.20-5.21, with the prior of mu as one more normal
 * term): given tau, y is N(0, diag(sigma^2 + tau^2) + 25 J) (J all ones), so p(tau | y) is the
 * half-normal density times that normal density (commons-math3's multivariate normal as reference
 * library), and mu given tau and y is normal with precision 1/25 + sum 1/(sigma_j^2 + tau^2) and
 * mean sum y_j / (sigma_j^2 + tau^2) over it. Moments by Simpson's rule on tau in (0, 80].
 *
 * <p>The sweep is one unknown at a time (conjugate normal draws of mu and the effects, adaptive
 * rejection of tau on the log scale) and then the two moves; the check is mean and sd of mu and
 * tau within 4 MCSE (four checks, each at about 6e-5, 2.5e-4 together). Broken on purpose with
 * the Jacobian c^d in place of c^(d - 1) (the Haar measure's 1/c left out), the mean of tau came
 * out at 5.11 against 3.29, 74 MCSE away, and the test failed (December 2026, with a third move,
 * the rescale about the effects' mean, in the sweep then; it was left out later for its cost);
 * correct, 3.25 (2 MCSE), with 0.92 and 0.78 effective draws per sweep for mu and tau.
 */
class GroupMoveFitTest {
  private static final double[] Y = {28, 8, -3, 7, -1, 1, 18, 12};
  private static final double[] SIGMA = {15, 10, 16, 11, 9, 11, 10, 18};
  private static final double MU_SD = 5;
  private static final double TAU_SD = 5;

  static String model() {
    return "index school = 1 .. 8\n"
        + "data sigma[school] = " + list(SIGMA) + "\n"
        + "data y[school] = " + list(Y)
        + " ~ normal(mean = mu + effect[school], sd = sigma[school])\n"
        + "param mu ~ normal(mean = 0, sd = " + MU_SD + ")\n"
        + "param tau ~ half-normal(sd = " + TAU_SD + ")\n"
        + "param effect[school] ~ normal(mean = 0, sd = tau)\n";
  }

  private static String list(double[] values) {
    StringBuilder s = new StringBuilder("[");
    for (int i = 0; i < values.length; i++) {
      s.append(i == 0 ? "" : ", ").append(values[i]);
    }
    return s.append(']').toString();
  }

  /** The eight schools model, bound. */
  static BoundModel bound() {
    return BoundModel.bind(Parser.parse(SourceText.of("schools.hbm", model())), List.of());
  }

  /** p(tau | y) up to a constant: the half-normal prior times y's normal density given tau. */
  static double tauDensity(double tau) {
    double[][] covariance = new double[Y.length][Y.length];
    for (int i = 0; i < Y.length; i++) {
      for (int j = 0; j < Y.length; j++) {
        covariance[i][j] = MU_SD * MU_SD + (i == j ? SIGMA[i] * SIGMA[i] + tau * tau : 0);
      }
    }
    return Math.exp(-tau * tau / (2 * TAU_SD * TAU_SD))
        * new MultivariateNormalDistribution(new double[Y.length], covariance).density(Y);
  }

  /** {mean mu, mean tau, sd mu, sd tau} by Simpson's rule over tau. */
  static double[] reference() {
    int n = 8000;
    double hi = 80;
    double z = 0;
    double muMean = 0;
    double muSquare = 0;
    double tauMean = 0;
    double tauSquare = 0;
    for (int k = 0; k <= n; k++) {
      double tau = hi * k / n;
      double w = k == 0 || k == n ? 1 : (k % 2 == 1 ? 4 : 2);
      double precision = 1 / (MU_SD * MU_SD);
      double weighted = 0;
      for (int i = 0; i < Y.length; i++) {
        precision += 1 / (SIGMA[i] * SIGMA[i] + tau * tau);
        weighted += Y[i] / (SIGMA[i] * SIGMA[i] + tau * tau);
      }
      double density = tauDensity(tau);
      double m = weighted / precision;
      z += w * density;
      muMean += w * density * m;
      muSquare += w * density * (m * m + 1 / precision);
      tauMean += w * density * tau;
      tauSquare += w * density * tau * tau;
    }
    muMean /= z;
    tauMean /= z;
    return new double[] {
      muMean, tauMean, Math.sqrt(muSquare / z - muMean * muMean),
      Math.sqrt(tauSquare / z - tauMean * tauMean)
    };
  }

  @Test
  void theShiftAndTheRescaleMoveKeepTheEightSchoolsPosterior() {
    BoundModel bound = bound();
    List<Update> moves = bound.moves();
    assertEquals(2, moves.size(), "moves found: " + moves);
    ModelSampler sampler = ModelSampler.withoutBlocks(bound, Map.of());
    Fits.Fit fit = Fits.run(sampler.sampler(), new RunSettings(4, 500, 4000, 1, 5L, 2));
    double[] truth = reference();
    int mu = bound.unknown("mu").index();
    int tau = bound.unknown("tau").index();
    assertEquals(List.of(0, 1), List.of(mu, tau));
    fit.assertMomentsWithinFourMcse(truth);
    assertTrue(fit.reports().get(mu).method().endsWith("+ shift move"),
        fit.reports().get(mu).method());
    assertTrue(fit.reports().get(tau).method().endsWith("+ rescale move"),
        fit.reports().get(tau).method());
  }
}

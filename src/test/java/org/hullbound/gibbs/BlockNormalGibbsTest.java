package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.hullbound.diagnostics.VariableSummary;
import org.junit.jupiter.api.Test;

/**
 * A block update inside a Gibbs sweep: Bayesian linear regression with known noise sd,
 * {@code y = X beta + e}, {@code e ~ N(0, sigma^2 I)}, {@code beta ~ N(0, tau^2 I)}, whose
 * posterior is N(Q^-1 b, Q^-1) with Q = X'X / sigma^2 + I / tau^2, b = X'y / sigma^2 (Gelman et
 * al., BDA 3rd ed., 14.2 with a normal prior). The truth is computed with commons-math3's LU
 * inverse; tolerance 4 MCSE per coefficient mean, and the exact sd within 4 MCSE of the sd.
 */
class BlockNormalGibbsTest {
  private static final double[][] X = {
    {1, -1.2, 0.3}, {1, -0.4, 0.9}, {1, 0.1, -0.5}, {1, 0.7, 0.2}, {1, 1.5, -1.1}, {1, 2.0, 0.4},
  };
  private static final double[] Y = {-1.0, 0.2, 0.4, 1.1, 1.9, 2.8};
  private static final double SIGMA = 0.5;
  private static final double TAU = 2;

  @Test
  void correlatedCoefficientsDrawnJointlyMatchTheClosedForm() {
    int p = 3;
    double[][] q = new double[p][p];
    double[] b = new double[p];
    for (int i = 0; i < p; i++) {
      for (int j = 0; j < p; j++) {
        for (double[] row : X) {
          q[i][j] += row[i] * row[j] / (SIGMA * SIGMA);
        }
      }
      q[i][i] += 1 / (TAU * TAU);
      for (int k = 0; k < X.length; k++) {
        b[i] += X[k][i] * Y[k] / (SIGMA * SIGMA);
      }
    }
    RealMatrix covariance = new LUDecomposition(new Array2DRowRealMatrix(q)).getSolver().getInverse();
    double[] mean = covariance.operate(new ArrayRealVector(b)).toArray();
    CanonicalNormal posterior = CanonicalNormal.of(q, b);
    GibbsSampler sampler =
        GibbsSampler.of(
            p,
            List.of(new UpdateRule.BlockNormal(new int[] {0, 1, 2}, state -> posterior)),
            (state, rng) -> {
              for (int i = 0; i < p; i++) {
                state[i] = rng.nextDouble(-2, 2);
              }
            });
    Fits.Fit fit = Fits.run(sampler, new RunSettings(4, 10, 1000, 1, 12L, 2));
    for (int i = 0; i < p; i++) {
      VariableSummary summary = fit.summary(i);
      assertTrue(
          Math.abs(summary.mean() - mean[i]) < 4 * summary.mcseMean(),
          "beta[" + i + "] mean " + summary.mean() + " vs " + mean[i]);
      double sd = Math.sqrt(covariance.getEntry(i, i));
      double mcseSd = summary.sd() / Math.sqrt(2 * summary.essBulk());
      assertTrue(Math.abs(summary.sd() - sd) < 4 * mcseSd,
          "beta[" + i + "] sd " + summary.sd() + " vs " + sd);
      assertEquals("block normal (3 jointly)", fit.reports().get(i).method());
      assertEquals(0.0, fit.reports().get(i).evaluationsPerDraw());
    }
  }
}

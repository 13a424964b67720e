package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.junit.jupiter.api.Test;

/**
 * An end-to-end fit of a linear regression with known sigma, whose three coefficients the model
 * puts in one linear-normal block, against the closed-form posterior (Gelman et al., Bayesian Data
 * Analysis, 3rd ed., section 14.2, with the normal prior as extra observations, section 14.8):
 * N(Q^-1 b, Q^-1) with Q = X'X / sigma^2 + I / s^2 and b = X'y / sigma^2 + m / s^2. Tolerance 4
 * MCSE on the mean and the 97.5% quantile of each margin (see {@link GibbsPosteriorTest} for the
 * false-alarm rate).
 */
class LinearNormalBlockFitTest {
  // An invented scenario: yield against two strongly correlated covariates (x2 is nearly x1).
  private static final double[] X1 = {0.1, 0.8, 1.5, 2.2, 3.0, 3.7, 4.1, 5.0};
  private static final double[] X2 = {0.2, 0.7, 1.6, 2.1, 3.2, 3.6, 4.3, 4.9};
  private static final double[] Y = {1.4, 2.9, 4.1, 5.8, 7.9, 8.6, 10.2, 11.7};
  private static final double SIGMA = 0.5;
  private static final double PRIOR_SD = 3;

  private static String model() {
    return "index obs = 1 .. 8\n"
        + "data x1[obs] = " + list(X1) + "\n"
        + "data x2[obs] = " + list(X2) + "\n"
        + "data y[obs] = " + list(Y) + " ~ normal(mean = a + b1 * x1[obs] + b2 * x2[obs], sd = "
        + SIGMA + ")\n"
        + "param a ~ normal(mean = 0, sd = " + PRIOR_SD + ")\n"
        + "param b1 ~ normal(mean = 0, sd = " + PRIOR_SD + ")\n"
        + "param b2 ~ normal(mean = 0, sd = " + PRIOR_SD + ")\n";
  }

  private static String list(double[] values) {
    StringBuilder s = new StringBuilder("[");
    for (int i = 0; i < values.length; i++) {
      s.append(i == 0 ? "" : ", ").append(values[i]);
    }
    return s.append(']').toString();
  }

  @Test
  void theBlockDrawMatchesTheClosedFormRegressionPosterior() {
    BoundModel bound = BoundModel.bind(Parser.parse(SourceText.of("yield.hbm", model())), List.of());
    ModelSampler model = ModelSampler.of(bound, Map.of());
    Fits.Fit fit = Fits.run(model.sampler(), new RunSettings(4, 100, 1600, 1, 17L, 2));
    assertEquals("block normal (3 jointly)", fit.reports().get(0).method());

    double[][] design = new double[Y.length][];
    for (int i = 0; i < Y.length; i++) {
      design[i] = new double[] {1, X1[i], X2[i]};
    }
    RealMatrix d = new Array2DRowRealMatrix(design);
    RealMatrix q = d.transpose().multiply(d).scalarMultiply(1 / (SIGMA * SIGMA));
    for (int k = 0; k < 3; k++) {
      q.addToEntry(k, k, 1 / (PRIOR_SD * PRIOR_SD));
    }
    RealVector b = d.transpose().operate(new ArrayRealVector(Y)).mapMultiply(1 / (SIGMA * SIGMA));
    RealMatrix covariance = new LUDecomposition(q).getSolver().getInverse();
    RealVector mean = covariance.operate(b);
    for (int k = 0; k < 3; k++) {
      NormalDistribution truth =
          new NormalDistribution(null, mean.getEntry(k), Math.sqrt(covariance.getEntry(k, k)));
      VariableSummary summary = fit.summary(k);
      assertTrue(
          Math.abs(summary.mean() - truth.getMean()) < 4 * summary.mcseMean(),
          "coefficient " + k + " mean " + summary.mean() + " vs " + truth.getMean() + ", mcse "
              + summary.mcseMean());
      double q975 = truth.inverseCumulativeProbability(0.975);
      assertTrue(
          Math.abs(summary.q975() - q975) < 4 * summary.mcseQ975(),
          "coefficient " + k + " q975 " + summary.q975() + " vs " + q975);
    }
    // With sigma known the block is the whole state, so every sweep is an independent exact draw
    // and the pooled draws of each margin can be tested by KS (level 1e-5: critical D about
    // 2.47 / sqrt(6400) = 0.031; a mean shift of d posterior sd moves D by about 0.4 d, so a
    // shift of 0.1 sd is detected with power near 0.9).
    for (int k = 0; k < 3; k++) {
      NormalDistribution truth =
          new NormalDistribution(null, mean.getEntry(k), Math.sqrt(covariance.getEntry(k, k)));
      double[] pooled = java.util.Arrays.stream(fit.store().draws(k))
          .flatMapToDouble(java.util.Arrays::stream).toArray();
      double p = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(truth, pooled);
      assertTrue(p > 1e-5, "KS p-value of coefficient " + k + ": " + p);
    }
    // b1 and b2 are strongly negatively correlated a posteriori; the joint draw still mixes.
    double correlation = covariance.getEntry(1, 2)
        / Math.sqrt(covariance.getEntry(1, 1) * covariance.getEntry(2, 2));
    assertTrue(correlation < -0.9, "the design should correlate b1 and b2, got " + correlation);
    assertTrue(fit.summary(1).essBulk() > 2000, "bulk ess of b1 " + fit.summary(1).essBulk());
  }
}

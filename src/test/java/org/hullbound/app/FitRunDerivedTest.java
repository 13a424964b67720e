package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.io.DrawsReader;
import org.hullbound.io.DrawsTable;
import org.hullbound.report.UpdateFacts;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A fit keeps its derived quantities with the draws: the values in draws.csv are the let's
 * expression of the unknowns in the same row, and their summary is the posterior's.
 */
class FitRunDerivedTest {
  @TempDir Path folder;

  private FitResult fit(String model, String data, int draws, long seed) throws Exception {
    Path modelFile = folder.resolve("m.hbm");
    Files.writeString(modelFile, model);
    List<Path> dataFiles = List.of();
    if (data != null) {
      Path dataFile = folder.resolve("d.csv");
      Files.writeString(dataFile, data);
      dataFiles = List.of(dataFile);
    }
    FitRequest request =
        new FitRequest(
            new ModelInputs(modelFile, dataFiles), null, 4, 200, draws, null, seed, null,
            folder.resolve("out"), null, false, 0.95);
    try (FitRun run = FitRun.prepare(request)) {
      return run.run(ProgressListener.none(), StopSignal.create());
    }
  }

  @Test
  void aDerivedColumnIsItsExpressionOfTheUnknownsInTheSameRowToTheBit() throws Exception {
    FitResult result =
        fit(
            String.join(
                "\n",
                "index obs",
                "data dose[obs], n[obs]",
                "data dead[obs] ~ binomial(trials = n[obs], logit_p = alpha + beta * dose[obs])",
                "param alpha ~ normal(mean = 0, sd = 10)",
                "param beta ~ normal(mean = 0, sd = 10)",
                "let ld50 = -alpha / beta",
                "let eta[obs] = alpha + beta * dose[obs]",
                ""),
            "dose,n,dead\n-0.86,5,0\n-0.3,5,1\n-0.05,5,3\n0.73,5,5\n",
            500, 11);
    DrawsTable draws = DrawsReader.read(result.drawsFile());
    assertEquals(List.of("alpha", "beta", "ld50"), draws.variables(), "eta is a vector, not kept");
    double[][] alpha = draws.draws("alpha");
    double[][] beta = draws.draws("beta");
    double[][] ld50 = draws.draws("ld50");
    int compared = 0;
    for (int c = 0; c < alpha.length; c++) {
      for (int d = 0; d < alpha[c].length; d++) {
        // One IEEE 754 division of the same two doubles (written with enough digits to read
        // back exactly, Double.toString) gives the same double (common practice).
        assertEquals(-alpha[c][d] / beta[c][d], ld50[c][d], 0.0, "chain " + c + " draw " + d);
        compared++;
      }
    }
    assertEquals(4 * 500, compared);
    UpdateFacts facts = result.summary().orElseThrow().table().updates().get("ld50");
    assertTrue(facts.isDerived(), facts.toString());
  }

  /**
   * Poisson counts with a gamma(2, 1) prior on the rate: the posterior of the rate is gamma(2 + S,
   * 1 + n) (Gelman et al., Bayesian Data Analysis, 3rd ed., 2013, section 2.6), so that of its
   * inverse, the mean waiting time, is inverse-gamma(A, B) with mean B / (A - 1) (ibid., appendix
   * A) and quantiles 1 / (the gamma's upper quantiles) (commons-math3 as the reference for the
   * gamma quantiles). Seed 5, 4 chains of 4000 exact conjugate draws; three checks within 4 MCSE,
   * each a false alarm with probability about 6.3e-5 (normal approximation), 1.9e-4 together.
   */
  @Test
  void theSummaryOfADerivedQuantityIsItsPosteriorsWithinMcse() throws Exception {
    FitResult result =
        fit(
            String.join(
                "\n",
                "index t",
                "data y[t] = [3, 5, 2, 4, 6, 1, 3, 4] ~ poisson(rate = lambda)",
                "param lambda ~ gamma(shape = 2, rate = 1)",
                "let mean_wait = 1 / lambda",
                ""),
            null, 4000, 5);
    double shape = 2 + 28;
    double rate = 1 + 8;
    GammaDistribution lambda = new GammaDistribution(null, shape, 1 / rate);
    double mean = rate / (shape - 1);
    double q025 = 1 / lambda.inverseCumulativeProbability(0.975);
    double q975 = 1 / lambda.inverseCumulativeProbability(0.025);
    VariableSummary wait =
        result.summary().orElseThrow().table().summaries().stream()
            .filter(s -> s.name().equals("mean_wait")).findFirst().orElseThrow();
    assertEquals(4000, wait.drawsPerChain());
    assertTrue(Math.abs(wait.mean() - mean) < 4 * wait.mcseMean(),
        "mean " + wait.mean() + " vs " + mean + ", mcse " + wait.mcseMean());
    assertTrue(Math.abs(wait.q025() - q025) < 4 * wait.mcseQ025(),
        "2.5% quantile " + wait.q025() + " vs " + q025 + ", mcse " + wait.mcseQ025());
    assertTrue(Math.abs(wait.q975() - q975) < 4 * wait.mcseQ975(),
        "97.5% quantile " + wait.q975() + " vs " + q975 + ", mcse " + wait.mcseQ975());
  }
}

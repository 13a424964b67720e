package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code hullbound check} on the two rules of the analysis that a model's text alone does not
 * show: an affine probability cuts its coefficients' support, and a gamma rate {@code a / m} is
 * log-affine in {@code m}; then {@code fit} samples the first from a start the priors' centres
 * alone would not give.
 */
class CheckSupportAndMonomialTest {

  private static final String DOSE =
      "model dose\n"
          + "index obs\n"
          + "data dose[obs], n[obs]\n"
          + "data y[obs] ~ binomial(trials = n[obs], p = alpha + beta * dose[obs])\n"
          + "param alpha ~ normal(mean = 0, sd = 1)\n"
          + "param beta ~ normal(mean = 0, sd = 1)\n";

  private static final String GAMMA_POISSON =
      "model sites\n"
          + "index site = 1 .. 4\n"
          + "data count[site] = [3, 7, 0, 12] ~ poisson(rate = rate[site])\n"
          + "param rate[site] ~ gamma(shape = a, rate = a / m)\n"
          + "param a ~ gamma(shape = 2, rate = 1)\n"
          + "param m ~ lognormal(meanlog = 0, sdlog = 2)\n";

  private static Path write(Path dir, String name, String text) throws IOException {
    Path file = dir.resolve(name);
    Files.writeString(file, text);
    return file;
  }

  @Test
  void anAffineProbabilityIsLogConcaveOnItsCutSupportAndFits(@TempDir Path dir)
      throws IOException {
    Path model = write(dir, "dose.hbm", DOSE);
    Path data = write(dir, "dose.csv", "dose,n,y\n0.1,10,2\n0.3,10,4\n0.5,10,5\n0.8,10,8\n");
    CliRun check = CliRun.of("check", model.toString(), "--data", data.toString());
    assertEquals(0, check.exit(), check.toString());
    assertTrue(check.out().matches("(?s).*alpha +natural +adaptive rejection.*"), check.out());
    assertTrue(check.out().contains("binomial terms concave in p, affine in the unknown; support"
        + " cut to where every binomial p stays in [0, 1], recomputed from the other unknowns at"
        + " every draw"), check.out());
    CliRun fit = CliRun.of("fit", model.toString(), "--data", data.toString(), "--out",
        dir.resolve("out").toString(), "--quiet", "--seed", "7", "--draws", "200", "--burn-in",
        "100", "--chains", "2");
    assertEquals(0, fit.exit(), fit.toString());
    assertTrue(fit.out().matches("(?s).*alpha .*adaptive rejection.*"), fit.out());
  }

  @Test
  void theGammaPoissonMeanIsLogConcaveOnTheLogScaleWithTheRuleNamed(@TempDir Path dir)
      throws IOException {
    CliRun check = CliRun.of("check", write(dir, "sites.hbm", GAMMA_POISSON).toString());
    assertEquals(0, check.exit(), check.toString());
    assertTrue(check.out().matches("(?s).*\\n  m +log +adaptive rejection.*"), check.out());
    assertTrue(check.out().contains("log-concave on the log scale: lognormal prior"), check.out());
    assertTrue(check.out().contains("gamma terms concave in log(rate) (gamma log-density is"
        + " concave in u = log(rate): shape u - x exp(u), second derivative -x exp(u) <= 0); rate"
        + " = c / unknown with c free of the unknown (a valid rate forces c > 0), so log(rate) ="
        + " log(c) - log(unknown) is affine on the log scale"), check.out());
    // a is in both arguments of the gamma terms: not claimed.
    assertTrue(check.out().matches("(?s).*\\n  a +log +fallback.*"), check.out());
    assertTrue(check.out().contains("the unknown enters both shape and rate of gamma term"),
        check.out());
  }
}

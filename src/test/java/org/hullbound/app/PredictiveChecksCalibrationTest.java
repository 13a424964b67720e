package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.StringJoiner;
import java.util.random.RandomGenerator;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.hullbound.gibbs.ReplicatedStatistics;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.lang.Parser;
import org.hullbound.model.BoundModel;
import org.hullbound.model.TestQuantities;
import org.hullbound.report.PredictiveChecks;
import org.junit.jupiter.api.Test;

/**
 * Posterior predictive p-values end to end (fit, replicate each kept sweep, mid-p share): they
 * behave as the theory says on data simulated from the model, and flag data from a clearly wrong
 * one.
 */
class PredictiveChecksCalibrationTest {
  private static final int DATA_SETS = 200;
  private static final int OBSERVATIONS = 10;
  private static final int DRAWS = 1000;

  /** Fits {@code text} in memory and returns the p-values of its test quantities. */
  private static PredictiveChecks checks(String text, long seed) {
    BoundModel model = BoundModel.bind(Parser.parse("m.hbm", text), List.of());
    RunSettings settings = RunSettings.of(1, 20, DRAWS, 1, seed);
    InMemoryFit fit = InMemoryFit.of(model, settings);
    ReplicatedStatistics replicates =
        ReplicatedStatistics.of(TestQuantities.of(model), 1, seed, DRAWS, null);
    int unknowns = fit.unknownCount();
    double[][][] draws = new double[unknowns][][];
    for (int k = 0; k < unknowns; k++) {
      draws[k] = fit.draws(k);
    }
    double[] state = new double[unknowns];
    for (int d = 0; d < DRAWS; d++) {
      for (int k = 0; k < unknowns; k++) {
        state[k] = draws[k][0][d];
      }
      replicates.accept(0, d + 1, state);
    }
    return FitRun.predictiveChecks(replicates);
  }

  /**
   * 200 data sets of 10 observations simulated from the model itself (mu ~ normal(0, 1), y ~
   * normal(mu, 1)), each fitted with 1000 exact conjugate draws.
   *
   * <p>The sample sd of replicated data does not depend on mu when the sd is known, so its
   * p-value is exactly uniform, and the count of 1000 replicates above the observed value is
   * uniform on 0 .. 1000 (a binomial count with a uniform success probability, Bayes 1763): the
   * share of p-values below 0.1 (counts 0 .. 99) is 100/1001, and so is the share above 0.9. Each
   * of the two counts among 200 independent data sets is binomial(200, 100/1001), checked two-sided
   * at level 1e-5 each with commons-math3; replicates drawn 1.5 times too wide put nearly every sd
   * p-value near 1, a count of about 0 below 0.1, rejected with power near 1 (seen on purpose).
   *
   * <p>The mean's p-value is not uniform: it gathers at 1/2, and P(p <= a) <= 2a for every a
   * (Meng 1994, "Posterior predictive p-values", Annals of Statistics 22, 1142-1160, section 5).
   * Its count below 0.1 is checked against binomial(200, 0.2), one-sided at level 1e-5. Three
   * checks: a family-wise false-alarm rate of at most 3e-5.
   */
  @Test
  void onDataFromTheModelTheSdPValueIsUniformAndTheMeanPValueNoMoreExtremeThanMengsBound() {
    RandomGenerator rng = RandomGenerator.of("L64X128MixRandom");
    int sdBelow = 0;
    int sdAbove = 0;
    int meanBelow = 0;
    for (int set = 0; set < DATA_SETS; set++) {
      double mu = rng.nextGaussian();
      StringJoiner values = new StringJoiner(", ", "[", "]");
      for (int i = 0; i < OBSERVATIONS; i++) {
        values.add(Double.toString(mu + rng.nextGaussian()));
      }
      PredictiveChecks checks = checks(
          "param mu ~ normal(mean = 0, sd = 1)\nindex obs\n"
              + "data y[obs] = " + values + " ~ normal(mean = mu, sd = 1)\n", 1000 + set);
      PredictiveChecks.Row mean = checks.rows().get(0);
      PredictiveChecks.Row sd = checks.rows().get(1);
      assertEquals("mean", mean.quantity());
      assertEquals("sd", sd.quantity());
      sdBelow += sd.pValue() < 0.1 ? 1 : 0;
      sdAbove += sd.pValue() > 0.9 ? 1 : 0;
      meanBelow += mean.pValue() < 0.1 ? 1 : 0;
    }
    BinomialDistribution uniform = new BinomialDistribution(null, DATA_SETS, 100.0 / 1001);
    assertTrue(twoSidedP(uniform, sdBelow) > 1e-5, "sd p-values below 0.1: " + sdBelow);
    assertTrue(twoSidedP(uniform, sdAbove) > 1e-5, "sd p-values above 0.9: " + sdAbove);
    BinomialDistribution meng = new BinomialDistribution(null, DATA_SETS, 0.2);
    assertTrue(1 - meng.cumulativeProbability(meanBelow - 1) > 1e-5,
        "mean p-values below 0.1: " + meanBelow);
  }

  /** Twice the smaller tail probability of {@code count}, at most 1 (common practice). */
  private static double twoSidedP(BinomialDistribution null_, int count) {
    double lower = null_.cumulativeProbability(count);
    double upper = 1 - null_.cumulativeProbability(count - 1);
    return Math.min(1, 2 * Math.min(lower, upper));
  }

  /**
   * Counts with many more zeros than a Poisson gives: 36 zeros among 60, the other 24 from a
   * Poisson of rate 4 (a fixed seed). A Poisson fit puts the rate near 1.6, where a replicate's
   * share of zeros is about exp(-1.6) = 0.2 with an sd about 0.05, so the observed 0.6 lies about
   * eight sds above every replicate: the p-value is 0 but for one chance in far more than a
   * thousand runs, and the check must flag it below 0.01 in plain words.
   */
  @Test
  void countsWithManyMoreZerosThanAPoissonGivesAreFlaggedByTheZerosCheck() {
    RandomGenerator rng = RandomGenerator.of("L64X128MixRandom");
    StringJoiner values = new StringJoiner(", ", "[", "]");
    for (int i = 0; i < 60; i++) {
      int count = 0;
      if (i >= 36) {
        // Poisson(4) by sequential inversion (Devroye 1986, X.3.3).
        double u = rng.nextDouble();
        double p = Math.exp(-4);
        double cumulative = p;
        while (u > cumulative) {
          count++;
          p *= 4.0 / count;
          cumulative += p;
        }
      }
      values.add(Integer.toString(count));
    }
    PredictiveChecks checks = checks(
        "param rate ~ gamma(shape = 1, rate = 0.1)\nindex obs\n"
            + "data k[obs] = " + values + " ~ poisson(rate = rate)\n", 9);
    PredictiveChecks.Row zeros = checks.rows().get(4);
    assertEquals("zero_share", zeros.quantity());
    assertTrue(zeros.pValue() < 0.01, "p-value " + zeros.pValue());
    assertEquals("high", zeros.flag());
    assertTrue(checks.flags().contains(zeros.words()), checks.text());
    assertTrue(zeros.words().startsWith("the model rarely reproduces the zero share of k"),
        zeros.words());
  }
}

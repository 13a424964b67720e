package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PascalDistribution;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.hullbound.lang.Parser;
import org.hullbound.model.BoundModel;
import org.hullbound.model.TestQuantities;
import org.junit.jupiter.api.Test;

/**
 * Replicated data drawn each kept sweep: exact against a closed-form posterior predictive, and
 * reproducible from the seed whatever the threads.
 */
class ReplicatedStatisticsTest {
  /** Normal data with known sd 1.5 and a normal(0, 2) prior on the mean: a conjugate pair. */
  private static final String MODEL = """
      param mu ~ normal(mean = 0, sd = 2)
      index obs
      data y[obs] = [1.2, 0.4, 2.9, 1.7, 0.8] ~ normal(mean = mu, sd = 1.5)
      """;

  private static BoundModel model() {
    return BoundModel.bind(Parser.parse("normal.hbm", MODEL), List.of());
  }

  private static ReplicatedStatistics run(
      BoundModel model, RunSettings settings, DrawSink replicates) {
    ReplicatedStatistics statistics =
        ReplicatedStatistics.of(
            TestQuantities.of(model), settings.chains(), settings.seed(), settings.draws(),
            replicates);
    GibbsSampler sampler = ModelSampler.of(model, Map.of()).sampler();
    ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
        .run(sampler.withAdaptation(settings.burnIn()), statistics);
    return statistics;
  }

  /**
   * The replicate of y[1] follows the posterior predictive normal(m, s^2 + 1.5^2), where the
   * posterior of mu is normal(m, s^2) with precision 1/2^2 + 5/1.5^2 and m = s^2 sum(y) / 1.5^2
   * (Gelman, Carlin, Stern, Dunson, Vehtari and Rubin 2013, Bayesian Data Analysis, 3rd ed.,
   * sections 2.5 and 3.2 with known variance). The conjugate update draws mu afresh each sweep, so
   * the 32000 replicates are independent. KS against commons-math3 at level 1e-5; a replicate drawn
   * at a fixed mu, with the likelihood's sd alone (s^2 left out, 8% too narrow), is rejected with
   * power near 1.
   */
  @Test
  void theReplicateOfAnObservationFollowsTheClosedFormPosteriorPredictive() {
    BoundModel model = model();
    RunSettings settings = RunSettings.of(4, 10, 8000, 1, 11);
    double[][] first = new double[4][8000];
    run(model, settings, (chain, draw, values) -> first[chain][draw - 1] = values[0]);
    double precision = 1 / 4.0 + 5 / 2.25;
    double variance = 1 / precision;
    double mean = variance * (1.2 + 0.4 + 2.9 + 1.7 + 0.8) / 2.25;
    NormalDistribution predictive = new NormalDistribution(null, mean, Math.sqrt(variance + 2.25));
    double[] pooled = new double[32_000];
    for (int c = 0; c < 4; c++) {
      System.arraycopy(first[c], 0, pooled, 8000 * c, 8000);
    }
    double p = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(predictive, pooled);
    assertTrue(p > 1e-5, "KS p-value " + p);
  }

  /**
   * Counts: rate ~ gamma(shape 3, rate 1) and counts 2, 0, 4, 1 ~ poisson(rate) give the posterior
   * gamma(shape 10, rate 5), whose posterior predictive of one count is negative binomial with size
   * 10 and success probability 5/6 (Gelman et al. 2013, Bayesian Data Analysis, 3rd ed., section
   * 2.6), commons-math3's Pascal(10, 5/6). Chi-square of 32000 replicates of the first count over
   * the values 0 .. 7 and 8 or more (expected counts above 30 each), level 1e-5; a replicate drawn
   * at the posterior mean rate 2 (a Poisson, sd 1.41 against the predictive's 1.55) is rejected
   * with power near 1.
   */
  @Test
  void theReplicateOfACountFollowsTheNegativeBinomialPosteriorPredictive() {
    BoundModel model = BoundModel.bind(Parser.parse("counts.hbm", """
        param rate ~ gamma(shape = 3, rate = 1)
        index obs
        data k[obs] = [2, 0, 4, 1] ~ poisson(rate = rate)
        """), List.of());
    long[] observed = new long[9];
    run(model, RunSettings.of(4, 10, 8000, 1, 12), (chain, draw, values) -> {
      synchronized (observed) {
        observed[(int) Math.min(8, values[0])]++;
      }
    });
    PascalDistribution predictive = new PascalDistribution(null, 10, 5.0 / 6);
    double[] expected = new double[9];
    for (int k = 0; k < 8; k++) {
      expected[k] = 32_000 * predictive.probability(k);
    }
    expected[8] = 32_000 * (1 - predictive.cumulativeProbability(7));
    double p = new ChiSquareTest().chiSquareTest(expected, observed);
    assertTrue(p > 1e-5, "chi-square p-value " + p);
  }

  @Test
  void theSameSeedGivesTheSameReplicatesWithOneThreadAndWithFour() {
    BoundModel model = model();
    RunSettings settings = RunSettings.of(4, 10, 50, 1, 5);
    ReplicatedStatistics four = run(model, settings.withThreads(4), null);
    ReplicatedStatistics one = run(model, settings.withThreads(1), null);
    for (int q = 0; q < four.quantities().size(); q++) {
      for (int c = 0; c < 4; c++) {
        assertArrayEquals(four.replicated(q)[c], one.replicated(q)[c]);
        assertArrayEquals(four.observed(q)[c], one.observed(q)[c]);
      }
    }
    assertEquals(50, four.replicated(0)[3].length);
  }
}

package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class MonteCarloStandardErrorTest {
  private static final int CHAINS = 4;
  private static final int N = 10_000;
  private static final double S = CHAINS * N;

  @Test
  void meanErrorOfIidDrawsIsSdOverRootS() {
    // iid: ess_mean ~ S, so the error is sigma / sqrt(S) (textbook); ESS noise ~1.4% at S = 40000.
    Draws draws = Draws.of(SimulatedChains.normal(12, CHAINS, N, 10, 2));
    assertEquals(2 / Math.sqrt(S), MonteCarloStandardError.mean(draws), 0.05 * 2 / Math.sqrt(S));
  }

  @Test
  void meanErrorOfAr1DrawsGrowsWithTheAutocorrelationTime() {
    // AR(1), rho = 0.8: stationary sd 1/sqrt(1 - rho^2), tau = 9, error sd sqrt(tau / S).
    // ESS relative sd at S = 40000 and rho = 0.8 is about 5%; 15% is 3 sd.
    double rho = 0.8;
    Draws draws = Draws.of(SimulatedChains.ar1(13, CHAINS, N, rho));
    double expected = Math.sqrt((1 + rho) / (1 - rho) / S) / Math.sqrt(1 - rho * rho);
    assertEquals(1, MonteCarloStandardError.mean(draws) / expected, 0.15);
  }

  @Test
  void quantileErrorsOfIidNormalDrawsMatchTheAsymptoticFormula() {
    // The sample p-quantile of S iid draws has sd sqrt(p (1 - p) / S) / f(q_p) (asymptotic
    // normality of sample quantiles; e.g. Serfling 1980, section 2.3). For N(0, 1):
    // f(0) = 0.398942 and f(1.959964) = 0.058441. Averaged over 5 seeds; while writing this test
    // 20 seeds gave one-run relative sd 5.6% (median) and 9.7% (97.5%), so the mean of 5 has sd
    // 2.5% and 4.3%; tolerances 10% and 17% are 4 sd.
    double median = 0;
    double upper = 0;
    int seeds = 5;
    for (long seed = 1; seed <= seeds; seed++) {
      Draws draws = Draws.of(SimulatedChains.normal(100 + seed, CHAINS, N, 0, 1));
      median += MonteCarloStandardError.quantile(draws, 0.5) / seeds;
      upper += MonteCarloStandardError.quantile(draws, 0.975) / seeds;
    }
    double medianTheory = Math.sqrt(0.25 / S) / 0.3989422804014327;
    double upperTheory = Math.sqrt(0.975 * 0.025 / S) / 0.05844094433345147;
    assertEquals(1, median / medianTheory, 0.10);
    assertEquals(1, upper / upperTheory, 0.17);
  }

  @Test
  void undefinedForConstantDraws() {
    double[][] constant = {{1, 1, 1, 1}, {1, 1, 1, 1}};
    assertTrue(Double.isNaN(MonteCarloStandardError.mean(Draws.of(constant))));
    assertTrue(Double.isNaN(MonteCarloStandardError.quantile(Draws.of(constant), 0.5)));
  }
}

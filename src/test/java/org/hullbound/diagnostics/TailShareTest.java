package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * The share of draws beyond a value and its MCSE (issue 10, probability statements), against
 * outside references: the exact normal tail (commons-math3 {@link NormalDistribution}) and, for
 * independent draws, the binomial standard error {@code sqrt(p (1 - p) / S)} (common practice).
 */
class TailShareTest {

  /** 4 chains of 2500 independent standard normal draws, L64X128MixRandom seed {@code seed}. */
  private static Draws independentNormals(long seed) {
    RandomGenerator rng = RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
    double[][] draws = new double[4][2500];
    for (double[] chain : draws) {
      for (int i = 0; i < chain.length; i++) {
        chain[i] = rng.nextGaussian();
      }
    }
    return Draws.of(draws);
  }

  /**
   * Seed 11, 10000 draws: the estimate of P(X > 0.5) = 0.3085 lies within 4 MCSE of the exact
   * value (level about 6.3e-5 under the normal approximation, in the budget of DEVELOPERS.md), and
   * below -1 the same; the MCSE is the binomial standard error to 10% (the ESS of independent
   * indicator draws is S up to its estimation noise, a few percent at S = 10000).
   */
  @Test
  void independentNormalDrawsGiveTheExactTailWithinFourMcseAndTheBinomialError() {
    Draws draws = independentNormals(11);
    NormalDistribution normal = new NormalDistribution(null, 0, 1);
    TailShare above = TailShare.of(draws, 0.5, true);
    double exactAbove = 1 - normal.cumulativeProbability(0.5);
    assertTrue(Math.abs(above.estimate() - exactAbove) < 4 * above.mcse(),
        above + " vs " + exactAbove);
    double binomial = Math.sqrt(exactAbove * (1 - exactAbove) / 10_000);
    assertEquals(binomial, above.mcse(), 0.1 * binomial, above.toString());
    TailShare below = TailShare.of(draws, -1, false);
    double exactBelow = normal.cumulativeProbability(-1);
    assertTrue(Math.abs(below.estimate() - exactBelow) < 4 * below.mcse(),
        below + " vs " + exactBelow);
  }

  /**
   * Correlated draws (an AR(1) chain with coefficient 0.9, seed 5): the indicator's ESS is far
   * below S, and the MCSE is larger than the binomial error by the factor sqrt(S / ESS).
   */
  @Test
  void correlatedDrawsGetALargerErrorThanIndependentOnes() {
    RandomGenerator rng = RandomGeneratorFactory.of("L64X128MixRandom").create(5);
    double[][] chains = new double[4][2500];
    for (double[] chain : chains) {
      double x = rng.nextGaussian();
      for (int i = 0; i < chain.length; i++) {
        x = 0.9 * x + Math.sqrt(1 - 0.81) * rng.nextGaussian();
        chain[i] = x;
      }
    }
    TailShare share = TailShare.of(Draws.of(chains), 0, true);
    double binomial = Math.sqrt(share.estimate() * (1 - share.estimate()) / 10_000);
    assertTrue(share.ess() < 0.3 * 10_000, share.toString());
    assertEquals(binomial * Math.sqrt(10_000 / share.ess()), share.mcse(), 0.1 * share.mcse(),
        share.toString());
  }

  @Test
  void everyDrawOnOneSideGivesTheShareWithoutAnError() {
    Draws draws = independentNormals(3);
    TailShare share = TailShare.of(draws, 100, false);
    assertEquals(1.0, share.estimate());
    assertTrue(Double.isNaN(share.mcse()));
    assertEquals(0.0, TailShare.of(draws, 100, true).estimate());
  }
}

package org.hullbound.anchor;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.random.RandomGenerator;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.RealDistribution;
import org.apache.commons.math3.distribution.UniformRealDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.MonteCarloStandardError;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.gibbs.ChainSeeds;
import org.hullbound.model.BoundModel;
import org.junit.jupiter.api.Test;

/**
 * The No-U-Turn anchor draws from a bivariate normal with correlation 0.95, written in the model
 * language and sampled through the compiled model ({@link ModelTarget}): x ~ N(0, 1) and y given x
 * ~ N(2.85 x, 3 sqrt(1 - 0.95^2)), so that (x, y) is normal with sds 1 and 3 and correlation 0.95
 * (closed form: the product of a normal and a normal linear regression on it), the unequal sds
 * giving the mass matrix something to learn. A third, independent unknown s ~ half-normal(sd = 2)
 * is sampled on the log scale, so the draws of s are right only with the log-Jacobian.
 *
 * <p>Checks, each at level 1e-5 (4e-5 together, DEVELOPERS.md's table): KS of x against
 * commons-math3's N(0, 1), of y against N(0, 3) and of s against the half-normal CDF 2 Phi(s / 2) -
 * 1 (Phi from commons-math3), on every 10th of 40,000 kept iterations after checking that the
 * thinned draws are nearly independent (bulk-ESS at least 0.8 of their number), which the KS test
 * assumes; and the correlation: the mean of x y / 3 over all kept iterations within 4.42 MCSE of
 * 0.95 (two-sided normal level 1e-5). Power: the critical KS distance at 1e-5 for 4000 draws is
 * 2.47 / sqrt(4000) = 0.039, so a shift of 0.12 sd in a margin is caught with probability about
 * 0.99 (GoodnessOfFit's argument). Seed 20261202, warm-up 1000.
 *
 * <p>Broken on purpose, it failed both times, at the first check: with the leapfrog's second
 * momentum half-step of the wrong sign the thinned draws of x had a bulk-ESS of 32 of 4000 (the
 * chain barely moved); with the log-Jacobian left out of {@link ModelTarget}'s value, 27 of 4000
 * (without it, s's density on the log scale tends to a constant as s goes to 0: an improper
 * target, whose effect on the whole chain this check saw first).
 */
class CorrelatedNormalTest {
  static final String MODEL = """
      model correlated
      param x ~ normal(mean = 0, sd = 1)
      param y ~ normal(mean = 2.85 * x, sd = 3 * sqrt(0.0975))
      param s ~ half-normal(sd = 2)
      """;
  private static final int KEPT = 40_000;
  private static final int THIN = 10;
  private static final double LEVEL = 1e-5;
  private static final double Z = 4.42;

  @Test
  void drawsTheCorrelatedNormalAndTheHalfNormal() {
    BoundModel model = AnchorModels.withoutData("correlated", MODEL);
    RandomGenerator rng = ChainSeeds.split(20261202L, 1)[0];
    // depth at most 6 (64 steps; this target needs about 2 or 3 doublings): a broken integrator
    // then fails in bounded time instead of running 1024 steps an iteration
    AnchorKernel kernel =
        AnchorKernel.of(model, null, new NoUTurnSampler.Settings(1000, 0.8, 6));
    for (int i = 0; i < 1000; i++) {
      kernel.sweep(rng);
    }
    double[][] draws = new double[3][KEPT];
    double[] row = new double[3];
    for (int i = 0; i < KEPT; i++) {
      kernel.sweep(rng);
      kernel.record(row);
      for (int k = 0; k < 3; k++) {
        draws[k][i] = row[k];
      }
    }
    assertEquals(0, kernel.statistics().divergences(), "divergent iterations on a normal");

    NormalDistribution standard = new NormalDistribution(0, 1);
    NormalDistribution wide = new NormalDistribution(0, 3);
    NormalDistribution halfNormalParent = new NormalDistribution(0, 2);
    assertKs("x", thinned(draws[0]), standard);
    assertKs("y", thinned(draws[1]), wide);
    // s through its own CDF 2 Phi(s / 2) - 1 (probability integral transform) is uniform on (0, 1)
    double[] uniform = Arrays.stream(thinned(draws[2]))
        .map(v -> 2 * halfNormalParent.cumulativeProbability(v) - 1).toArray();
    assertKs("s", uniform, new UniformRealDistribution(0, 1));

    double[] products = new double[KEPT];
    for (int i = 0; i < KEPT; i++) {
      products[i] = draws[0][i] * draws[1][i] / 3;
    }
    double correlation = Arrays.stream(products).average().orElseThrow();
    double mcse = MonteCarloStandardError.mean(Draws.of(new double[][] {products}));
    assertTrue(Math.abs(correlation - 0.95) < Z * mcse,
        "correlation " + correlation + " vs 0.95, mcse " + mcse);
  }

  private static double[] thinned(double[] draws) {
    double[] kept = new double[draws.length / THIN];
    for (int i = 0; i < kept.length; i++) {
      kept[i] = draws[i * THIN];
    }
    return kept;
  }

  private static void assertKs(String name, double[] sample, RealDistribution reference) {
    double ess = PosteriorSummary.of(name, new double[][] {sample}).essBulk();
    assertTrue(ess >= 0.8 * sample.length,
        name + ": thinned draws not nearly independent, bulk-ESS " + ess + " of " + sample.length);
    double p = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(reference, sample);
    assertTrue(p > LEVEL, name + ": KS p-value " + p);
  }
}

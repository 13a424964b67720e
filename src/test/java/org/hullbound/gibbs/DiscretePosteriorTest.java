package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import java.util.function.IntToDoubleFunction;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PascalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.Update;
import org.junit.jupiter.api.Test;

/**
 * Discrete params drawn exactly, through the whole path (parser, binding, the discrete analysis,
 * {@link DiscreteUpdater}, the chain runner): each model has one unknown, so its Gibbs draws are
 * independent exact draws, and a chi-square test against the closed-form or enumerated posterior
 * applies. Three tests, each at level 1e-5 with a fixed seed and 4 x 10000 draws (family-wise
 * 3e-5); power against a sampler that moves 5% of the modal cell's mass to a neighbour: a
 * noncentrality of about 4e4 * (0.05 p)^2 (1/p + 1/p') &gt; 100 for a modal mass p &gt; 0.1,
 * against a critical value near 50 (normal approximation of the noncentral chi-square, common
 * practice), so above 0.999.
 */
class DiscretePosteriorTest {
  private static final double LEVEL = 1e-5;
  private static final RunSettings SETTINGS = new RunSettings(4, 50, 10_000, 1, 97L, 2);

  private static BoundModel model(String text) {
    return BoundModel.bind(Parser.parse(SourceText.of("test.hbm", text)), List.of());
  }

  private static Fits.Fit fit(BoundModel model) {
    return Fits.run(ModelSampler.of(model, Map.of()).sampler(), SETTINGS);
  }

  /** All draws of unknown 0, whole numbers. */
  private static int[] draws(Fits.Fit fit) {
    double[][] chains = fit.store().draws(0);
    int[] out = new int[chains.length * chains[0].length];
    int i = 0;
    for (double[] chain : chains) {
      for (double v : chain) {
        assertEquals(Math.rint(v), v, "a whole number");
        out[i++] = (int) v;
      }
    }
    return out;
  }

  /** Chi-square p-value over values lo .. hi, the rest pooled into the end cells. */
  private static double pValue(int[] draws, IntToDoubleFunction mass, int lo, int hi) {
    double[] expected = new double[hi - lo + 1];
    double[] observed = new double[hi - lo + 1];
    double inside = 0;
    for (int k = lo; k <= hi; k++) {
      expected[k - lo] = mass.applyAsDouble(k) * draws.length;
      inside += mass.applyAsDouble(k);
    }
    expected[hi - lo] += (1 - inside) * draws.length;
    for (int d : draws) {
      observed[Math.max(0, Math.min(hi - lo, d - lo))]++;
    }
    double statistic = 0;
    int cells = 0;
    double e = 0;
    double o = 0;
    for (int c = 0; c < expected.length; c++) {
      e += expected[c];
      o += observed[c];
      if (e >= 5 || c == expected.length - 1) {
        statistic += (o - e) * (o - e) / e;
        cells++;
        e = 0;
        o = 0;
      }
    }
    return 1 - new ChiSquaredDistribution(cells - 1).cumulativeProbability(statistic);
  }

  /**
   * Poisson-binomial thinning (Kingman, Poisson Processes, 1993, the thinning theorem): eggs laid
   * n ~ poisson(12), hatched y = 5 ~ binomial(n, 0.4), so n - 5 given y is poisson(12 x 0.6 =
   * 7.2). The count's support is unbounded: the integer hull draws it.
   */
  @Test
  void aThinnedPoissonCountFollowsItsClosedForm() {
    BoundModel model = model("""
        param laid ~ poisson(rate = 12)
        data hatched = 5 ~ binomial(trials = laid, p = 0.4)
        """);
    assertTrue(model.update(0) instanceof Update.Discrete d && !d.finite() && d.logConcave());
    Fits.Fit fit = fit(model);
    assertEquals("integer hull", fit.reports().get(0).method());
    PoissonDistribution reference = new PoissonDistribution(7.2); // commons-math3
    assertTrue(pValue(draws(fit), k -> k < 5 ? 0 : reference.probability(k - 5), 5, 30) > LEVEL);
  }

  /**
   * A negative-binomial latent count read by a Poisson rate affine in it: n ~
   * negative-binomial(mean = 10, size = 2), y = 3 ~ poisson(rate = 0.5 n). The reference is the
   * product of commons-math3's Pascal (failures before the 2nd success, p = size/(size + mean) =
   * 1/6) and Poisson masses, normalised over 1 .. 400 (n = 0 gives rate 0, mass 0 for y = 3).
   */
  @Test
  void aNegativeBinomialCountWithAPoissonReadingMatchesEnumeration() {
    BoundModel model = model("""
        param n ~ negative-binomial(mean = 10, size = 2)
        data y = 3 ~ poisson(rate = 0.5 * n)
        """);
    assertTrue(model.update(0) instanceof Update.Discrete d && d.logConcave());
    PascalDistribution prior = new PascalDistribution(2, 1.0 / 6);
    double[] mass = new double[401];
    double total = 0;
    for (int n = 1; n <= 400; n++) {
      mass[n] = prior.probability(n) * new PoissonDistribution(0.5 * n).probability(3);
      total += mass[n];
    }
    double normaliser = total;
    assertTrue(pValue(draws(fit(model)), k -> k <= 400 ? mass[k] / normaliser : 0, 0, 60)
        > LEVEL);
  }

  /**
   * A categorical param over 1 .. 5 with weights w and one normal reading of it: the posterior
   * of z is w[z] N(2.3; z, 1) normalised (the normal density from commons-math3); the support is
   * finite, so the conditional is enumerated.
   */
  @Test
  void aCategoricalParamIsEnumerated() {
    BoundModel model = model("""
        index k = 1 .. 5
        data w[k] = [0.1, 0.2, 0.3, 0.25, 0.15]
        param z ~ categorical(p = w)
        data y = 2.3 ~ normal(mean = z, sd = 1)
        """);
    assertTrue(model.update(0) instanceof Update.Discrete d && d.finite());
    double[] w = {0.1, 0.2, 0.3, 0.25, 0.15};
    NormalDistribution standard = new NormalDistribution(null, 0, 1);
    double total = 0;
    for (int z = 1; z <= 5; z++) {
      total += w[z - 1] * standard.density(2.3 - z);
    }
    double normaliser = total;
    Fits.Fit fit = fit(model);
    assertEquals("enumeration", fit.reports().get(0).method());
    assertTrue(pValue(draws(fit), z -> w[z - 1] * standard.density(2.3 - z) / normaliser, 1, 5)
        > LEVEL);
  }

  /** A count whose conditional no rule shows log-concave is refused, with the way out. */
  @Test
  void aCountThatCannotBeDrawnExactlyIsRefusedAtItsDeclaration() {
    ModelException e = assertThrows(ModelException.class, () -> model("""
        param n ~ poisson(rate = 4)
        data y = 2 ~ normal(mean = n ^ 2, sd = 1)
        """));
    assertTrue(e.problem().contains("'n' has an unbounded support"), e.problem());
    assertTrue(e.hint().contains("within 0 .. N"), e.hint());
    assertEquals(1, e.position().line());
    BoundModel bounded = model("""
        param n ~ poisson(rate = 4) within 0 .. 200
        data y = 2 ~ normal(mean = n ^ 2, sd = 1)
        """);
    assertTrue(bounded.update(0) instanceof Update.Discrete d && d.finite() && !d.logConcave());
  }

  /** Whole-number params start at whole numbers inside their support. */
  @Test
  void discreteParamsStartAtWholeNumbersInsideTheirSupport() {
    BoundModel model = model("""
        index k = 1 .. 3
        data w[k] = [1, 2, 3]
        param year ~ whole-uniform(lower = 1971, upper = 2020)
        param z ~ categorical(p = w)
        param flag ~ bernoulli(p = 0.3)
        param n ~ poisson(rate = 2.5)
        """);
    double[] start = model.initialState();
    double[][] supports = {{1971, 2020}, {1, 3}, {0, 1}, {0, Double.POSITIVE_INFINITY}};
    for (int i = 0; i < start.length; i++) {
      assertEquals(Math.rint(start[i]), start[i], "unknown " + i);
      assertTrue(start[i] >= supports[i][0] && start[i] <= supports[i][1], "unknown " + i);
    }
  }
}

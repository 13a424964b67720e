package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Set;
import org.apache.commons.math3.distribution.EnumeratedIntegerDistribution;
import org.apache.commons.math3.distribution.UniformIntegerDistribution;
import org.apache.commons.math3.special.Gamma;
import org.junit.jupiter.api.Test;

/**
 * The two families that exist for discrete params, {@code whole-uniform} and {@code categorical},
 * against commons-math3 3.6.1 ({@code UniformIntegerDistribution}, {@code
 * EnumeratedIntegerDistribution}, which normalises its weights), and the facts of concavity in a
 * whole value that the discrete analysis relies on, checked by second differences.
 */
class DiscreteFamiliesTest {
  private static final Parametrisation WHOLE_UNIFORM =
      Families.lookup("whole-uniform").orElseThrow().match(Set.of("lower", "upper")).orElseThrow();
  private static final Parametrisation CATEGORICAL = Categorical.withCategories(
      Families.lookup("categorical").orElseThrow().match(Set.of("p")).orElseThrow(), 4);

  @Test
  void wholeUniformMatchesCommonsMath() {
    double[] args = {-3, 12};
    UniformIntegerDistribution reference = new UniformIntegerDistribution(-3, 12);
    for (int x = -5; x <= 14; x++) {
      assertEquals(reference.logProbability(x), WHOLE_UNIFORM.logDensity(x, args), 1e-12,
          "x = " + x);
    }
    assertEquals(Double.NEGATIVE_INFINITY, WHOLE_UNIFORM.logDensity(2.5, args));
    double[] gradient = new double[2];
    double logP = WHOLE_UNIFORM.logProbabilityBetween(-10, 0.5, args, gradient);
    assertEquals(Math.log(reference.cumulativeProbability(0)), logP, 1e-12);
    assertNotNull(WHOLE_UNIFORM.checkArguments(new double[] {4, 3}));
    assertNull(WHOLE_UNIFORM.checkArguments(new double[] {4, 4}));
    assertNotNull(WHOLE_UNIFORM.checkArgument(0, 1.5));
  }

  @Test
  void categoricalMatchesCommonsMathWithNormalisedWeights() {
    double[] weights = {2, 0, 5, 3};
    EnumeratedIntegerDistribution reference =
        new EnumeratedIntegerDistribution(new int[] {1, 2, 3, 4}, weights);
    for (int x = 1; x <= 4; x++) {
      assertEquals(reference.logProbability(x), CATEGORICAL.logDensity(x, weights), 1e-12,
          "x = " + x);
    }
    assertEquals(Double.NEGATIVE_INFINITY, CATEGORICAL.logDensity(0, weights));
    assertEquals(Double.NEGATIVE_INFINITY, CATEGORICAL.logDensity(5, weights));
    double[] gradient = new double[4];
    double logP = CATEGORICAL.logProbabilityBetween(2, 3, weights, gradient);
    assertEquals(Math.log(reference.cumulativeProbability(3) - reference.cumulativeProbability(1)),
        logP, 1e-12);
    assertEquals(SupportKind.CATEGORY, CATEGORICAL.support());
    assertEquals("p[3]", CATEGORICAL.argumentNames().get(2));
    assertNotNull(CATEGORICAL.checkArguments(new double[] {0, 0, 0, 0}));
  }

  /** d/dw_i of log w_j - log sum w against central differences. */
  @Test
  void categoricalGradientMatchesDifferences() {
    double[] w = {0.7, 1.3, 2.2, 0.4};
    double[] gradient = new double[5];
    CATEGORICAL.logDensity(3, w, gradient);
    for (int i = 0; i < 4; i++) {
      double h = 1e-6;
      double[] up = w.clone();
      double[] down = w.clone();
      up[i] += h;
      down[i] -= h;
      double numeric = (CATEGORICAL.logDensity(3, up) - CATEGORICAL.logDensity(3, down)) / (2 * h);
      assertEquals(numeric, gradient[1 + i], 1e-7, "d/dw" + (i + 1));
    }
  }

  /**
   * The categorical's stated concavity in log(weight): the second difference in u = log w_k of
   * the log mass at every category is <= 0, for the own category and the others.
   */
  @Test
  void categoricalIsConcaveInLogWeights() {
    assertTrue(CATEGORICAL.curvatureInArgument(0, Scale.LOG, new double[4]).concave());
    assertFalse(CATEGORICAL.curvatureInArgument(0, Scale.NATURAL, new double[4]).concave());
    double[] w = {0.7, 1.3, 2.2, 0.4};
    for (int x = 1; x <= 4; x++) {
      for (double u = -6; u <= 6; u += 0.5) {
        double h = 1e-3;
        double second = (at(x, w, u + h) - 2 * at(x, w, u) + at(x, w, u - h)) / (h * h);
        assertTrue(second <= 1e-6, "x = " + x + ", u = " + u + ": " + second);
      }
    }
  }

  private static double at(int x, double[] w, double u) {
    double[] moved = w.clone();
    moved[0] = Math.exp(u);
    return CATEGORICAL.logDensity(x, moved);
  }

  /**
   * Concavity in a whole value, as the discrete analysis uses it, checked as non-increasing
   * differences of the log mass over 0 .. 200 (Poisson, binomial, negative binomial with size 1.5,
   * whole-uniform), and the negative binomial with size 0.5 shown not concave (its differences
   * log((x + size)/(x + 1)) + c rise).
   */
  @Test
  void wholeValueConcavityHoldsWhereClaimed() {
    Parametrisation poisson =
        Families.lookup("poisson").orElseThrow().match(Set.of("rate")).orElseThrow();
    Parametrisation binomial =
        Families.lookup("binomial").orElseThrow().match(Set.of("trials", "p")).orElseThrow();
    Parametrisation negativeBinomial = Families.lookup("negative-binomial").orElseThrow()
        .match(Set.of("mean", "size")).orElseThrow();
    assertDifferencesFall(poisson, new double[] {7.5}, 0, 200);
    assertDifferencesFall(binomial, new double[] {150, 0.3}, 0, 150);
    assertDifferencesFall(negativeBinomial, new double[] {20, 1.5}, 0, 200);
    assertDifferencesFall(WHOLE_UNIFORM, new double[] {-3, 12}, -3, 12);
    assertTrue(negativeBinomial.curvatureInWholeValue(new double[] {Double.NaN, 1.5}).concave());
    assertFalse(negativeBinomial.curvatureInWholeValue(new double[] {Double.NaN, 0.5}).concave());
    assertFalse(negativeBinomial.curvatureInWholeValue(new double[] {Double.NaN, Double.NaN})
        .concave());
    double[] half = {20, 0.5};
    double rise = (negativeBinomial.logDensity(2, half) - negativeBinomial.logDensity(1, half))
        - (negativeBinomial.logDensity(1, half) - negativeBinomial.logDensity(0, half));
    assertTrue(rise > 0, "size 0.5 is not log-concave at 0, 1, 2: " + rise);
  }

  /** The binomial in trials n at a fixed count: differences log((n + 1)/(n + 1 - x)) + log(1 - p). */
  @Test
  void binomialIsConcaveInItsTrials() {
    Parametrisation binomial =
        Families.lookup("binomial").orElseThrow().match(Set.of("trials", "p")).orElseThrow();
    assertTrue(binomial.curvatureInWholeArgument(0, new double[] {Double.NaN, 0.4}).concave());
    double previous = Double.POSITIVE_INFINITY;
    for (int n = 5; n < 400; n++) {
      double step = binomial.logDensity(5, new double[] {n + 1, 0.4})
          - binomial.logDensity(5, new double[] {n, 0.4});
      // the closed form of the difference, from lgamma (commons-math3)
      double closed = Gamma.logGamma(n + 2) - Gamma.logGamma(n - 3) - Gamma.logGamma(n + 1)
          + Gamma.logGamma(n - 4) + Math.log(0.6);
      assertEquals(closed, step, 1e-9, "n = " + n);
      assertTrue(step <= previous + 1e-12, "n = " + n);
      previous = step;
    }
  }

  private static void assertDifferencesFall(Parametrisation p, double[] args, int from, int to) {
    assertTrue(p.curvatureInWholeValue(args).concave(), p.toString());
    double previous = Double.POSITIVE_INFINITY;
    for (int x = from; x < to; x++) {
      double step = p.logDensity(x + 1, args) - p.logDensity(x, args);
      assertTrue(step <= previous + 1e-9, p + " at " + x + ": " + step + " after " + previous);
      previous = step;
    }
  }
}

package org.hullbound.anchor;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.MultivariateNormalDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.hullbound.model.BoundModel;
import org.hullbound.model.family.Scale;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

/**
 * The anchor's target is the model's joint posterior on the sampling scales, Jacobians included,
 * and its gradient (the conditionals' derivatives) is the derivative of its value.
 *
 * <p>Value: differences between points equal those of the closed form built from commons-math3
 * densities (a bivariate normal, a half-normal on the log scale, a beta on the logit scale) plus the
 * log-Jacobians {@code u} and {@code log x + log(1 - x)} (change of variable, any textbook).
 * Gradient: equal to central differences of the value, step 1e-6, within 1e-5 of max(1, |g|)
 * (common practice for checking a gradient; the rounding error of the difference is about 1e-16
 * |f| / 1e-6, under 1e-7 here), at 5 scattered points of each demo model. Deterministic. Broken on
 * purpose (the log-Jacobian left out of the value), both checks failed.
 */
class ModelTargetTest {
  private static final String MIXED = """
      model mixed
      param x ~ normal(mean = 0, sd = 1)
      param y ~ normal(mean = 2.85 * x, sd = 3 * sqrt(0.0975))
      param s ~ half-normal(sd = 2)
      param p ~ beta(a = 2, b = 3)
      """;

  @Test
  void valueDiffersAsTheClosedFormWithJacobians() {
    BoundModel model = AnchorModels.withoutData("mixed", MIXED);
    assertEquals(Scale.LOG, model.conditional(2).scale());
    assertEquals(Scale.LOGIT, model.conditional(3).scale());
    ModelTarget target = ModelTarget.of(model);
    MultivariateNormalDistribution pair = new MultivariateNormalDistribution(
        new double[] {0, 0}, new double[][] {{1, 2.85}, {2.85, 9}});
    NormalDistribution parent = new NormalDistribution(0, 2);
    BetaDistribution beta = new BetaDistribution(2, 3);
    double[][] points = {{0.3, -1.2, -0.4, 0.7}, {-1.5, -4.0, 1.1, -2.5}, {2.0, 6.5, -3.0, 4.0}};
    double[] gradient = new double[4];
    double firstTarget = Double.NaN;
    double firstReference = Double.NaN;
    for (double[] u : points) {
      double s = Math.exp(u[2]);
      double p = 1 / (1 + Math.exp(-u[3]));
      double reference = Math.log(pair.density(new double[] {u[0], u[1]}))
          + Math.log(2) + parent.logDensity(s) + u[2]
          + beta.logDensity(p) + Math.log(p) + Math.log1p(-p);
      double value = target.logDensity(u, gradient);
      if (Double.isNaN(firstTarget)) {
        firstTarget = value;
        firstReference = reference;
      }
      assertEquals(reference - firstReference, value - firstTarget, 1e-9);
    }
  }

  @ParameterizedTest
  @ValueSource(strings = {"clinics", "seedlings", "extract"})
  void gradientIsTheDerivativeOfTheValue(String name) {
    assertGradientMatches(AnchorModels.demo(name));
  }

  @Test
  void gradientMatchesOnTheLogitScale() {
    assertGradientMatches(AnchorModels.withoutData("mixed", MIXED));
  }

  private static void assertGradientMatches(BoundModel model) {
    ModelTarget target = ModelTarget.of(model);
    double[] centre = target.toSamplingScale(model.initialState());
    SplittableRandom random = new SplittableRandom(20261202L);
    int n = centre.length;
    double[] gradient = new double[n];
    double[] ignored = new double[n];
    for (int point = 0; point < 5; point++) {
      double[] u = centre.clone();
      for (int i = 0; i < n; i++) {
        u[i] += 0.5 * random.nextGaussian();
      }
      double value = target.logDensity(u, gradient);
      assertTrue(Double.isFinite(value), model.name() + ": value at point " + point);
      double h = 1e-6;
      for (int i = 0; i < n; i++) {
        double[] up = u.clone();
        double[] down = u.clone();
        up[i] += h;
        down[i] -= h;
        double difference =
            (target.logDensity(up, ignored) - target.logDensity(down, ignored)) / (2 * h);
        assertEquals(difference, gradient[i], 1e-5 * Math.max(1, Math.abs(gradient[i])),
            model.name() + ": d/du of " + model.unknowns().get(i).label() + " at point " + point);
      }
    }
  }

  @Test
  void outsideTheSupportHasNoDensity() {
    BoundModel model = AnchorModels.withoutData("bounded", """
        model bounded
        param a ~ normal(mean = 0, sd = 1) within 0 .. 1
        """);
    assertEquals(Scale.NATURAL, model.conditional(0).scale());
    ModelTarget target = ModelTarget.of(model);
    double[] gradient = new double[1];
    assertTrue(Double.isFinite(target.logDensity(new double[] {0.5}, gradient)));
    assertEquals(Double.NEGATIVE_INFINITY, target.logDensity(new double[] {1.5}, gradient));
    assertEquals(Double.NEGATIVE_INFINITY, target.logDensity(new double[] {-0.5}, gradient));
    assertEquals(Double.NEGATIVE_INFINITY,
        target.logDensity(new double[] {Double.NaN}, gradient));
  }

  @Test
  void refusesNoModel() {
    assertThrows(IllegalArgumentException.class, () -> ModelTarget.of(null));
  }
}

package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * A log-scale sd at extreme values: the conditional of {@code spread} with normal children
 * {@code effect[j] ~ normal(centre, spread)} and a half-normal prior is, in {@code u = log spread},
 * {@code u - e^{2u}/2 - J u - S e^{-2u}/2} plus constants (S the sum of squared residuals; the
 * analysis in {@code UpdateAnalysis}), with slope {@code 1 - e^{2u} - J + S e^{-2u}}. Both are
 * finite in double precision while {@code S e^{-2u}} is, although the natural-scale derivative
 * {@code S / spread^3} overflows long before.
 */
class ExtremeScaleTest {
  private static final String MODEL =
      String.join(
          "\n",
          "index bench = 1 .. 3",
          "param centre ~ normal(mean = 0, sd = 2.5)",
          "param spread ~ half-normal(sd = 1)",
          "param effect[bench] ~ normal(mean = centre, sd = spread)");

  private static double[] state(BoundModel model) {
    double[] state = model.initialState();
    state[model.unknown("centre").index()] = 0.2;
    state[model.unknown("effect[1]").index()] = 0.9;
    state[model.unknown("effect[2]").index()] = -0.4;
    state[model.unknown("effect[3]").index()] = 0.1;
    return state;
  }

  private static double sumOfSquares() {
    return 0.7 * 0.7 + 0.6 * 0.6 + 0.1 * 0.1;
  }

  @Test
  void atATinySdTheValueAndSlopeAreFiniteAndMatchTheClosedForm() {
    BoundModel model = bind(MODEL);
    ConditionalDensity c = model.conditional(model.unknown("spread").index());
    double[] state = state(model);
    double s = sumOfSquares();
    for (double u : new double[] {-300, -330, -350}) {
      double[] slope = new double[1];
      double value = c.logDensity(u, state, slope);
      assertTrue(Double.isFinite(value), "value at u = " + u + ": " + value);
      assertTrue(Double.isFinite(slope[0]), "slope at u = " + u + ": " + slope[0]);
      double expected = 1 - Math.exp(2 * u) - 3 + s * Math.exp(-2 * u);
      assertEquals(expected, slope[0], 1e-12 * Math.abs(expected), "slope at u = " + u);
    }
  }

  @Test
  void beyondOverflowTheValueIsMinusInfinityWithADefinedSlope() {
    BoundModel model = bind(MODEL);
    ConditionalDensity c = model.conditional(model.unknown("spread").index());
    double[] state = state(model);
    for (double u : new double[] {-400, -800, 400, 800}) {
      double[] slope = new double[1];
      double value = c.logDensity(u, state, slope);
      assertEquals(Double.NEGATIVE_INFINITY, value, "value at u = " + u);
      assertFalse(Double.isNaN(slope[0]), "slope at u = " + u);
    }
  }

  @Test
  void atAHugeSdTheValueAndSlopeAreFinite() {
    BoundModel model = bind(MODEL);
    ConditionalDensity c = model.conditional(model.unknown("spread").index());
    double[] state = state(model);
    for (double u : new double[] {100, 300, 350}) {
      double[] slope = new double[1];
      double value = c.logDensity(u, state, slope);
      assertTrue(Double.isFinite(value), "value at u = " + u + ": " + value);
      double expected = 1 - Math.exp(2 * u) - 3 + sumOfSquares() * Math.exp(-2 * u);
      assertEquals(expected, slope[0], 1e-12 * Math.abs(expected), "slope at u = " + u);
    }
  }
}

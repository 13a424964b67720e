package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.SourcePosition;
import org.junit.jupiter.api.Test;

/**
 * Which {@code let} quantities go with the draws: scalars by default, vectors only when marked
 * {@code keep let}, none marked {@code hide let}, none fixed by the data; and their values are the
 * let's expression at the state.
 */
class DerivedQuantitiesTest {

  private static final String MODEL =
      String.join(
          "\n",
          "index site = 1 .. 3",
          "data dose[site] = [0.5, 1, 2]",
          "data y[site] = [1, 4, 9] ~ poisson(rate = rate[site])",
          "param alpha ~ normal(mean = 0, sd = 2)",
          "param beta ~ normal(mean = 0, sd = 2)",
          "let ld50 = -alpha / beta",
          "keep let rate[site] = exp(alpha + beta * dose[site])",
          "let eta[site] = alpha + beta * dose[site]",
          "keep let slope_up[site] = beta * dose[site]",
          "hide let twice = 2 * alpha",
          "let mean_dose = sum(site: dose[site]) / 3",
          "keep let kept_scalar = alpha ^ 2");

  @Test
  void exactlyTheScalarsAndTheMarkedVectorsAreKeptInStatementOrder() {
    DerivedQuantities derived = TestModels.bind(MODEL).derived();
    assertEquals(
        List.of("ld50", "rate[1]", "rate[2]", "rate[3]", "slope_up[1]", "slope_up[2]",
            "slope_up[3]", "kept_scalar"),
        derived.labels());
    assertEquals(8, derived.size());
  }

  @Test
  void everyLetIsListedWithWhyItIsKeptOrNot() {
    List<DerivedQuantities.Choice> choices = TestModels.bind(MODEL).derived().choices();
    assertEquals(
        List.of(
            new DerivedQuantities.Choice("ld50", 1, true, "a scalar: kept by default"),
            new DerivedQuantities.Choice("rate[site]", 3, true, "marked keep"),
            new DerivedQuantities.Choice(
                "eta[site]", 3, false, "a vector: write 'keep let' to keep it"),
            new DerivedQuantities.Choice("slope_up[site]", 3, true, "marked keep"),
            new DerivedQuantities.Choice("twice", 1, false, "marked hide"),
            new DerivedQuantities.Choice(
                "mean_dose", 1, false, "fixed by the data, the same in every draw"),
            new DerivedQuantities.Choice("kept_scalar", 1, true, "marked keep")),
        choices);
  }

  @Test
  void theValuesAreTheLetsExpressionsAtTheState() {
    BoundModel model = TestModels.bind(MODEL);
    double alpha = 0.3;
    double beta = -1.7;
    double[] state = new double[2];
    state[model.unknown("alpha").index()] = alpha;
    state[model.unknown("beta").index()] = beta;
    double[] out = {Double.NaN, 0, 0, 0, 0, 0, 0, 0, 0, 0};
    model.derived().evaluate(state, out, 2);
    // The same IEEE operations in the same order give the same doubles (common practice).
    double[] expected = {
      -alpha / beta,
      Math.exp(alpha + beta * 0.5), Math.exp(alpha + beta * 1), Math.exp(alpha + beta * 2),
      beta * 0.5, beta * 1, beta * 2,
      alpha * alpha
    };
    for (int k = 0; k < expected.length; k++) {
      assertEquals(expected[k], out[2 + k], Math.ulp(expected[k]), "column " + k);
    }
    assertEquals(-alpha / beta, out[2], 0.0, "ld50 exactly");
    assertTrue(Double.isNaN(out[0]), "nothing before 'from' is written");
  }

  @Test
  void aModelWithoutLetsKeepsNothing() {
    DerivedQuantities derived =
        TestModels.bind("param mu ~ normal(mean = 0, sd = 1)").derived();
    assertSame(DerivedQuantities.none(), derived);
    assertEquals(0, derived.size());
    assertTrue(derived.choices().isEmpty());
  }

  @Test
  void aLetOfAMissingObservationIsKept() {
    DerivedQuantities derived =
        TestModels.bind(
                "index t = 1 .. 2\n"
                    + "param mu ~ normal(mean = 0, sd = 1)\n"
                    + "data y[t] = [1, NA] ~ normal(mean = mu, sd = 1)\n"
                    + "let gap = y[2] - y[1]")
            .derived();
    assertEquals(List.of("gap"), derived.labels());
  }

  @Test
  void keepingALetFixedByTheDataIsAnErrorAtTheMark() {
    ModelException e =
        assertThrows(
            ModelException.class,
            () -> TestModels.bind(
                "index t = 1 .. 2\n"
                    + "data x[t] = [1, 2]\n"
                    + "param mu ~ normal(mean = 0, sd = 1)\n"
                    + "  keep let x2[t] = x[t] ^ 2"));
    assertEquals(new SourcePosition("test.hbm", 4, 3), e.position());
    assertTrue(e.problem().contains("'x2' is fixed by the data"), e.problem());
    assertFalse(e.hint().isBlank());
  }
}

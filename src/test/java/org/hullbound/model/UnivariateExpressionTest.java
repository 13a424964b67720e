package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.special.Gamma;
import org.hullbound.lang.ModelException;
import org.junit.jupiter.api.Test;

/** Expressions in x: values and forward-mode slopes against closed forms, and positioned errors. */
class UnivariateExpressionTest {

  private static UnivariateExpression parse(String text) {
    return UnivariateExpression.parse("<--log-density>", text);
  }

  @Test
  void valuesAndSlopesMatchClosedForms() {
    for (double x : new double[] {-3.5, -0.2, 0.7, 4}) {
      UnivariateExpression.ValueAndSlope normal = parse("-x^2/2").evaluate(x);
      assertEquals(-x * x / 2, normal.value(), 1e-15);
      assertEquals(-x, normal.slope(), 1e-15);
      // d/dx [-x^2/2 - 3 log(1 + e^-x)] = -x + 3 e^-x / (1 + e^-x) (calculus).
      UnivariateExpression.ValueAndSlope skewed = parse("-x^2/2 - 3*log1p(exp(-x))").evaluate(x);
      assertEquals(-x * x / 2 - 3 * Math.log1p(Math.exp(-x)), skewed.value(), 1e-14);
      assertEquals(-x + 3 * Math.exp(-x) / (1 + Math.exp(-x)), skewed.slope(), 1e-14);
    }
    for (double x : new double[] {0.01, 0.5, 2.5, 40}) {
      UnivariateExpression.ValueAndSlope gamma = parse("1.5*log(x) - x").evaluate(x);
      assertEquals(1.5 * Math.log(x) - x, gamma.value(), 1e-13);
      assertEquals(1.5 / x - 1, gamma.slope(), 1e-13);
      // d/dx log Gamma(x) = digamma(x); reference: commons-math3 Gamma.
      UnivariateExpression.ValueAndSlope lgamma = parse("lgamma(x)").evaluate(x);
      assertEquals(Gamma.logGamma(x), lgamma.value(), 1e-13);
      assertEquals(Gamma.digamma(x), lgamma.slope(), 1e-12);
    }
  }

  @Test
  void everyFunctionsSlopeAgreesWithCentralDifferences() {
    List<String> expressions =
        List.of(
            "exp(x/3)", "log(x)", "log1p(x)", "expm1(x)", "sqrt(x)", "(x - 1)^2", "abs(x - 5)",
            "logit(x/10)", "expit(2*x - 1)", "log_expit(x - 2)", "lgamma(x + 1)",
            "min(x, 2)", "max(x, 2)", "x^2.5", "2^x", "x^x", "(x + 1)/(x^2 + 3)", "-(-x)");
    for (String text : expressions) {
      UnivariateExpression f = parse(text);
      for (double x : new double[] {0.3, 1.1, 3.7, 6.2}) {
        double h = 1e-6 * Math.max(1, x);
        double numeric = (f.value(x + h) - f.value(x - h)) / (2 * h);
        double slope = f.evaluate(x).slope();
        assertEquals(numeric, slope, 1e-6 * Math.max(1, Math.abs(slope)), text + " at " + x);
        assertEquals(f.value(x), f.evaluate(x).value(), 0.0, text);
      }
    }
  }

  @Test
  void kinksAndConstantsAreRecognised() {
    assertTrue(parse("-x^2").smooth());
    assertFalse(parse("-abs(x)").smooth());
    assertFalse(parse("min(0, -x)").smooth());
    assertTrue(parse("x").readsVariable());
    assertFalse(parse("log(2) + 3").readsVariable());
    assertEquals(0.0, parse("log(2) + 3").evaluate(1).slope());
  }

  @Test
  void farTailsGiveInfinitiesNotExceptions() {
    UnivariateExpression.ValueAndSlope far = parse("-x^2/2").evaluate(1e200);
    assertEquals(Double.NEGATIVE_INFINITY, far.value());
    assertEquals(-1e200, far.slope());
    assertEquals(Double.NEGATIVE_INFINITY, parse("log(x)").value(0));
    assertTrue(Double.isNaN(parse("log(x)").value(-1)));
  }

  @Test
  void anotherNameIsRefusedAtItsPositionWithACaret() {
    ModelException e = assertThrows(ModelException.class, () -> parse("-x^2/2 + mu*x"));
    assertEquals("<--log-density>:1:10", e.position().toString());
    assertEquals("unknown name 'mu'; the only variable here is x", e.problem());
    assertEquals(
        "<--log-density>:1:10: unknown name 'mu'; the only variable here is x\n"
            + "  | -x^2/2 + mu*x\n"
            + "  |          ^\n",
        e.render());
    ModelException capital = assertThrows(ModelException.class, () -> parse("-X^2"));
    assertEquals("did you mean 'x'?", capital.hint());
  }

  @Test
  void indexesSumsAndSyntaxErrorsAreRefused() {
    ModelException index = assertThrows(ModelException.class, () -> parse("x[1]"));
    assertEquals("x is a single number and takes no index", index.problem());
    assertEquals(3, index.position().column());
    ModelException sum = assertThrows(ModelException.class, () -> parse("sum(i: x)"));
    assertTrue(sum.problem().contains("needs an index set"), sum.problem());
    ModelException syntax = assertThrows(ModelException.class, () -> parse("-x^2/"));
    assertEquals("<--log-density>", syntax.position().file());
    ModelException function = assertThrows(ModelException.class, () -> parse("lg(x)"));
    assertEquals(1, function.position().column());
  }
}

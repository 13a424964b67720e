package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.special.Gamma;
import org.hullbound.lang.Declarator;
import org.hullbound.lang.Functions;
import org.hullbound.lang.Identifier;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.SourceText;
import org.hullbound.lang.Statement;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

/**
 * Every function of the language: its compiled value against java.lang.Math / commons-math3 and
 * its forward-mode derivative against a central difference; and edges of the numerics.
 */
class OpTest {

  @Test
  void everyFunctionOfTheParserHasAnImplementation() {
    for (String name : Functions.names()) {
      Op op = Op.function(name);
      assertTrue(op != null && op.arity() == Functions.arity(name), name);
    }
  }

  @ParameterizedTest
  @ValueSource(
      strings = {
        "exp", "log", "log1p", "expm1", "sqrt", "abs", "logit", "expit",
        "log_expit", "lgamma"
      })
  void unaryDerivativesMatchCentralDifferences(String name) {
    Op op = Op.function(name);
    // Points inside every function's domain (logit needs (0, 1)).
    for (double x : new double[] {0.15, 0.4, 0.85}) {
      Evaluator e = Evaluator.compile(
          new Formula.Operation(op, List.of(new Formula.Slot(0))), 0);
      Frame frame = new Frame(x, new double[1]);
      double value = e.eval(frame);
      double h = 1e-6;
      double numeric =
          (op.unary(x + h) - op.unary(x - h)) / (2 * h);
      assertEquals(numeric, frame.slope, 1e-6 * (1 + Math.abs(numeric)), name + " at " + x);
      assertEquals(reference(name, x), value, 1e-14 * (1 + Math.abs(value)), name + " at " + x);
    }
  }

  private static double reference(String name, double x) {
    switch (name) {
      case "exp":
        return Math.exp(x);
      case "log":
        return Math.log(x);
      case "log1p":
        return Math.log1p(x);
      case "expm1":
        return Math.expm1(x);
      case "sqrt":
        return Math.sqrt(x);
      case "abs":
        return Math.abs(x);
      case "logit":
        return Math.log(x / (1 - x));
      case "expit":
        return 1 / (1 + Math.exp(-x));
      case "log_expit":
        return Math.log(1 / (1 + Math.exp(-x)));
      default:
        return Gamma.logGamma(x);
    }
  }

  @Test
  void binaryOperationsCarryBothSlopes() {
    // f(x) = (x * 3 - x / 2) ^ x + max(x, 0.2) with x = 0.7
    Formula x = new Formula.Slot(0);
    Formula f =
        new Formula.Operation(
            Op.ADD,
            List.of(
                new Formula.Operation(
                    Op.POWER,
                    List.of(
                        new Formula.Operation(
                            Op.SUBTRACT,
                            List.of(
                                new Formula.Operation(Op.MULTIPLY, List.of(x, Formula.constant(3))),
                                new Formula.Operation(Op.DIVIDE, List.of(x, Formula.constant(2))))),
                        x)),
                new Formula.Operation(Op.MAX, List.of(x, Formula.constant(0.2)))));
    Evaluator e = Evaluator.compile(f, 0);
    double h = 1e-6;
    double numeric =
        (e.eval(new Frame(0.7 + h, new double[1])) - e.eval(new Frame(0.7 - h, new double[1])))
            / (2 * h);
    Frame frame = new Frame(0.7, new double[1]);
    double value = e.eval(frame);
    assertEquals(Math.pow(2.5 * 0.7, 0.7) + 0.7, value, 1e-14);
    assertEquals(numeric, frame.slope, 1e-7);
  }

  @Test
  void inverseLogitIsAccurateInBothTails() {
    assertEquals(Math.exp(-800), Op.inverseLogit(-800), 0);
    assertEquals(1.0, Op.inverseLogit(800));
    assertEquals(-800, Op.logInverseLogit(-800), 1e-12);
    assertEquals(-Math.exp(-40), Op.logInverseLogit(40), 1e-30);
  }

  @Test
  void constantsFoldAtBinding() {
    Formula folded =
        Formulas.apply(Op.MULTIPLY, List.of(Formula.constant(2), Formula.constant(3.5)));
    assertEquals(7.0, ((Formula.Constant) folded).value());
    Formula sum =
        Formulas.apply(
            Op.ADD, List.of(Formula.constant(1), new Formula.Slot(0), Formula.constant(2)));
    assertEquals(
        new Formula.Operation(Op.ADD, List.of(new Formula.Slot(0), Formula.constant(3))), sum);
  }

  @Test
  void aParamWithoutAPriorIsAnError() {
    SourceText source = SourceText.of("m.hbm", "param mu");
    SourcePosition at = source.position(1, 7);
    ModelFile file =
        new ModelFile(
            source,
            List.of(
                new Statement.Param(
                    new Declarator(new Identifier("mu", at), List.of()), null,
                    source.position(1, 1))));
    ModelException e = assertThrows(ModelException.class, () -> BoundModel.bind(file, List.of()));
    assertEquals("m.hbm:1:7", e.position().toString());
    assertTrue(e.render().contains("param 'mu' has no prior"), e.render());
  }
}

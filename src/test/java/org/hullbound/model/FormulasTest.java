package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The forms the analyses recognise: the two parts of an affine formula and the coefficient and
 * power of a monomial, checked by evaluating both sides at several points (the identities {@code
 * f = a + b x} and {@code f = c x^q} for {@code x > 0}, common practice).
 */
class FormulasTest {
  private static final int X = 0;
  private static final int K = 1;

  private static Formula x() {
    return new Formula.Slot(X);
  }

  private static Formula k() {
    return new Formula.Slot(K);
  }

  private static Formula op(Op op, Formula... parts) {
    return Formulas.apply(op, List.of(parts));
  }

  private static double eval(Formula f, double x, double k) {
    return Evaluator.compile(f, -1).eval(new Frame(Double.NaN, new double[] {x, k}));
  }

  @Test
  void affinePartsRebuildTheFormula() {
    // (3 - 2 k x) / 4 + k - x
    Formula f = op(Op.ADD,
        op(Op.DIVIDE, op(Op.SUBTRACT, Formula.constant(3), op(Op.MULTIPLY,
            op(Op.MULTIPLY, Formula.constant(2), k()), x())), Formula.constant(4)),
        k(), op(Op.NEGATE, x()));
    Formula[] parts = Formulas.affineParts(f, X);
    for (double xv : new double[] {-2, 0.5, 3}) {
      double kv = 1.7;
      assertEquals(eval(f, xv, kv),
          eval(parts[0], xv, kv) + eval(parts[1], xv, kv) * xv, 1e-12);
    }
    assertNull(Formulas.affineParts(op(Op.MULTIPLY, x(), x()), X));
    assertNull(Formulas.affineParts(op(Op.EXP, x()), X));
  }

  @Test
  void aLinearFormRebuildsAPredictorOverKnownCoefficients() {
    // 1.5 - 2 (x - 3 k) + 0.5 x - k = 1.5 - 1.5 x + 5 k
    Formula f = op(Op.ADD, Formula.constant(1.5),
        op(Op.NEGATE, op(Op.MULTIPLY, Formula.constant(2),
            op(Op.SUBTRACT, x(), op(Op.MULTIPLY, Formula.constant(3), k())))),
        op(Op.MULTIPLY, x(), Formula.constant(0.5)), op(Op.NEGATE, k()));
    Formulas.LinearForm form = Formulas.linearForm(f);
    assertEquals(1.5, form.constant());
    assertEquals(List.of(X, K), java.util.Arrays.stream(form.slots()).boxed().toList());
    assertEquals(-1.5, form.coefficients()[0]);
    assertEquals(5, form.coefficients()[1]);
    for (double xv : new double[] {-2, 0.5, 3}) {
      double kv = 1.7;
      assertEquals(eval(f, xv, kv), form.constant() + form.coefficients()[0] * xv
          + form.coefficients()[1] * kv, 1e-12);
    }
    assertNull(Formulas.linearForm(op(Op.MULTIPLY, x(), k())), "a product of two unknowns");
    assertNull(Formulas.linearForm(op(Op.EXP, x())), "a function of an unknown");
  }

  @Test
  void aMonomialIsItsCoefficientTimesAPowerOfTheUnknown() {
    // k * sqrt(x) / (x * x) = k x^-1.5
    Formula f = op(Op.DIVIDE, op(Op.MULTIPLY, k(), op(Op.SQRT, x())), op(Op.MULTIPLY, x(), x()));
    Formulas.Monomial m = Formulas.monomial(f, X);
    assertEquals(-1.5, m.power());
    for (double xv : new double[] {0.3, 1, 4.5}) {
      assertEquals(eval(f, xv, 2.5), eval(m.coefficient(), xv, 2.5) * Math.pow(xv, -1.5), 1e-12);
    }
    // (2 x)^3 / k = (8 / k) x^3
    Formula g = op(Op.DIVIDE, op(Op.POWER, op(Op.MULTIPLY, Formula.constant(2), x()),
        Formula.constant(3)), k());
    Formulas.Monomial n = Formulas.monomial(g, X);
    assertEquals(3.0, n.power());
    assertEquals(8 / 2.5, eval(n.coefficient(), 1, 2.5), 1e-12);
    assertNull(Formulas.monomial(op(Op.ADD, x(), Formula.constant(1)), X));
    assertNull(Formulas.monomial(op(Op.POWER, x(), k()), X));
    // Only a known positive coefficient gives the old power() rule.
    assertEquals(Double.NaN, Formulas.power(f, X));
    assertEquals(-1.0, Formulas.power(op(Op.DIVIDE, Formula.constant(2), x()), X));
  }
}

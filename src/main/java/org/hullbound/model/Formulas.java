package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;

/**
 * Builds {@link Formula}s with constants folded, and recognises the forms the analyses rely on:
 * affine in an unknown (and its two parts), a monomial in it (a product and quotient of powers),
 * a positive multiple of a power of it, a plain multiple of it.
 *
 * <p>Folding happens once at binding, so data-only subexpressions cost nothing while sampling.
 */
final class Formulas {

  private Formulas() {}

  /** {@code op(parts)}, folded to a constant when every part is known; sums are flattened. */
  static Formula apply(Op op, List<Formula> parts) {
    if (op == Op.ADD) {
      List<Formula> flat = new ArrayList<>();
      double constant = 0;
      boolean hasConstant = false;
      for (Formula part : parts) {
        List<Formula> pieces =
            part instanceof Formula.Operation o && o.op() == Op.ADD ? o.parts() : List.of(part);
        for (Formula piece : pieces) {
          if (piece instanceof Formula.Constant c) {
            constant += c.value();
            hasConstant = true;
          } else {
            flat.add(piece);
          }
        }
      }
      if (flat.isEmpty()) {
        return Formula.constant(constant);
      }
      if (hasConstant && constant != 0) {
        flat.add(Formula.constant(constant));
      }
      return flat.size() == 1 ? flat.get(0) : new Formula.Operation(Op.ADD, flat);
    }
    boolean allKnown = true;
    for (Formula part : parts) {
      allKnown &= part.known();
    }
    if (allKnown) {
      double a = ((Formula.Constant) parts.get(0)).value();
      if (parts.size() == 1) {
        return Formula.constant(op.unary(a));
      }
      double b = ((Formula.Constant) parts.get(1)).value();
      return Formula.constant(op.binary(a, b));
    }
    return new Formula.Operation(op, parts);
  }

  /** True when {@code f} is affine in slot {@code s}: {@code a + b * x} with a, b free of x. */
  static boolean affine(Formula f, int s) {
    if (!f.reads(s) || f instanceof Formula.Slot) {
      return true;
    }
    Formula.Operation o = (Formula.Operation) f;
    List<Formula> p = o.parts();
    switch (o.op()) {
      case ADD:
        return p.stream().allMatch(part -> affine(part, s));
      case SUBTRACT:
        return affine(p.get(0), s) && affine(p.get(1), s);
      case NEGATE:
        return affine(p.get(0), s);
      case MULTIPLY:
        return (!p.get(0).reads(s) && affine(p.get(1), s))
            || (!p.get(1).reads(s) && affine(p.get(0), s));
      case DIVIDE:
        return !p.get(1).reads(s) && affine(p.get(0), s);
      default:
        return false;
    }
  }

  /** True when {@code f} is {@code c * x} (or {@code x / c}) with {@code c} free of slot s. */
  static boolean linear(Formula f, int s) {
    if (f instanceof Formula.Slot slot) {
      return slot.index() == s;
    }
    if (!(f instanceof Formula.Operation o)) {
      return false;
    }
    List<Formula> p = o.parts();
    switch (o.op()) {
      case MULTIPLY:
        return (!p.get(0).reads(s) && linear(p.get(1), s))
            || (!p.get(1).reads(s) && linear(p.get(0), s));
      case DIVIDE:
        return !p.get(1).reads(s) && linear(p.get(0), s);
      default:
        return false;
    }
  }

  /**
   * The power {@code q} when {@code f} is {@code c * x^q} with {@code c} a known positive
   * constant, so that {@code log f = log c + q log x} is affine in {@code log x}; NaN otherwise.
   */
  static double power(Formula f, int s) {
    Monomial m = monomial(f, s);
    return m != null && positive(m.coefficient()) ? m.power() : Double.NaN;
  }

  /**
   * {@code f = coefficient * x^power} for {@code x > 0}, with {@code coefficient} free of slot
   * {@code s}: a product and quotient of powers, in which the unknown may appear more than once
   * ({@code x * sqrt(x)} has power 1.5) and other unknowns and data form the coefficient ({@code a
   * / m} is {@code a * m^-1}). Where {@code f > 0}, {@code log f = log(coefficient) + power log
   * x} is affine in {@code log x}. {@code null} for any other form.
   */
  record Monomial(Formula coefficient, double power) {}

  /** The monomial form of {@code f} in slot {@code s}, or {@code null}; see {@link Monomial}. */
  static Monomial monomial(Formula f, int s) {
    if (!f.reads(s)) {
      return new Monomial(f, 0);
    }
    if (f instanceof Formula.Slot) {
      return new Monomial(Formula.constant(1), 1);
    }
    Formula.Operation o = (Formula.Operation) f;
    List<Formula> p = o.parts();
    Monomial first = monomial(p.get(0), s);
    if (first == null) {
      return null;
    }
    switch (o.op()) {
      case NEGATE:
        return new Monomial(apply(Op.NEGATE, List.of(first.coefficient())), first.power());
      case SQRT:
        return new Monomial(apply(Op.SQRT, List.of(first.coefficient())), first.power() / 2);
      case POWER:
        if (!(p.get(1) instanceof Formula.Constant e) || !Double.isFinite(e.value())) {
          return null;
        }
        return new Monomial(apply(Op.POWER, List.of(first.coefficient(), e)),
            e.value() * first.power());
      case MULTIPLY:
      case DIVIDE:
        Monomial second = monomial(p.get(1), s);
        if (second == null) {
          return null;
        }
        boolean multiply = o.op() == Op.MULTIPLY;
        return new Monomial(
            apply(o.op(), List.of(first.coefficient(), second.coefficient())),
            multiply ? first.power() + second.power() : first.power() - second.power());
      default:
        return null;
    }
  }

  /**
   * {@code [a, b]} with {@code f = a + b x} and {@code a}, {@code b} free of slot {@code s}, or
   * {@code null} when {@code f} is not affine in it (the forms of {@link #affine}).
   */
  static Formula[] affineParts(Formula f, int s) {
    if (!f.reads(s)) {
      return new Formula[] {f, Formula.constant(0)};
    }
    if (f instanceof Formula.Slot) {
      return new Formula[] {Formula.constant(0), Formula.constant(1)};
    }
    Formula.Operation o = (Formula.Operation) f;
    List<Formula> p = o.parts();
    switch (o.op()) {
      case ADD: {
        List<Formula> intercepts = new ArrayList<>();
        List<Formula> slopes = new ArrayList<>();
        for (Formula part : p) {
          Formula[] parts = affineParts(part, s);
          if (parts == null) {
            return null;
          }
          intercepts.add(parts[0]);
          slopes.add(parts[1]);
        }
        return new Formula[] {apply(Op.ADD, intercepts), apply(Op.ADD, slopes)};
      }
      case SUBTRACT: {
        Formula[] left = affineParts(p.get(0), s);
        Formula[] right = affineParts(p.get(1), s);
        if (left == null || right == null) {
          return null;
        }
        return new Formula[] {
          apply(Op.SUBTRACT, List.of(left[0], right[0])),
          apply(Op.SUBTRACT, List.of(left[1], right[1]))
        };
      }
      case NEGATE: {
        Formula[] inner = affineParts(p.get(0), s);
        return inner == null ? null : new Formula[] {
          apply(Op.NEGATE, List.of(inner[0])), apply(Op.NEGATE, List.of(inner[1]))
        };
      }
      case MULTIPLY: {
        boolean leftFree = !p.get(0).reads(s);
        if (!leftFree && p.get(1).reads(s)) {
          return null;
        }
        Formula factor = leftFree ? p.get(0) : p.get(1);
        Formula[] inner = affineParts(leftFree ? p.get(1) : p.get(0), s);
        return inner == null ? null : new Formula[] {
          times(factor, inner[0]), times(factor, inner[1])
        };
      }
      case DIVIDE: {
        if (p.get(1).reads(s)) {
          return null;
        }
        Formula[] inner = affineParts(p.get(0), s);
        return inner == null ? null : new Formula[] {
          over(inner[0], p.get(1)), over(inner[1], p.get(1))
        };
      }
      default:
        return null;
    }
  }

  /**
   * {@code f = constant + sum of coefficient * slot} with known coefficients, each slot once: the
   * form of a linear predictor whose covariates are data, worked out from a state by a flat loop
   * over primitive arrays instead of a tree of evaluators. {@code null} for any other form.
   */
  record LinearForm(double constant, int[] slots, double[] coefficients) {}

  /** The linear form of {@code f} ({@link LinearForm}), or {@code null}. */
  static LinearForm linearForm(Formula f) {
    java.util.Map<Integer, Double> coefficients = new java.util.LinkedHashMap<>();
    double[] constant = {0};
    if (!collectLinear(f, 1, coefficients, constant)) {
      return null;
    }
    int[] slots = new int[coefficients.size()];
    double[] values = new double[slots.length];
    int k = 0;
    for (java.util.Map.Entry<Integer, Double> entry : coefficients.entrySet()) {
      slots[k] = entry.getKey();
      values[k++] = entry.getValue();
    }
    return new LinearForm(constant[0], slots, values);
  }

  /** Adds {@code factor * f} to the coefficients and constant; false when {@code f} is not linear. */
  private static boolean collectLinear(Formula f, double factor,
      java.util.Map<Integer, Double> coefficients, double[] constant) {
    if (f instanceof Formula.Constant c) {
      constant[0] += factor * c.value();
      return true;
    }
    if (f instanceof Formula.Slot slot) {
      coefficients.merge(slot.index(), factor, Double::sum);
      return true;
    }
    Formula.Operation o = (Formula.Operation) f;
    List<Formula> p = o.parts();
    switch (o.op()) {
      case ADD:
        for (Formula part : p) {
          if (!collectLinear(part, factor, coefficients, constant)) {
            return false;
          }
        }
        return true;
      case SUBTRACT:
        return collectLinear(p.get(0), factor, coefficients, constant)
            && collectLinear(p.get(1), -factor, coefficients, constant);
      case NEGATE:
        return collectLinear(p.get(0), -factor, coefficients, constant);
      case MULTIPLY:
        if (p.get(0) instanceof Formula.Constant c) {
          return collectLinear(p.get(1), factor * c.value(), coefficients, constant);
        }
        if (p.get(1) instanceof Formula.Constant c) {
          return collectLinear(p.get(0), factor * c.value(), coefficients, constant);
        }
        return false;
      default:
        return false;
    }
  }

  /** {@code f / divisor}, with a zero {@code f} kept as the constant 0. */
  private static Formula over(Formula f, Formula divisor) {
    if (f instanceof Formula.Constant c && c.value() == 0) {
      return f;
    }
    return apply(Op.DIVIDE, List.of(f, divisor));
  }

  /** {@code factor * f}, with a zero {@code f} kept as the constant 0. */
  private static Formula times(Formula factor, Formula f) {
    if (f instanceof Formula.Constant c && c.value() == 0) {
      return f;
    }
    return apply(Op.MULTIPLY, List.of(factor, f));
  }

  private static boolean positive(Formula f) {
    return f instanceof Formula.Constant c && c.value() > 0 && c.value() < Double.POSITIVE_INFINITY;
  }

  /** The operand when {@code f} is {@code op(operand)}, otherwise {@code null}. */
  static Formula unwrap(Formula f, Op op) {
    return f instanceof Formula.Operation o && o.op() == op ? o.parts().get(0) : null;
  }
}

package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;

/**
 * Builds {@link Formula}s with constants folded, and recognises the forms the analyses rely on:
 * affine in an unknown, a positive multiple of a power of it, a plain multiple of it.
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
    if (f instanceof Formula.Slot slot) {
      return slot.index() == s ? 1 : Double.NaN;
    }
    if (!(f instanceof Formula.Operation o)) {
      return Double.NaN;
    }
    List<Formula> p = o.parts();
    switch (o.op()) {
      case MULTIPLY:
        if (positive(p.get(0))) {
          return power(p.get(1), s);
        }
        return positive(p.get(1)) ? power(p.get(0), s) : Double.NaN;
      case DIVIDE:
        if (positive(p.get(1))) {
          return power(p.get(0), s);
        }
        return positive(p.get(0)) ? -power(p.get(1), s) : Double.NaN;
      case POWER:
        return p.get(1) instanceof Formula.Constant c && c.value() != 0
            ? c.value() * power(p.get(0), s)
            : Double.NaN;
      case SQRT:
        return 0.5 * power(p.get(0), s);
      default:
        return Double.NaN;
    }
  }

  private static boolean positive(Formula f) {
    return f instanceof Formula.Constant c && c.value() > 0 && c.value() < Double.POSITIVE_INFINITY;
  }

  /** The operand when {@code f} is {@code op(operand)}, otherwise {@code null}. */
  static Formula unwrap(Formula f, Op op) {
    return f instanceof Formula.Operation o && o.op() == op ? o.parts().get(0) : null;
  }
}

package org.hullbound.model;

import java.util.List;

/**
 * A compiled expression: a tree of small objects with every array slot resolved, returning its
 * value and leaving d/dx (the derivative in the conditional's own unknown) in {@link
 * Frame#slope}, forward-mode dual numbers in one pass.
 *
 * <p>Built once per conditional by {@link #compile(Formula, int)}; the syntax tree is never
 * re-interpreted while sampling.
 */
abstract class Evaluator {

  /** The value at {@code frame}; sets {@code frame.slope} to its derivative in the own unknown. */
  abstract double eval(Frame frame);

  /** True when the value does not depend on the own unknown (its slope is always zero). */
  boolean fixed() {
    return true;
  }

  /** Compiles {@code formula}, with slot {@code own} as the variable (-1: none). */
  static Evaluator compile(Formula formula, int own) {
    return compile(formula, own, null);
  }

  /**
   * Compiles {@code formula} as {@link #compile(Formula, int)}, each leaf but the own slot (a
   * number or another unknown's slot) replaced by what {@code leaves} gives for it where that is
   * not null. Leaves are asked for in a fixed order, depth first and parts left to right, so that
   * a caller can number them (a template whose numbers are read per row, {@link #rowNumber}).
   */
  static Evaluator compile(
      Formula formula, int own, java.util.function.Function<Formula, Evaluator> leaves) {
    if (formula instanceof Formula.Constant constant) {
      Evaluator leaf = leaves == null ? null : leaves.apply(formula);
      return leaf != null ? leaf : new Constant(constant.value());
    }
    if (formula instanceof Formula.Slot slot) {
      if (slot.index() == own) {
        return new Own();
      }
      Evaluator leaf = leaves == null ? null : leaves.apply(formula);
      return leaf != null ? leaf : new StateSlot(slot.index());
    }
    Formula.Operation operation = (Formula.Operation) formula;
    List<Formula> parts = operation.parts();
    Op op = operation.op();
    if (op == Op.ADD) {
      if (parts.size() == 2) {
        Evaluator left = compile(parts.get(0), own, leaves);
        return new Add(left, compile(parts.get(1), own, leaves));
      }
      Evaluator[] terms = new Evaluator[parts.size()];
      for (int i = 0; i < terms.length; i++) {
        terms[i] = compile(parts.get(i), own, leaves);
      }
      return new Sum(terms);
    }
    if (op.arity() == 1) {
      return new Unary(op, compile(parts.get(0), own, leaves));
    }
    Evaluator left = compile(parts.get(0), own, leaves);
    Evaluator right = compile(parts.get(1), own, leaves);
    if (op == Op.MULTIPLY && (isIndicator(parts.get(0)) || isIndicator(parts.get(1)))) {
      boolean leftIndicator = isIndicator(parts.get(0));
      return leftIndicator ? new Selected(left, right) : new Selected(right, left);
    }
    switch (op) {
      case SUBTRACT:
        return new Subtract(left, right);
      case MULTIPLY:
        return new Multiply(left, right);
      case DIVIDE:
        return new Divide(left, right);
      case POWER:
        return new Power(left, right);
      case ABOVE:
      case BELOW:
      case EQUAL:
        return new Indicator(op, left, right);
      default:
        return new Extremum(op == Op.MAX, left, right);
    }
  }

  private static boolean isIndicator(Formula f) {
    return f instanceof Formula.Operation o && o.op() == Op.EQUAL;
  }

  /**
   * {@code [g = k] * option}, one option of an unknown index: the option is evaluated only when
   * the indicator is 1, so an option that is infinite or NaN where it is not selected (a rate
   * {@code exp(eta[k])} that overflowed) gives 0, not {@code 0 * inf = NaN}, and an unselected
   * option costs nothing.
   */
  private static final class Selected extends Pair {
    Selected(Evaluator indicator, Evaluator option) {
      super(indicator, option);
    }

    @Override
    double eval(Frame frame) {
      if (left.eval(frame) == 0) {
        frame.slope = 0;
        return 0;
      }
      return right.eval(frame);
    }
  }

  private static final class Constant extends Evaluator {
    private final double value;

    Constant(double value) {
      this.value = value;
    }

    @Override
    double eval(Frame frame) {
      frame.slope = 0;
      return value;
    }
  }

  /** A number of a template read from its column at the frame's row ({@link Frame#row}). */
  static Evaluator rowNumber(double[] values) {
    return new RowNumber(values);
  }

  /** Another unknown's value, its slot read from a column at the frame's row. */
  static Evaluator rowSlot(int[] slots) {
    return new RowSlot(slots);
  }

  private static final class RowNumber extends Evaluator {
    private final double[] values;

    RowNumber(double[] values) {
      this.values = values;
    }

    @Override
    double eval(Frame frame) {
      frame.slope = 0;
      return values[frame.row];
    }
  }

  private static final class RowSlot extends Evaluator {
    private final int[] slots;

    RowSlot(int[] slots) {
      this.slots = slots;
    }

    @Override
    double eval(Frame frame) {
      frame.slope = 0;
      return frame.state[slots[frame.row]];
    }
  }

  private static final class Own extends Evaluator {
    @Override
    double eval(Frame frame) {
      frame.slope = 1;
      return frame.x;
    }

    @Override
    boolean fixed() {
      return false;
    }
  }

  private static final class StateSlot extends Evaluator {
    private final int index;

    StateSlot(int index) {
      this.index = index;
    }

    @Override
    double eval(Frame frame) {
      frame.slope = 0;
      return frame.state[index];
    }
  }

  private abstract static class Pair extends Evaluator {
    final Evaluator left;
    final Evaluator right;
    private final boolean fixed;

    Pair(Evaluator left, Evaluator right) {
      this.left = left;
      this.right = right;
      this.fixed = left.fixed() && right.fixed();
    }

    @Override
    final boolean fixed() {
      return fixed;
    }
  }

  private static final class Add extends Pair {
    Add(Evaluator left, Evaluator right) {
      super(left, right);
    }

    @Override
    double eval(Frame frame) {
      double a = left.eval(frame);
      double da = frame.slope;
      double b = right.eval(frame);
      frame.slope += da;
      return a + b;
    }
  }

  private static final class Subtract extends Pair {
    Subtract(Evaluator left, Evaluator right) {
      super(left, right);
    }

    @Override
    double eval(Frame frame) {
      double a = left.eval(frame);
      double da = frame.slope;
      double b = right.eval(frame);
      frame.slope = da - frame.slope;
      return a - b;
    }
  }

  private static final class Multiply extends Pair {
    Multiply(Evaluator left, Evaluator right) {
      super(left, right);
    }

    @Override
    double eval(Frame frame) {
      double a = left.eval(frame);
      double da = frame.slope;
      double b = right.eval(frame);
      double db = frame.slope;
      // Skipping a zero tangent keeps 0 * inf from turning a finite slope into NaN.
      frame.slope = (da == 0 ? 0 : da * b) + (db == 0 ? 0 : a * db);
      return a * b;
    }
  }

  private static final class Divide extends Pair {
    Divide(Evaluator left, Evaluator right) {
      super(left, right);
    }

    @Override
    double eval(Frame frame) {
      double a = left.eval(frame);
      double da = frame.slope;
      double b = right.eval(frame);
      double db = frame.slope;
      double q = a / b;
      frame.slope = (da == 0 ? 0 : da / b) - (db == 0 ? 0 : q * db / b);
      return q;
    }
  }

  private static final class Power extends Pair {
    Power(Evaluator left, Evaluator right) {
      super(left, right);
    }

    @Override
    double eval(Frame frame) {
      double a = left.eval(frame);
      double da = frame.slope;
      double b = right.eval(frame);
      double db = frame.slope;
      double p = Math.pow(a, b);
      double slope = 0;
      if (da != 0) {
        slope += b * Math.pow(a, b - 1) * da;
      }
      if (db != 0) {
        slope += p * Math.log(a) * db;
      }
      frame.slope = slope;
      return p;
    }
  }

  /** A step: its slope is 0 wherever it is defined. */
  private static final class Indicator extends Pair {
    private final Op op;

    Indicator(Op op, Evaluator left, Evaluator right) {
      super(left, right);
      this.op = op;
    }

    @Override
    double eval(Frame frame) {
      double a = left.eval(frame);
      double b = right.eval(frame);
      frame.slope = 0;
      return op.binary(a, b);
    }
  }

  private static final class Extremum extends Pair {
    private final boolean max;

    Extremum(boolean max, Evaluator left, Evaluator right) {
      super(left, right);
      this.max = max;
    }

    @Override
    double eval(Frame frame) {
      double a = left.eval(frame);
      double da = frame.slope;
      double b = right.eval(frame);
      boolean takeLeft = max ? a >= b : a <= b;
      if (takeLeft) {
        frame.slope = da;
        return a;
      }
      return b;
    }
  }

  private static final class Sum extends Evaluator {
    private final Evaluator[] terms;
    private final boolean fixed;

    Sum(Evaluator[] terms) {
      this.terms = terms;
      boolean allFixed = true;
      for (Evaluator term : terms) {
        allFixed &= term.fixed();
      }
      this.fixed = allFixed;
    }

    @Override
    double eval(Frame frame) {
      double total = 0;
      double slope = 0;
      for (Evaluator term : terms) {
        total += term.eval(frame);
        slope += frame.slope;
      }
      frame.slope = slope;
      return total;
    }

    @Override
    boolean fixed() {
      return fixed;
    }
  }

  private static final class Unary extends Evaluator {
    private final Op op;
    private final Evaluator operand;

    Unary(Op op, Evaluator operand) {
      this.op = op;
      this.operand = operand;
    }

    @Override
    double eval(Frame frame) {
      double a = operand.eval(frame);
      double da = frame.slope;
      double value = op.unary(a);
      frame.slope = da == 0 ? 0 : op.unaryDerivative(a, value) * da;
      return value;
    }

    @Override
    boolean fixed() {
      return operand.fixed();
    }
  }
}

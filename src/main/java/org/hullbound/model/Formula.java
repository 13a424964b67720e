package org.hullbound.model;

import java.util.List;
import java.util.Set;
import org.hullbound.lang.SourcePosition;

/**
 * An expression of the model resolved to one element: every index evaluated, every {@code let}
 * inlined, every {@code sum} expanded, every data value a constant and every unknown a slot of
 * the state vector.
 *
 * <p>The form that the Markov-blanket search, the log-concavity and conjugacy analyses and the
 * compiler to {@link Evaluator}s all work on; it never refers back to the syntax tree.
 */
sealed interface Formula {

  /**
   * A known number; element {@code element} of {@code cells} is the data cell it came from, or
   * {@code cells} is {@code null}.
   *
   * <p>The cell's position is worked out when a message asks for it ({@link #origin()}), not held:
   * a model bound to millions of rows has one constant per data value it reads, and one {@link
   * SourcePosition} each would cost more than the constant.
   */
  record Constant(double value, Cells cells, int element) implements Formula {

    /** The data cell this number came from, or {@code null} for a number of the model itself. */
    SourcePosition origin() {
      return cells == null ? null : cells.at(element);
    }
  }

  /**
   * Where the elements of one data name were written, looked up by element; one instance per
   * data name, shared by all its constants.
   */
  interface Cells {
    SourcePosition at(int element);
  }

  /** The unknown in slot {@code index} of the state vector. */
  record Slot(int index) implements Formula {}

  /** An operator or function applied to its parts. */
  record Operation(Op op, List<Formula> parts) implements Formula {
    public Operation {
      parts = List.copyOf(parts);
    }
  }

  /** The number {@code value}, not from a data cell; small whole numbers are shared. */
  static Constant constant(double value) {
    if (value >= 0 && value < SmallWholeNumbers.COUNT && value == Math.rint(value)
        && Double.doubleToRawLongBits(value) != Double.doubleToRawLongBits(-0.0)) {
      return SmallWholeNumbers.ALL.get((int) value);
    }
    return new Constant(value, null, -1);
  }

  /**
   * One constant for each of 0 .. 1023: observed counts and 0/1 outcomes, one per row, then
   * cost no object each.
   */
  final class SmallWholeNumbers {
    static final int COUNT = 1024;
    static final List<Constant> ALL =
        java.util.stream.IntStream.range(0, COUNT).mapToObj(k -> new Constant(k, null, -1))
            .toList();

    private SmallWholeNumbers() {}
  }

  /** Adds every slot this formula reads to {@code into}. */
  default void collectSlots(Set<Integer> into) {
    if (this instanceof Slot slot) {
      into.add(slot.index());
    } else if (this instanceof Operation operation) {
      for (Formula part : operation.parts()) {
        part.collectSlots(into);
      }
    }
  }

  /** True when the formula reads slot {@code index}. */
  default boolean reads(int index) {
    if (this instanceof Slot slot) {
      return slot.index() == index;
    }
    if (this instanceof Operation operation) {
      for (Formula part : operation.parts()) {
        if (part.reads(index)) {
          return true;
        }
      }
    }
    return false;
  }

  /** True when the formula reads no unknown at all. */
  default boolean known() {
    return this instanceof Constant;
  }

  /** True when a part not differentiable everywhere (abs, min, max) reads slot {@code index}. */
  default boolean kinkedIn(int index) {
    if (this instanceof Operation operation) {
      if (!operation.op().smooth() && reads(index)) {
        return true;
      }
      for (Formula part : operation.parts()) {
        if (part.kinkedIn(index)) {
          return true;
        }
      }
    }
    return false;
  }
}

package org.hullbound.lang;

import java.util.List;

/**
 * An expression of the model language: numbers, indexed names, arithmetic, function calls and
 * {@code sum(set: body)} reductions.
 *
 * <p>A sealed tree of records, so that later stages (binding, compilation, analysis) can switch
 * over every form and the compiler tells them when a form is added.
 */
public sealed interface Expression {

  SourcePosition position();

  /** A numeric literal; {@code inf} is {@link Double#POSITIVE_INFINITY}. */
  record Number(double value, SourcePosition position) implements Expression {}

  /** A name, with its indexes if any: {@code a}, {@code a[i]}, {@code effect[bench_of[tray]]}. */
  record Name(Identifier name, List<Expression> indexes, SourcePosition position)
      implements Expression {
    public Name {
      indexes = List.copyOf(indexes);
    }
  }

  /** {@code -operand}. */
  record Negation(Expression operand, SourcePosition position) implements Expression {}

  /** A binary arithmetic operation; the position is that of the operator. */
  record Binary(Operator operator, Expression left, Expression right, SourcePosition position)
      implements Expression {}

  /** A call of one of the language's functions, such as {@code log(x)} or {@code max(a, b)}. */
  record Call(Identifier function, List<Expression> arguments, SourcePosition position)
      implements Expression {
    public Call {
      arguments = List.copyOf(arguments);
    }
  }

  /**
   * A reduction over an index set, {@code sum(set: body)}, {@code max(set: body)} or {@code
   * min(set: body)}: inside {@code body} the set's name stands for the current element. The
   * largest and smallest are for {@code check} statements only (the parser refuses them
   * elsewhere), where a kink costs nothing.
   */
  record Sum(Identifier indexSet, Expression body, SourcePosition position, Reduction reduction)
      implements Expression {
    /** A plain sum. */
    public Sum(Identifier indexSet, Expression body, SourcePosition position) {
      this(indexSet, body, position, Reduction.SUM);
    }
  }

  /** What a {@link Sum} does with its terms; the word is the one written before the parenthesis. */
  enum Reduction {
    SUM("sum"),
    MAX("max"),
    MIN("min");

    private final String word;

    Reduction(String word) {
      this.word = word;
    }

    /** As written: {@code sum}, {@code max}, {@code min}. */
    public String word() {
      return word;
    }
  }

  /** The binary operators, loosest first; {@code ^} binds tightest and groups to the right. */
  enum Operator {
    ADD("+"),
    SUBTRACT("-"),
    MULTIPLY("*"),
    DIVIDE("/"),
    POWER("^");

    private final String symbol;

    Operator(String symbol) {
      this.symbol = symbol;
    }

    public String symbol() {
      return symbol;
    }
  }
}

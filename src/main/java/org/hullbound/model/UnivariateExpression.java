package org.hullbound.model;

import java.util.List;
import java.util.Map;
import org.hullbound.lang.Expression;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.NameSuggestion;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.SourceText;

/**
 * An expression of the model language in one variable {@code x}, compiled once so that each call
 * returns its value and its derivative in x (forward-mode dual numbers).
 *
 * <p>Why: {@code hullbound draw --log-density EXPR} samples a log-density typed on the command
 * line, and the tangent form of adaptive rejection sampling (Gilks and Wild 1992) needs h and h'
 * at every new abscissa. It reuses the binder's {@link Formula} (constants folded) and the
 * compiled {@link Evaluator}s of the model's conditionals, so the functions mean exactly what they
 * mean in a model file. Any name but {@code x}, an index, or a {@code sum} is refused with a
 * {@link ModelException} pointing at it.
 *
 * <pre>{@code
 * UnivariateExpression h =
 *     UnivariateExpression.parse("<--log-density>", "-x^2/2 - 3*log1p(exp(-x))");
 * UnivariateExpression.ValueAndSlope at = h.evaluate(0.5);   // at.value(), at.slope()
 * }</pre>
 */
public final class UnivariateExpression {

  /** The name of the variable. */
  public static final String VARIABLE = "x";

  private static final int SLOT = 0;
  private static final double[] NO_STATE = new double[0];

  private final String text;
  private final Evaluator evaluator;
  private final boolean readsVariable;
  private final boolean smooth;

  private UnivariateExpression(String text, Formula formula) {
    this.text = text;
    this.evaluator = Evaluator.compile(formula, SLOT);
    this.readsVariable = formula.reads(SLOT);
    this.smooth = !formula.kinkedIn(SLOT);
  }

  /** A value and the derivative in x at one point. */
  public record ValueAndSlope(double value, double slope) {}

  /**
   * Parses and compiles {@code text}.
   *
   * @param fileName the name shown in messages, e.g. {@code <--log-density>}
   * @throws ModelException at a syntax error, a name other than {@code x}, an index or a sum
   */
  public static UnivariateExpression parse(String fileName, String text) {
    Expression expression = Parser.parseExpression(fileName, text);
    SourceText source = SourceText.of(fileName, text);
    return new UnivariateExpression(text, new Resolver(source).resolve(expression));
  }

  /** The expression as typed. */
  public String text() {
    return text;
  }

  /** The value and derivative at {@code x}; NaN or infinities where the expression has them. */
  public ValueAndSlope evaluate(double x) {
    Frame frame = new Frame(x, NO_STATE);
    double value = evaluator.eval(frame);
    return new ValueAndSlope(value, frame.slope);
  }

  /** The value at {@code x}. */
  public double value(double x) {
    return evaluator.eval(new Frame(x, NO_STATE));
  }

  /** False when the expression does not depend on x at all. */
  public boolean readsVariable() {
    return readsVariable;
  }

  /** False when abs, min or max of something depending on x makes a kink. */
  public boolean smooth() {
    return smooth;
  }

  /** Turns the syntax tree into a folded formula with x in slot 0. */
  private static final class Resolver implements ExpressionLowering.Leaves {
    private final SourceText source;
    private final ExpressionLowering lowering;

    Resolver(SourceText source) {
      this.source = source;
      this.lowering = new ExpressionLowering(this, this::error);
    }

    Formula resolve(Expression e) {
      return lowering.lower(e, Map.of());
    }

    @Override
    public Formula sum(Expression.Sum sum, Map<String, Integer> env) {
      throw error(sum.position(), "sum(" + sum.indexSet().text() + ": ...) needs an index set,"
          + " and an expression in x has none", "write the terms out one by one");
    }

    @Override
    public boolean sums() {
      return false;
    }

    @Override
    public Formula name(Expression.Name reference, Map<String, Integer> env) {
      String name = reference.name().text();
      if (!name.equals(VARIABLE)) {
        throw error(reference.name().position(), "unknown name '" + name + "'; the only variable"
            + " here is " + VARIABLE, NameSuggestion.hint(name, List.of(VARIABLE)));
      }
      if (!reference.indexes().isEmpty()) {
        throw error(reference.indexes().get(0).position(), VARIABLE + " is a single number and"
            + " takes no index", "write " + VARIABLE + " alone");
      }
      return new Formula.Slot(SLOT);
    }

    private ModelException error(SourcePosition position, String problem, String hint) {
      return ModelException.at(source, position, problem, hint);
    }
  }
}

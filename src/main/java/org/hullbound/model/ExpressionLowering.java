package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.hullbound.lang.Expression;
import org.hullbound.lang.Functions;
import org.hullbound.lang.NameSuggestion;

/**
 * Lowers an expression of the model language to a folded {@link Formula}: numbers, operators and
 * functions here, the same everywhere the language is read, so that a function means one thing in
 * a model file and in {@code draw --log-density}; names and sums by the place being read
 * ({@link Leaves}), which alone knows what a name refers to.
 */
final class ExpressionLowering {

  /** What the place being read makes of names and sums. */
  interface Leaves {
    /** The formula of {@code reference} with the index sets in {@code env} bound. */
    Formula name(Expression.Name reference, Map<String, Integer> env);

    /** The formula of {@code sum} with the index sets in {@code env} bound. */
    Formula sum(Expression.Sum sum, Map<String, Integer> env);

    /** Whether {@code sum(set: ...)} may be written here (named in the unknown-function message). */
    boolean sums();
  }

  private final Leaves leaves;
  private final BindingErrors errors;

  ExpressionLowering(Leaves leaves, BindingErrors errors) {
    this.leaves = leaves;
    this.errors = errors;
  }

  /** Lowers {@code e} with the index sets in {@code env} bound to the given elements. */
  Formula lower(Expression e, Map<String, Integer> env) {
    if (e instanceof Expression.Number number) {
      return Formula.constant(number.value());
    }
    if (e instanceof Expression.Negation negation) {
      return Formulas.apply(Op.NEGATE, List.of(lower(negation.operand(), env)));
    }
    if (e instanceof Expression.Binary binary) {
      return Formulas.apply(operator(binary),
          List.of(lower(binary.left(), env), lower(binary.right(), env)));
    }
    if (e instanceof Expression.Call call) {
      return call(call, env);
    }
    if (e instanceof Expression.Sum sum) {
      return leaves.sum(sum, env);
    }
    return leaves.name((Expression.Name) e, env);
  }

  /** The operator of {@code binary}. */
  static Op operator(Expression.Binary binary) {
    return switch (binary.operator()) {
      case ADD -> Op.ADD;
      case SUBTRACT -> Op.SUBTRACT;
      case MULTIPLY -> Op.MULTIPLY;
      case DIVIDE -> Op.DIVIDE;
      case POWER -> Op.POWER;
    };
  }

  private Formula call(Expression.Call call, Map<String, Integer> env) {
    String name = call.function().text();
    Op op = Op.function(name);
    if (op == null) {
      throw errors.at(
          call.function().position(),
          "unknown function '" + name + "'; the functions are "
              + String.join(", ", Functions.names()) + (leaves.sums() ? ", and sum(set: ...)" : ""),
          NameSuggestion.hint(name, Functions.names()));
    }
    if (call.arguments().size() != op.arity()) {
      throw errors.at(
          call.function().position(),
          name + " takes " + op.arity() + " argument" + (op.arity() == 1 ? "" : "s") + ", got "
              + call.arguments().size(),
          null);
    }
    List<Formula> parts = new ArrayList<>();
    for (Expression argument : call.arguments()) {
      parts.add(lower(argument, env));
    }
    return Formulas.apply(op, parts);
  }
}

package org.hullbound.model;

import static org.hullbound.model.Binder.number;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.hullbound.lang.Expression;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.Statement;
import org.hullbound.model.family.Categorical;
import org.hullbound.model.family.Parametrisation;
import org.hullbound.model.family.SupportKind;

/**
 * The term phase of binding: one {@link Term} per element of each line with a distribution (a
 * prior or a likelihood), its arguments resolved and checked where they are known, its
 * truncation bounds, its observed value checked against the family's support, and the censored
 * rows of a line with a {@code censored} clause.
 */
final class TermBinding {
  private final BindingScope scope;
  private final DataBinding data;
  private final ModelLowering lowering;
  private final Map<Node, CensoredRows> censoredRows = new HashMap<>();
  /** Each node's statement formula, or an empty optional where its rows are lowered one by one. */
  private final Map<Node, java.util.Optional<StatementFormula>> statements = new HashMap<>();
  /** How many times a statement's expressions were lowered for one row (a regression count). */
  private long rowLowerings;

  TermBinding(BindingScope scope, DataBinding data, ModelLowering lowering) {
    this.scope = scope;
    this.data = data;
    this.lowering = lowering;
  }

  /** The term of element {@code e} of {@code node}, its arguments checked where known. */
  Term term(Node node, int e) {
    return term(node, e, true);
  }

  /**
   * The term of element {@code e} of {@code node} made again, without the checks that {@link
   * #term} made of it when binding ({@link TermTable}).
   */
  Term madeAgain(Node node, int e) {
    StatementFormula statement = statement(node);
    Term term = statement == null ? null : statement.term(e);
    return term != null ? term : term(node, e, false);
  }

  /** The statement formula of {@code node}, or {@code null} where its rows are lowered one by one. */
  StatementFormula statement(Node node) {
    return statements.computeIfAbsent(node, n -> java.util.Optional.ofNullable(
        StatementFormula.of(n, scope, data, lowering, censoring(n) != null))).orElse(null);
  }

  /** The term of element {@code e} of {@code node} lowered for that row, unchecked (for tests). */
  Term lowered(Node node, int e) {
    return term(node, e, false);
  }

  /**
   * How many terms were made by lowering their statement's expressions for their row, binding's
   * checked terms included: a statement formula makes a row's term without.
   */
  long rowLowerings() {
    return rowLowerings;
  }

  /** How many let elements lowering resolved from the let's syntax, binding's included. */
  long letLowerings() {
    return lowering.letLowerings();
  }

  /**
   * The statement formula from which binding checks the rows of {@code node} ({@link
   * #checkedFromStatement}), or {@code null} where each row's term is made to check it.
   */
  StatementFormula checkingStatement(Node node) {
    StatementFormula statement = statement(node);
    return statement != null && statement.checksRows() ? statement : null;
  }

  /**
   * Whether row {@code e} of {@code node} ({@code statement} its {@link #checkingStatement})
   * passes every check {@link #term} makes, worked out from its statement formula in numbers,
   * with no formula or term made ({@link StatementFormula#evaluateRow}); the slots its arguments
   * read are then in {@code check}. {@code false} where the statement cannot say (no statement
   * formula) or the row has a fault: its term must then be made by {@link #term}, which names
   * the fault as binding always did.
   */
  boolean checkedFromStatement(
      Node node, StatementFormula statement, int e, StatementFormula.RowCheck check) {
    if (statement == null || !statement.evaluateRow(e, check)) {
      return false;
    }
    Parametrisation p = node.parametrisation;
    double[] known = check.known;
    for (int k = 0; k < known.length; k++) {
      if (check.isKnown[k] && p.checkArgument(k, known[k]) != null) {
        return false;
      }
    }
    if (check.allKnown && p.checkArguments(known) != null) {
      return false;
    }
    boolean truncated = statement.truncated();
    if (truncated && !(check.lower < check.upper)) {
      return false;
    }
    if (node.slots[e] < 0) {
      double y = node.values[e];
      return outsideSupport(y, p, known, check.allKnown) == null
          && (!truncated || y >= check.lower && y <= check.upper);
    }
    return true;
  }

  private Term term(Node node, int e, boolean check) {
    rowLowerings++;
    int[] index = node.index(e);
    Map<String, Integer> env = ElementNames.environment(node.indexSets, index);
    Parametrisation p = node.parametrisation;
    List<Formula> args = new ArrayList<>();
    boolean allKnown = true;
    Expression[] argumentExpressions = node.argumentExpressions;
    if (Categorical.takesVector(p)) {
      argumentExpressions = VectorArgument.expand(node.argumentExpressions[0], this::vectorSet,
          scope::error);
      p = Categorical.withCategories(p, argumentExpressions.length);
    }
    for (Expression a : argumentExpressions) {
      Formula f = lowering.resolve(a, env);
      args.add(f);
      allKnown &= f.known();
    }
    double[] known = new double[args.size()];
    for (int k = 0; k < known.length; k++) {
      known[k] = args.get(k) instanceof Formula.Constant c ? c.value() : Double.NaN;
    }
    for (int k = 0; check && k < known.length; k++) {
      String problem = args.get(k) instanceof Formula.Constant c ? p.checkArgument(k, c.value())
          : null;
      if (problem != null) {
        SourcePosition origin = ((Formula.Constant) args.get(k)).origin();
        throw scope.error(
            origin != null ? origin : argumentExpressions[k].position(),
            "invalid arguments of " + p.family().name() + " for '" + node.label(e) + "': " + problem,
            null);
      }
    }
    if (check && allKnown) {
      String problem = p.checkArguments(known);
      if (problem != null) {
        throw scope.error(
            node.argumentExpressions[0].position(),
            "invalid arguments of " + p.family().name() + " for '" + node.label(e) + "': " + problem,
            null);
      }
    }
    double lower = Double.NEGATIVE_INFINITY;
    double upper = Double.POSITIVE_INFINITY;
    boolean truncated = node.distribution.truncation() != null;
    if (truncated) {
      lower = knownBound(node.distribution.truncation().lower(), env, "lower");
      upper = knownBound(node.distribution.truncation().upper(), env, "upper");
      if (check && !(lower < upper)) {
        throw scope.error(
            node.distribution.truncation().position(),
            "within " + number(lower) + " .. " + number(upper) + " is empty; the lower bound must be below the"
                + " upper",
            null);
      }
    }
    if (censoredRow(node, e)) {
      return censoring(node).term(
          node.names(), e, args, truncated ? new Term.Within(lower, upper) : null, env,
          node.position());
    }
    int slot = node.slots[e];
    Formula value;
    if (slot >= 0) {
      value = lowering.slot(slot);
    } else {
      double y = node.values[e];
      value = Formula.constant(y);
      String problem = !check ? null : outsideSupport(y, p, known, allKnown);
      if (check && problem == null && truncated && !(y >= lower && y <= upper)) {
        problem = "it lies outside within " + number(lower) + " .. " + number(upper);
      }
      if (problem != null) {
        SourcePosition cell = data.cellOf(node, e);
        SourcePosition at = cell != null ? cell : node.position();
        throw scope.error(at, "'" + node.label(e) + "' = " + number(y) + " is not a valid value of "
            + p.family().name() + ": " + problem, null);
      }
    }
    return new Term(
        node.names(), e, slot >= 0 ? null : data.cells(node), p, value, args, truncated ? new Term.Within(lower, upper) : null, slot,
        node.position());
  }

  /** The censored rows of {@code node}, or {@code null} when its line has no censored clause. */
  private CensoredRows censoring(Node node) {
    if (!(node.statement instanceof Statement.Data data) || data.censoring() == null) {
      return null;
    }
    return censoredRows.computeIfAbsent(
        node, n -> CensoredRows.of(data.censoring(), n.parametrisation, lowering::resolve, scope::error));
  }

  /** True when element {@code e} of modelled data {@code node} is a censored row. */
  boolean censoredRow(Node node, int e) {
    CensoredRows rows = censoring(node);
    if (rows == null) {
      return false;
    }
    int[] index = node.index(e);
    Map<String, Integer> env = ElementNames.environment(node.indexSets, index);
    return rows.censored(env, node.label(e));
  }

  /** The one index set of the node called {@code name}, for {@link VectorArgument}. */
  private VectorArgument.Shape vectorSet(String name) {
    Node node = scope.nodes.get(name);
    if (node == null || node.indexSets == null) {
      return null;
    }
    List<IndexSet> list = node.indexSets;
    return new VectorArgument.Shape(node.kindWord(), list.size(),
        list.isEmpty() ? null : list.get(0));
  }

  private double knownBound(Expression e, Map<String, Integer> env, String which) {
    Formula f = lowering.resolve(e, env);
    if (!(f instanceof Formula.Constant c)) {
      throw scope.error(e.position(), "the " + which + " bound of within must be known (data or a"
          + " number), not depend on an unknown", null);
    }
    return c.value();
  }

  /** Why {@code y} lies outside the support of {@code p}, or {@code null} when it does not. */
  private static String outsideSupport(
      double y, Parametrisation p, double[] known, boolean allKnown) {
    boolean whole = y == Math.rint(y);
    String family = p.family().name();
    SupportKind kind = p.support();
    String problem =
        switch (kind) {
          case REAL -> null;
          case POSITIVE -> y > 0 ? null : "it must be > 0";
          case UNIT_INTERVAL -> y > 0 && y < 1 ? null : "it must lie strictly between 0 and 1";
          case BETWEEN_FIRST_TWO_ARGUMENTS -> !Double.isNaN(known[0]) && !(y >= known[0])
              || !Double.isNaN(known[1]) && !(y <= known[1])
              ? "it must lie between " + number(known[0]) + " and " + number(known[1]) : null;
          case COUNT -> !whole ? "it is not a whole number, and " + family + " needs a count"
              : y < 0 ? "it is negative, and " + family + " needs a count 0, 1, 2, ..." : null;
          case COUNT_UP_TO_FIRST_ARGUMENT -> !whole
              ? "it is not a whole number, and " + family + " needs a count"
              : y < 0 ? "it is negative, and " + family + " needs a count 0, 1, 2, ..."
              : !Double.isNaN(known[0]) && y > known[0]
                  ? "it exceeds " + p.argumentNames().get(0) + " = " + number(known[0]) : null;
          case BINARY -> y == 0 || y == 1 ? null : "it must be 0 or 1";
          case WHOLE_BETWEEN_FIRST_TWO_ARGUMENTS, CATEGORY -> !whole
              ? "it is not a whole number, and " + family + " needs one" : null;
        };
    if (problem == null && allKnown) {
      problem = p.checkValue(y, known);
    }
    return problem;
  }
}

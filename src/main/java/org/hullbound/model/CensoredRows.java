package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.hullbound.lang.Censoring;
import org.hullbound.lang.Expression;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.SourcePosition;
import org.hullbound.model.family.Censored;
import org.hullbound.model.family.Parametrisation;

/**
 * The rows of one modelled data name that a {@code censored lo .. hi [when flag]} clause applies
 * to: which rows are censored, their limits, and their terms ({@link Censored}).
 *
 * <p>A row is censored when the clause has no {@code when}, or when its flag is 1; a row whose
 * flag is 0 is an exact observation like any other (an empty value cell there is a missing
 * observation, imputed as usual). The value cell of a censored row is not read, so it may be
 * empty. Each check throws a {@link ModelException} at the data cell (or the clause) at fault.
 */
final class CensoredRows {

  /** Resolves an expression of the model with the statement's index sets bound. */
  @FunctionalInterface
  interface Resolver {
    Formula resolve(Expression expression, Map<String, Integer> env);
  }

  private final Censoring clause;
  private final Parametrisation observed;
  private final Parametrisation censored;
  private final Resolver resolver;
  private final BindingErrors errors;

  private CensoredRows(
      Censoring clause, Parametrisation observed, Parametrisation censored, Resolver resolver,
      BindingErrors errors) {
    this.clause = clause;
    this.observed = observed;
    this.censored = censored;
    this.resolver = resolver;
    this.errors = errors;
  }

  /**
   * The censored rows of a data line with {@code clause} and family {@code observed}.
   *
   * @throws ModelException when the family has no distribution function (a discrete family)
   */
  static CensoredRows of(
      Censoring clause, Parametrisation observed, Resolver resolver, BindingErrors errors) {
    Parametrisation censored = Censored.of(observed).orElseThrow(() -> errors.at(
        clause.position(),
        "censoring needs a continuous family with a distribution function, and "
            + observed.family().name() + " is discrete",
        "censor a continuous quantity (normal, lognormal, weibull, gamma, exponential, ...), or"
            + " model the count exactly"));
    return new CensoredRows(clause, observed, censored, resolver, errors);
  }

  /** Whether the row bound in {@code env} (element {@code label}) is censored. */
  boolean censored(Map<String, Integer> env, String label) {
    if (clause.when() == null) {
      return true;
    }
    Formula.Constant flag = known(clause.when(), env, "the flag after 'when'");
    if (flag.value() != 0 && flag.value() != 1) {
      throw errors.at(
          at(flag, clause.when()),
          "the flag after 'when' is " + Binder.number(flag.value()) + " for '" + label
              + "'; it must be 1 (censored) or 0 (seen exactly)",
          null);
    }
    return flag.value() == 1;
  }

  /**
   * The term of a censored row: {@code log P(lo < X <= hi)} with its limits, cut to the
   * truncation range {@code within} when there is one.
   *
   * @param args the family's arguments, already checked by the binder
   */
  Term term(
      ElementNames names, int element, List<Formula> args, Term.Within within,
      Map<String, Integer> env, SourcePosition position) {
    String label = names.label(element);
    Formula.Constant lower = known(clause.lower(), env, "the lower limit after 'censored'");
    Formula.Constant upper = known(clause.upper(), env, "the upper limit after 'censored'");
    double lo = lower.value();
    double hi = upper.value();
    if (lo > hi) {
      throw errors.at(
          at(lower, clause.lower()),
          "the lower limit " + Binder.number(lo) + " of '" + label + "' is above its upper limit "
              + Binder.number(hi),
          "a censored value lies between lo and hi, lo < hi, as in 'censored lo .. hi'");
    }
    if (lo == hi) {
      throw errors.at(
          at(lower, clause.lower()),
          "the limits of '" + label + "' are both " + Binder.number(lo)
              + ": a value censored to a single point has probability 0",
          clause.when() == null
              ? "give the rows seen exactly a 0/1 flag with 'censored lo .. hi when flag'"
              : "a value seen exactly belongs in the value column, with its flag 0");
    }
    if (within != null) {
      lo = Math.max(lo, within.lower());
      hi = Math.min(hi, within.upper());
      if (!(lo < hi)) {
        throw errors.at(
            at(lower, clause.lower()),
            "the censoring limits " + Binder.number(lower.value()) + " .. "
                + Binder.number(upper.value()) + " of '" + label + "' lie outside within "
                + Binder.number(within.lower()) + " .. " + Binder.number(within.upper()),
            null);
      }
    }
    String outside = outsideSupport(lo, hi, args);
    if (outside != null) {
      throw errors.at(
          at(upper, clause.upper()),
          "the censoring limits " + Binder.number(lo) + " .. " + Binder.number(hi) + " of '" + label
              + "' lie outside the values of " + observed.family().name() + ": " + outside,
          null);
    }
    List<Formula> arguments = new ArrayList<>(args.size() + 1);
    arguments.addAll(args);
    arguments.add(Formula.constant(hi));
    return new Term(
        names, element, null, censored, Formula.constant(lo), arguments, within, -1, position);
  }

  /** Why no value of the family lies in {@code (lo, hi]}, or {@code null}. */
  private String outsideSupport(double lo, double hi, List<Formula> args) {
    return switch (observed.support()) {
      case POSITIVE -> hi <= 0 ? "they must reach above 0" : null;
      case UNIT_INTERVAL -> hi <= 0 || lo >= 1 ? "they must overlap (0, 1)" : null;
      case BETWEEN_FIRST_TWO_ARGUMENTS -> args.get(0) instanceof Formula.Constant a
          && hi <= a.value() || args.get(1) instanceof Formula.Constant b && lo >= b.value()
          ? "they must overlap (lower, upper)" : null;
      default -> null;
    };
  }

  private Formula.Constant known(Expression e, Map<String, Integer> env, String what) {
    Formula f = resolver.resolve(e, env);
    if (!(f instanceof Formula.Constant c)) {
      throw errors.at(
          e.position(),
          what + " must be known (data or a number), not depend on an unknown",
          "read the limits from data columns, as in 'censored seen[row] .. inf'");
    }
    return c;
  }

  private static SourcePosition at(Formula.Constant value, Expression written) {
    SourcePosition cell = value.origin();
    return cell != null ? cell : written.position();
  }
}

package org.hullbound.model;

import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import org.hullbound.model.family.ArgumentRange;
import org.hullbound.model.family.Censored;
import org.hullbound.model.family.Curvature;
import org.hullbound.model.family.Scale;

/**
 * Chooses each unknown's sampling scale and update from its Markov blanket: a conjugate pair
 * when one is recognised, adaptive rejection when rules over families and affine links prove the
 * conditional log-concave on a scale, a fallback otherwise.
 *
 * <p>The rules (each sound on its own; a sum of concave functions is concave):
 *
 * <ol>
 *   <li>The unknown's own term uses its family's curvature in the value on the candidate scale
 *       (the family includes the log-Jacobian of the log or logit map).
 *   <li>A dependent term in which the unknown enters one argument only: on the natural scale, if
 *       the argument is affine in the unknown, the family's curvature in that argument on the
 *       natural scale decides (concave composed with affine is concave); if the argument is
 *       {@code exp(affine)} or {@code expit(affine)}, its curvature on the log or logit scale
 *       decides. On the log scale, a monomial argument {@code c * x^q} ({@code q != 0}; {@code c}
 *       a known positive number, or free of the unknown in an argument whose range is positive
 *       or a probability, which forces {@code c > 0}) has {@code log(arg) = log c + q u}, affine
 *       in {@code u}, so the family's curvature in that argument on the log scale decides. On
 *       the logit scale the argument must be the unknown.
 *   <li>Anything else (the unknown in two arguments, a non-affine link, a truncated term whose
 *       normaliser moves) is "not provably log-concave".
 *   <li>A censored observation's term, {@code log P(lo < X <= hi)}, is a term like the others
 *       whose family ({@code censored weibull}, ...) states its own curvature in each argument
 *       ({@code model.family.CensoredCurvature}: Prekopa 1973, Bagnoli and Bergstrom 2005); rule 2
 *       applies to it unchanged.
 * </ol>
 *
 * <p>A support cut by dependent arguments with a bounded range ({@link ArgumentBounds}) changes
 * none of this (a concave function stays concave on an interval); the reason says so.
 *
 * <p>Why scale parameters go on the log scale: for {@code sigma ~ half-normal(sd = s)} with
 * normal children, in {@code u = log sigma} the conditional is {@code u - e^{2u}/(2 s^2) - n u
 * - S e^{-2u}/2} (S the sum of squared residuals), whose second derivative {@code -2 e^{2u}/s^2
 * - 2 S e^{-2u}} is negative everywhere: log-concave, while on the natural scale the {@code -n
 * log sigma} term alone would need checking against the rest.
 */
final class UpdateAnalysis {

  /** The chosen scale and update of one unknown. */
  record Choice(Scale scale, Update update) {}

  private UpdateAnalysis() {}

  /** The scales worth trying for a support, preferred first. */
  static List<Scale> candidates(Term own, boolean truncated, boolean discrete) {
    if (discrete || truncated) {
      return List.of(Scale.NATURAL);
    }
    switch (own.family().support()) {
      case POSITIVE:
        return List.of(Scale.LOG, Scale.NATURAL);
      case UNIT_INTERVAL:
        return List.of(Scale.LOGIT, Scale.NATURAL);
      default:
        return List.of(Scale.NATURAL);
    }
  }

  static Choice choose(int slot, Term own, List<Term> dependents, boolean discrete,
      boolean imputed, ArgumentBounds cuts) {
    return choose(slot, own, dependents, discrete, imputed, cuts,
        smooth(slot, own, dependents));
  }

  /**
   * As above with {@code smooth} ({@link #smooth}) already known: it walks every term's formulas,
   * so a caller that needs it too computes it once (an intercept of millions of rows).
   */
  static Choice choose(int slot, Term own, List<Term> dependents, boolean discrete,
      boolean imputed, ArgumentBounds cuts, boolean smooth) {
    List<Scale> scales = candidates(own, own.truncated(), discrete);
    Update.Conjugate conjugate = ConjugatePairs.detect(slot, own, dependents, imputed);
    Verdict first = null;
    Scale chosen = null;
    for (Scale scale : scales) {
      Verdict verdict = concavity(slot, own, dependents, scale, imputed);
      if (first == null) {
        first = verdict;
      }
      if (verdict.concave && chosen == null) {
        chosen = scale;
        first = verdict;
      }
    }
    Scale scale = chosen != null ? chosen : scales.get(0);
    if (conjugate != null) {
      return new Choice(scale, conjugate);
    }
    if (discrete) {
      Update exact = DiscreteAnalysis.choose(slot, own, dependents, imputed);
      if (exact != null) {
        return new Choice(scale, exact);
      }
      return new Choice(
          scale,
          new Update.Fallback(
              "a missing count that other terms depend on is discrete; adaptive rejection needs"
                  + " a continuous unknown",
              false));
    }
    String reason = cuts.none() ? first.reason : first.reason + "; " + cuts.reason();
    if (chosen != null) {
      return new Choice(scale, new Update.AdaptiveRejection(reason, smooth));
    }
    return new Choice(scale, new Update.Fallback(reason, smooth));
  }

  /** True unless a term is not differentiable in the unknown. */
  static boolean smooth(int slot, Term own, List<Term> dependents) {
    for (Term t : dependents) {
      if (!smooth(slot, t)) {
        return false;
      }
    }
    return smooth(slot, own);
  }

  /** True unless {@code t} is not differentiable in the unknown in slot {@code slot}. */
  private static boolean smooth(int slot, Term t) {
    for (Formula a : t.arguments()) {
      if (a.kinkedIn(slot)) {
        return false;
      }
    }
    if (t.familyName().equals("laplace")) {
      Formula location = t.argument("location");
      if (t.value().reads(slot) || (location != null && location.reads(slot))) {
        return false;
      }
    }
    if (t.family().support() == org.hullbound.model.family.SupportKind
            .BETWEEN_FIRST_TWO_ARGUMENTS
        && (t.arguments().get(0).reads(slot) || t.arguments().get(1).reads(slot))) {
      return false;
    }
    return true;
  }

  private record Verdict(boolean concave, String reason) {}

  /**
   * How argument {@code k} of {@code t} is log-affine in the unknown on the log scale, in words,
   * or {@code null} when it is not: a monomial {@code c * x^q} ({@link Formulas#monomial}) with
   * {@code q != 0} has {@code log(arg) = log c + q u}, affine in {@code u = log x}, where {@code c
   * > 0}. That holds when {@code c} is a known positive number, and also when {@code c} reads
   * other unknowns or data but the argument's range is positive or a probability: at any state of
   * nonzero density the argument is then {@code > 0} (or {@code 0} for every {@code x}, a term
   * constant in it), and {@code x^q > 0}, so {@code c > 0}. A gamma {@code rate = a / m} is {@code
   * a * m^-1}: in {@code u = log m}, {@code log(rate) = log a - u}.
   */
  private static String logAffine(Term t, int k, Formula argument, int slot) {
    Formulas.Monomial m = Formulas.monomial(argument, slot);
    double q = m == null ? Double.NaN : m.power();
    if (!Double.isFinite(q) || q == 0) {
      return null;
    }
    if (m.coefficient() instanceof Formula.Constant c
        && c.value() > 0 && c.value() < Double.POSITIVE_INFINITY) {
      return q == 1 ? "a positive multiple of the unknown"
          : "a positive multiple of a power of the unknown";
    }
    ArgumentRange range = t.family().argumentRange(k);
    if (!(range.lower() >= 0)) {
      return null;
    }
    String name = t.argumentName(k);
    String form = q == 1 ? "c * unknown" : q == -1 ? "c / unknown" : "c * unknown^" + number(q);
    String slope = Math.abs(q) == 1 ? "" : number(Math.abs(q)) + " ";
    return name + " = " + form + " with c free of the unknown (a valid " + name + " forces c "
        + (range.lower() > 0 || !range.closed() ? "> 0" : ">= 0") + "), so log(" + name
        + ") = log(c) " + (q < 0 ? "- " : "+ ") + slope + "log(unknown) is affine on the log"
        + " scale";
  }

  private static String number(double q) {
    return q == Math.rint(q) && Math.abs(q) < 1e6 ? Long.toString((long) q) : Double.toString(q);
  }

  private static Verdict concavity(
      int slot, Term own, List<Term> dependents, Scale scale, boolean imputed) {
    String where = " on the " + scale.name().toLowerCase(java.util.Locale.ROOT) + " scale";
    Curvature prior = own.family().curvatureInValue(scale, own.knownArguments());
    String ownWord = imputed ? "likelihood" : "prior";
    if (!prior.concave()) {
      return new Verdict(
          false,
          "not provably log-concave" + where + ": the " + own.familyName() + " " + ownWord + " is "
              + "not (" + prior.reason() + ")");
    }
    Set<String> pieces = new LinkedHashSet<>();
    TermTable.Rows rows = dependents instanceof TermTable.Rows r ? r : null;
    StatementFormula.ArgumentAnswers answered = new StatementFormula.ArgumentAnswers();
    java.util.function.IntPredicate unknown = read -> read == slot;
    java.util.function.BiFunction<org.hullbound.model.family.Parametrisation, Integer, Object>
        affinePieceHere = (family, a) -> affinePiece(family, a, where);
    StatementFormula lastStatement = null;
    int onlyArgument = StatementFormula.READ_THE_TERM;
    Object lastPiece = null;
    for (int i = 0; i < dependents.size(); i++) {
      StatementFormula statement = rows == null || scale != Scale.NATURAL ? null
          : rows.statement(i);
      if (statement != null && statement.affineInEveryUnknown()) {
        // answered from the statement, the row only for which argument reads the unknown, and
        // not even that where one argument alone can read it (a dependent row reads it there)
        if (statement != lastStatement) {
          lastStatement = statement;
          onlyArgument = statement.onlyArgumentReading(unknown);
        }
        int k = onlyArgument >= 0 ? onlyArgument : statement.movingArgument(rows.row(i), unknown);
        if (k == StatementFormula.NO_ARGUMENT) {
          continue;
        }
        Object answer = k < 0 ? null
            : answered.of(statement, k, affinePieceHere);
        if (answer instanceof Verdict failed) {
          return failed;
        }
        if (answer != null) {
          if (answer != lastPiece) {
            pieces.add((String) answer);
            lastPiece = answer;
          }
          if (onlyArgument >= 0) {
            // the statement's answer holds for each of its rows here: past them at once
            i = rows.runEnd(i) - 1;
          }
          continue;
        }
      }
      Term t = dependents.get(i);
      List<Integer> moving = new ArrayList<>();
      for (int k = 0; k < t.arguments().size(); k++) {
        if (t.arguments().get(k).reads(slot)) {
          moving.add(k);
        }
      }
      if (moving.isEmpty()) {
        continue;
      }
      if (moving.size() > 1) {
        List<String> names = new ArrayList<>();
        for (int k : moving) {
          names.add(t.argumentName(k));
        }
        return new Verdict(
            false,
            "not provably log-concave" + where + ": the unknown enters both "
                + String.join(" and ", names) + " of " + termName(t));
      }
      if (t.truncated()) {
        return new Verdict(
            false,
            "not provably log-concave" + where + ": " + termName(t)
                + " is truncated and its normaliser moves with the unknown");
      }
      int k = moving.get(0);
      Formula argument = t.arguments().get(k);
      String argumentName = t.argumentName(k);
      Scale argumentScale = null;
      String link = null;
      if (scale == Scale.NATURAL) {
        if (Formulas.affine(argument, slot)) {
          argumentScale = Scale.NATURAL;
          link = "affine in the unknown";
        } else if (Formulas.unwrap(argument, Op.EXP) != null
            && Formulas.affine(Formulas.unwrap(argument, Op.EXP), slot)) {
          argumentScale = Scale.LOG;
          link = "exp of an affine function of the unknown";
        } else if (Formulas.unwrap(argument, Op.EXPIT) != null
            && Formulas.affine(Formulas.unwrap(argument, Op.EXPIT), slot)) {
          argumentScale = Scale.LOGIT;
          link = "expit of an affine function of the unknown";
        }
      } else if (scale == Scale.LOG) {
        link = logAffine(t, k, argument, slot);
        argumentScale = link == null ? null : Scale.LOG;
      } else if (argument instanceof Formula.Slot) {
        argumentScale = Scale.LOGIT;
        link = "the unknown itself";
      }
      if (argumentScale == null) {
        return new Verdict(
            false,
            "not provably log-concave" + where + ": " + argumentName + " of " + termName(t)
                + " is not an affine (or log-affine) function of the unknown");
      }
      Curvature c = t.family().curvatureInArgument(k, argumentScale, t.knownArguments());
      if (!c.concave()) {
        return new Verdict(
            false,
            "not provably log-concave" + where + ": " + t.familyName() + " is not concave in "
                + argumentName + " (" + c.reason() + ")");
      }
      if (scale == Scale.LOG && Double.isNaN(Formulas.power(argument, slot))
          || Censored.isCensored(t.family())) {
        // the monomial rule with a coefficient that reads other unknowns, or a censored term's
        // rule (CensoredCurvature): the whole proof
        String in = argumentScale == Scale.LOG ? "log(" + argumentName + ")" : argumentName;
        pieces.add(t.familyName() + " terms concave in " + in + " (" + c.reason() + "); " + link);
      } else {
        pieces.add(t.familyName() + " terms concave in " + argumentName + ", " + link);
      }
    }
    StringBuilder reason = new StringBuilder("log-concave" + where + ": ");
    reason.append(own.familyName()).append(' ').append(ownWord).append(" (")
        .append(prior.reason()).append(')');
    for (String piece : pieces) {
      reason.append("; ").append(piece);
    }
    return new Verdict(true, reason.toString());
  }

  /**
   * The piece of the natural scale's proof that a term of {@code family} gives when its argument
   * {@code k} alone reads the unknown, affinely, and no argument is known (a {@link
   * StatementFormula#affineInEveryUnknown} statement's rows), or the verdict that defeats it: the
   * same words as the term-by-term rule above.
   */
  private static Object affinePiece(
      org.hullbound.model.family.Parametrisation family, int k, String where) {
    double[] known = new double[family.argumentNames().size()];
    java.util.Arrays.fill(known, Double.NaN);
    String familyName = family.family().name();
    String argumentName = family.argumentNames().get(k);
    String link = "affine in the unknown";
    Curvature c = family.curvatureInArgument(k, Scale.NATURAL, known);
    if (!c.concave()) {
      return new Verdict(
          false,
          "not provably log-concave" + where + ": " + familyName + " is not concave in "
              + argumentName + " (" + c.reason() + ")");
    }
    if (Censored.isCensored(family)) {
      return familyName + " terms concave in " + argumentName + " (" + c.reason() + "); " + link;
    }
    return familyName + " terms concave in " + argumentName + ", " + link;
  }

  /** {@code bernoulli term recovered[3]}: made only for a message, as labels are not held. */
  private static String termName(Term t) {
    return t.familyName() + " term " + t.label();
  }
}

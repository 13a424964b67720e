package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;
import org.hullbound.lang.ModelException;
import org.hullbound.model.family.Curvature;
import org.hullbound.model.family.Scale;

/**
 * Chooses the exact update of a whole-valued unknown (a discrete {@code param}, or a missing count
 * that other terms read) from its Markov blanket.
 *
 * <ol>
 *   <li>A finite support (bernoulli, binomial, categorical, whole-uniform, or any discrete family
 *       truncated by {@code within lo .. hi} with both ends finite) is enumerated: always exact.
 *   <li>A count with an unbounded support is drawn by the integer hull when its conditional is
 *       proved discretely log-concave (differences {@code h(k + 1) - h(k)} non-increasing; a sum of
 *       such sequences is one): the own term's log mass is concave in its whole value ({@code
 *       Parametrisation#curvatureInWholeValue}: poisson, binomial, negative-binomial with a known
 *       size >= 1), and every dependent term reads the count in one argument only, either a
 *       real argument affine in it (or {@code exp}/{@code expit} of an affine function) whose
 *       family is concave there (a concave function of a real argument has non-increasing
 *       differences along equally spaced points), or a whole argument (binomial {@code trials})
 *       equal to {@code c +- count} whose log mass is concave in it.
 *   <li>Otherwise a param is refused, with the reason and the way out (a {@code within} bound makes
 *       the support finite); a missing count keeps the whole-step Metropolis fallback ({@code
 *       null} here), as before discrete params existed.
 * </ol>
 */
final class DiscreteAnalysis {
  private DiscreteAnalysis() {}

  /**
   * The discrete update of slot {@code slot}, or {@code null} for a missing count whose conditional
   * is not provably log-concave on an unbounded support.
   *
   * @throws ModelException for a param in that case, at its declaration
   */
  static Update choose(int slot, Term own, List<Term> dependents, boolean imputed) {
    boolean finite = own.family().support().finite()
        || (own.truncated() && Double.isFinite(own.lower()) && Double.isFinite(own.upper()));
    String proof = logConcavity(slot, own, dependents, imputed);
    boolean logConcave = proof.startsWith("log-concave");
    if (finite) {
      return new Update.Discrete(
          "finite support: drawn exactly by enumerating the conditional log mass"
              + (logConcave ? " (" + proof + ")" : ""),
          true, logConcave);
    }
    if (logConcave) {
      return new Update.Discrete(proof + "; drawn exactly by the integer hull", false, true);
    }
    if (imputed) {
      return null;
    }
    throw new ModelException(
        own.position(), null,
        "the whole-valued unknown '" + own.label() + "' has an unbounded support and its"
            + " conditional is " + proof + ", so hullbound cannot draw it exactly",
        "bound it with within 0 .. N (its conditional is then enumerated), or write the terms"
            + " that read it so that they are concave in it");
  }

  /** "log-concave in the whole value: ..." with the proof, or "not provably ..." with why. */
  private static String logConcavity(
      int slot, Term own, List<Term> dependents, boolean imputed) {
    Curvature prior = own.family().curvatureInWholeValue(own.knownArguments());
    String ownWord = imputed ? "likelihood" : "prior";
    if (!prior.concave()) {
      return "not provably log-concave in the whole value: the " + own.familyName() + " "
          + ownWord + " is not (" + prior.reason() + ")";
    }
    List<String> pieces = new ArrayList<>();
    pieces.add(own.familyName() + " " + ownWord + " (" + prior.reason() + ")");
    for (Term t : dependents) {
      int moving = -1;
      for (int k = 0; k < t.arguments().size(); k++) {
        if (t.arguments().get(k).reads(slot)) {
          if (moving >= 0) {
            return "not provably log-concave in the whole value: it enters both "
                + t.argumentName(moving) + " and " + t.argumentName(k) + " of " + name(t);
          }
          moving = k;
        }
      }
      if (moving < 0) {
        continue;
      }
      if (t.truncated()) {
        return "not provably log-concave in the whole value: " + name(t)
            + " is truncated and its normaliser moves with it";
      }
      Piece piece = argumentPiece(t, moving, slot);
      if (!piece.concave()) {
        return "not provably log-concave in the whole value: " + piece.reason();
      }
      if (!pieces.contains(piece.reason())) {
        pieces.add(piece.reason());
      }
    }
    return "log-concave in the whole value: " + String.join("; ", pieces);
  }

  /** Whether a dependent term is concave in the count, and why (or why not). */
  private record Piece(boolean concave, String reason) {}

  /** Why term {@code t} is concave in the count through argument {@code k}, or why not. */
  private static Piece argumentPiece(Term t, int k, int slot) {
    Formula argument = t.arguments().get(k);
    String argumentName = t.argumentName(k);
    if (t.family().checkArgument(k, 0.5) != null) {
      // a whole-number argument: c + count or c - count keeps whole steps
      Formula[] parts = Formulas.affineParts(argument, slot);
      boolean unitStep = parts != null && parts[1] instanceof Formula.Constant b
          && Math.abs(b.value()) == 1;
      if (!unitStep) {
        return new Piece(false, argumentName + " of " + name(t) + " is not c + count or c - count");
      }
      Curvature c = t.family().curvatureInWholeArgument(k, t.knownArguments());
      return new Piece(c.concave(), c.concave()
          ? t.familyName() + " terms concave in " + argumentName + " (" + c.reason() + ")"
          : t.familyName() + " is not concave in " + argumentName + " (" + c.reason() + ")");
    }
    Scale scale = null;
    String link = null;
    if (Formulas.affine(argument, slot)) {
      scale = Scale.NATURAL;
      link = "affine in the count";
    } else if (Formulas.unwrap(argument, Op.EXP) != null
        && Formulas.affine(Formulas.unwrap(argument, Op.EXP), slot)) {
      scale = Scale.LOG;
      link = "exp of an affine function of the count";
    } else if (Formulas.unwrap(argument, Op.EXPIT) != null
        && Formulas.affine(Formulas.unwrap(argument, Op.EXPIT), slot)) {
      scale = Scale.LOGIT;
      link = "expit of an affine function of the count";
    }
    if (scale == null) {
      return new Piece(false, argumentName + " of " + name(t) + " is not an affine (or exp/expit"
          + " of an affine) function of the count");
    }
    Curvature c = t.family().curvatureInArgument(k, scale, t.knownArguments());
    return new Piece(c.concave(), c.concave()
        ? t.familyName() + " terms concave in " + argumentName + ", " + link
        : t.familyName() + " is not concave in " + argumentName + " (" + c.reason() + ")");
  }

  private static String name(Term t) {
    return t.familyName() + " term " + t.label();
  }
}

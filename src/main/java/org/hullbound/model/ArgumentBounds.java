package org.hullbound.model;

import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import org.hullbound.model.family.ArgumentRange;
import org.hullbound.model.family.SupportKind;

/**
 * The interval of one unknown's natural values on which every argument of its dependent terms that
 * has a bounded range stays in that range: a binomial {@code p = alpha + beta * dose[i]} must stay
 * in [0, 1] for every observation, a Poisson {@code rate = a + b * x[i]} above 0. Outside it the
 * full conditional is zero, so this interval, intersected with the own term's support, is the
 * support that the sampler is given.
 *
 * <p>Each such argument of a recognised form gives an interval, and the support is their
 * intersection, recomputed from the other unknowns' current values at every draw:
 *
 * <ul>
 *   <li>{@code a + b x} (affine, {@code a} and {@code b} free of x) in {@code (L, U)}: {@code x}
 *       between {@code (L - a)/b} and {@code (U - a)/b};
 *   <li>{@code exp(a + b x)}: {@code a + b x} in {@code (log L, log U)}; {@code expit(a + b
 *       x)}: {@code a + b x} in {@code (logit L, logit U)} (no cut for [0, 1] or (0, inf));
 *   <li>{@code c x^q} for a positive unknown ({@code x > 0}, {@code c} free of it): {@code log c
 *       + q log x} in {@code (log L, log U)}, so {@code log x} is cut as an affine form is.
 * </ul>
 *
 * <p>An argument of any other form that reads the unknown gives no interval; the compiled
 * conditional still returns {@code -inf} wherever a moving argument leaves its range, so a
 * sampler that can meet such points (a fallback) rejects them.
 */
final class ArgumentBounds {

  /** How the argument is made from the affine form {@code eta = a + b w}. */
  private enum Link {
    /** {@code arg = eta}, {@code w = x}. */
    IDENTITY,
    /** {@code arg = exp(eta)}, {@code w = x}. */
    EXP,
    /** {@code arg = expit(eta)}, {@code w = x}. */
    EXPIT,
    /** {@code arg = exp(eta) = c x^q}: {@code eta = log c + q log x}, {@code w = log x}. */
    MONOMIAL
  }

  /** One argument's cut: {@code eta = a + b w} must lie in {@code (low, high)}. */
  private record Cut(Evaluator intercept, Evaluator slope, double low, double high, boolean log) {

    /** Narrows {@code interval} (natural scale, {lower, upper}) to this cut at {@code frame}. */
    void narrow(Frame frame, double[] interval) {
      double a = intercept.eval(frame);
      double b = slope.eval(frame);
      double from;
      double to;
      if (b > 0) {
        from = (low - a) / b;
        to = (high - a) / b;
      } else if (b < 0) {
        from = (high - a) / b;
        to = (low - a) / b;
      } else {
        // b = 0 (or NaN at an invalid state): the argument does not move with x here.
        return;
      }
      if (log) {
        from = Math.exp(from);
        to = Math.exp(to);
      }
      // NaN (an infinite a, say) never narrows: the comparisons are false.
      if (from > interval[0]) {
        interval[0] = from;
      }
      if (to < interval[1]) {
        interval[1] = to;
      }
    }
  }

  private static final ArgumentBounds NONE =
      new ArgumentBounds(new Cut[0], Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, "");

  private final Cut[] moving;
  private final double fixedLower;
  private final double fixedUpper;
  private final String reason;

  private ArgumentBounds(Cut[] moving, double fixedLower, double fixedUpper, String reason) {
    this.moving = moving;
    this.fixedLower = fixedLower;
    this.fixedUpper = fixedUpper;
    this.reason = reason;
  }

  /**
   * The cuts that the arguments of {@code dependents} reading slot {@code slot} make; a cut that
   * is free of other unknowns and leaves the own support {@code (ownLower, ownUpper)} whole (NaN
   * where an end moves) is dropped, as {@code shape = k} for a positive {@code k} is.
   */
  static ArgumentBounds of(
      int slot, Term own, List<Term> dependents, double ownLower, double ownUpper) {
    SupportKind support = own.family().support();
    boolean positive = support == SupportKind.POSITIVE || support == SupportKind.UNIT_INTERVAL;
    List<Cut> movingCuts = new ArrayList<>();
    double[] fixed = {Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY};
    Set<String> what = new LinkedHashSet<>();
    boolean readsOthers = false;
    Frame empty = new Frame(Double.NaN, new double[0]);
    for (Term t : dependents) {
      for (int k = 0; k < t.arguments().size(); k++) {
        Formula argument = t.arguments().get(k);
        ArgumentRange range = t.family().argumentRange(k);
        // The range first: it is a field, the formula a walk (once per row of the data).
        if (!range.bounded() || !argument.reads(slot)) {
          continue;
        }
        Formula[] parts = null;
        Link link = null;
        if (Formulas.affine(argument, slot)) {
          parts = Formulas.affineParts(argument, slot);
          link = Link.IDENTITY;
        } else if (Formulas.unwrap(argument, Op.EXP) != null
            && Formulas.affine(Formulas.unwrap(argument, Op.EXP), slot)) {
          parts = Formulas.affineParts(Formulas.unwrap(argument, Op.EXP), slot);
          link = Link.EXP;
        } else if (Formulas.unwrap(argument, Op.EXPIT) != null
            && Formulas.affine(Formulas.unwrap(argument, Op.EXPIT), slot)) {
          parts = Formulas.affineParts(Formulas.unwrap(argument, Op.EXPIT), slot);
          link = Link.EXPIT;
        } else if (positive) {
          Formulas.Monomial m = Formulas.monomial(argument, slot);
          if (m != null && m.power() != 0 && Double.isFinite(m.power())) {
            parts = new Formula[] {
              Formulas.apply(Op.LOG, List.of(m.coefficient())), Formula.constant(m.power())
            };
            link = Link.MONOMIAL;
          }
        }
        if (parts == null || parts[1] instanceof Formula.Constant c && c.value() == 0) {
          continue;
        }
        double low = inverse(link, range.lower());
        double high = inverse(link, range.upper());
        if (low == Double.NEGATIVE_INFINITY && high == Double.POSITIVE_INFINITY) {
          continue;
        }
        if (parts[0] instanceof Formula.Constant c && c.value() == 0 && low == 0
            && high == Double.POSITIVE_INFINITY && ownLower >= 0) {
          // b x > 0 for a positive x: b > 0 at any valid state, and then every x > 0 qualifies.
          continue;
        }
        Cut cut = new Cut(Evaluator.compile(parts[0], -1), Evaluator.compile(parts[1], -1),
            low, high, link == Link.MONOMIAL);
        if (parts[0].known() && parts[1].known()) {
          double[] alone = {Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY};
          cut.narrow(empty, alone);
          if (alone[0] <= ownLower && alone[1] >= ownUpper) {
            continue;
          }
          cut.narrow(empty, fixed);
        } else {
          movingCuts.add(cut);
          readsOthers = true;
        }
        what.add("every " + t.familyName() + " " + t.argumentName(k) + " stays in " + range);
      }
    }
    if (what.isEmpty()) {
      return NONE;
    }
    String reason = "support cut to where " + String.join(" and ", what)
        + (readsOthers ? ", recomputed from the other unknowns at every draw" : "");
    return new ArgumentBounds(movingCuts.toArray(new Cut[0]), fixed[0], fixed[1], reason);
  }

  /** The ends of the range of {@code eta} for which the link gives an argument in range. */
  private static double inverse(Link link, double end) {
    switch (link) {
      case IDENTITY:
        return end;
      case EXP:
      case MONOMIAL:
        return end <= 0 ? Double.NEGATIVE_INFINITY : Math.log(end);
      default:
        if (end <= 0) {
          return Double.NEGATIVE_INFINITY;
        }
        return end >= 1 ? Double.POSITIVE_INFINITY : Math.log(end) - Math.log1p(-end);
    }
  }

  /** True when no argument cuts the support. */
  boolean none() {
    return reason.isEmpty();
  }

  /** True when the cut does not depend on the other unknowns. */
  boolean fixed() {
    return moving.length == 0;
  }

  /**
   * The support's lower end {@code lower} cut by this where both are constants (natural scale),
   * else NaN: a conditional's bound for every state, asked for before every draw.
   */
  double constantLower(Formula lower) {
    return lower instanceof Formula.Constant c && fixed()
        ? Math.max(c.value(), lower(new double[0])) : Double.NaN;
  }

  /** As {@link #constantLower}, for the upper end. */
  double constantUpper(Formula upper) {
    return upper instanceof Formula.Constant c && fixed()
        ? Math.min(c.value(), upper(new double[0])) : Double.NaN;
  }

  /** The lower end of the cut on the natural scale ({@code -inf} when none). */
  double lower(double[] state) {
    return narrowed(state)[0];
  }

  /** The upper end of the cut on the natural scale ({@code inf} when none). */
  double upper(double[] state) {
    return narrowed(state)[1];
  }

  private double[] narrowed(double[] state) {
    double[] interval = {fixedLower, fixedUpper};
    if (moving.length > 0) {
      Frame frame = new Frame(Double.NaN, state);
      for (Cut cut : moving) {
        cut.narrow(frame, interval);
      }
    }
    return interval;
  }

  /** For {@code check}: which arguments cut the support, or "" when none does. */
  String reason() {
    return reason;
  }
}

package org.hullbound.model;

import java.util.List;
import org.hullbound.model.family.ArgumentRange;
import org.hullbound.model.family.Parametrisation;
import org.hullbound.model.family.Scale;

/**
 * A full conditional compiled from its Markov blanket: one {@link Evaluator} tree per argument of
 * each term, the family's own log-density (with its normalising constants) per term, the
 * truncation normaliser where the arguments move, and the change of variable to the sampling
 * scale with its log-Jacobian.
 *
 * <p>Change of variable (any textbook on densities of transformed variables): for {@code x =
 * g(u)} the density of {@code u} is {@code p(g(u)) |g'(u)|}. On the log scale {@code g(u) =
 * exp(u)}, {@code log g' = u}; on the logit scale {@code g(u) = expit(u)}, {@code log g' =
 * log x + log(1 - x)} with derivative {@code 1 - 2x}.
 *
 * <p>The support is the own term's, cut by {@link ArgumentBounds} to where the dependent terms'
 * arguments stay in range; a moving argument outside its range (at a point no bound foresaw)
 * makes the value {@code -inf}, as the density is zero there.
 */
final class CompiledConditional implements ConditionalDensity {
  private final Unknown unknown;
  private final Scale scale;
  private final TermEvaluator[] terms;
  private final boolean[] aritiesUsed;
  private final Evaluator lower;
  private final Evaluator upper;
  private final ArgumentBounds cuts;
  /**
   * The bounds on the sampling scale where they are constants, NaN where they move with the
   * state: adaptive rejection asks for them before every draw.
   */
  private final double constantLower;
  private final double constantUpper;
  private final boolean smooth;

  CompiledConditional(
      Unknown unknown, List<Term> blanket, Formula lower, Formula upper, ArgumentBounds cuts,
      boolean smooth) {
    this.unknown = unknown;
    this.scale = unknown.scale();
    int slot = unknown.index();
    this.terms = new TermEvaluator[blanket.size()];
    int maxArity = 0;
    for (Term t : blanket) {
      maxArity = Math.max(maxArity, t.arguments().size());
    }
    this.aritiesUsed = new boolean[maxArity + 1];
    for (int i = 0; i < terms.length; i++) {
      terms[i] = new TermEvaluator(blanket.get(i), slot, scale);
      aritiesUsed[blanket.get(i).arguments().size()] = true;
    }
    this.lower = Evaluator.compile(lower, -1);
    this.upper = Evaluator.compile(upper, -1);
    this.cuts = cuts;
    double[] none = new double[0];
    this.constantLower = lower instanceof Formula.Constant c && cuts.fixed()
        ? toSamplingScale(Math.max(c.value(), cuts.lower(none))) : Double.NaN;
    this.constantUpper = upper instanceof Formula.Constant c && cuts.fixed()
        ? toSamplingScale(Math.min(c.value(), cuts.upper(none))) : Double.NaN;
    this.smooth = smooth;
  }

  @Override
  public Unknown unknown() {
    return unknown;
  }

  @Override
  public Scale scale() {
    return scale;
  }

  @Override
  public boolean smooth() {
    return smooth;
  }

  @Override
  public int termCount() {
    return terms.length;
  }

  @Override
  public double logDensity(double u, double[] state, double[] slope) {
    double x = toNatural(u);
    Frame frame = new Frame(x, state, aritiesUsed);
    double lo = lower.eval(frame);
    double hi = upper.eval(frame);
    if (!(x >= lo && x <= hi)) {
      if (slope != null) {
        slope[0] = 0;
      }
      return Double.NEGATIVE_INFINITY;
    }
    double total = 0;
    double dx = 0;
    double du = 0;
    for (TermEvaluator term : terms) {
      total += term.eval(frame);
      if (term.slopeOnSamplingScale) {
        du += frame.slope;
      } else {
        dx += frame.slope;
      }
    }
    double logJacobian;
    double dxdu;
    double dLogJacobian;
    switch (scale) {
      case LOG:
        logJacobian = u;
        dxdu = x;
        dLogJacobian = 1;
        break;
      case LOGIT:
        logJacobian = Op.logInverseLogit(u) + Op.logInverseLogit(-u);
        dxdu = x * (1 - x);
        dLogJacobian = 1 - 2 * x;
        break;
      default:
        logJacobian = 0;
        dxdu = 1;
        dLogJacobian = 0;
    }
    double value = total + logJacobian;
    if (Double.isNaN(value)) {
      value = Double.NEGATIVE_INFINITY;
    }
    if (slope != null) {
      double s = (dx == 0 ? 0 : dx * dxdu) + du + dLogJacobian;
      // Where the density is zero (an argument underflowed or moved out of its range, say), the
      // slope has no meaning; 0 as outside the support, never NaN.
      slope[0] = value == Double.NEGATIVE_INFINITY ? 0 : s;
    }
    return value;
  }

  @Override
  public double toNatural(double u) {
    switch (scale) {
      case LOG:
        return Math.exp(u);
      case LOGIT:
        return Op.inverseLogit(u);
      default:
        return u;
    }
  }

  @Override
  public double toSamplingScale(double v) {
    switch (scale) {
      case LOG:
        return Math.log(v);
      case LOGIT:
        return Math.log(v) - Math.log1p(-v);
      default:
        return v;
    }
  }

  @Override
  public double lowerBound(double[] state) {
    if (!Double.isNaN(constantLower)) {
      return constantLower;
    }
    return toSamplingScale(
        Math.max(lower.eval(new Frame(Double.NaN, state)), cuts.lower(state)));
  }

  @Override
  public double upperBound(double[] state) {
    if (!Double.isNaN(constantUpper)) {
      return constantUpper;
    }
    return toSamplingScale(
        Math.min(upper.eval(new Frame(Double.NaN, state)), cuts.upper(state)));
  }

  /** One term {@code value ~ family(args)} of the blanket, compiled with the own unknown. */
  private static final class TermEvaluator {
    private final Parametrisation family;
    private final Evaluator value;
    private final Evaluator[] args;
    private final int[] moving;
    /** The ranges of the moving arguments whose range is bounded, else null. */
    private final ArgumentRange[] ranges;
    private final boolean valueMoves;
    private final boolean normalise;
    private final double lower;
    private final double upper;
    private final int arity;
    /**
     * On the log scale, a term whose only moving argument is {@code c x^q} gives its slope in u
     * directly as {@code q} times the family's slope in the log of that argument, so that a
     * natural-scale derivative that overflows (an sd near 1e-144: {@code S / sd^3}) never enters.
     */
    final boolean slopeOnSamplingScale;
    private final double power;

    TermEvaluator(Term term, int slot, Scale scale) {
      this.family = term.family();
      this.value = Evaluator.compile(term.value(), slot);
      this.arity = term.arguments().size();
      this.args = new Evaluator[arity];
      int movingCount = 0;
      for (int k = 0; k < arity; k++) {
        args[k] = Evaluator.compile(term.arguments().get(k), slot);
        movingCount += args[k].fixed() ? 0 : 1;
      }
      this.moving = new int[movingCount];
      for (int k = 0, m = 0; k < arity; k++) {
        if (!args[k].fixed()) {
          moving[m++] = k;
        }
      }
      this.ranges = new ArgumentRange[arity];
      for (int k : moving) {
        ArgumentRange range = family.argumentRange(k);
        ranges[k] = range.bounded() ? range : null;
      }
      this.valueMoves = !value.fixed();
      // The truncation normaliser -log(F(hi) - F(lo)) is constant unless an argument moves.
      this.normalise = term.truncated() && movingCount > 0;
      this.lower = term.lower();
      this.upper = term.upper();
      Formulas.Monomial monomial =
          movingCount == 1 ? Formulas.monomial(term.arguments().get(moving[0]), slot) : null;
      double q = monomial != null ? monomial.power() : Double.NaN;
      this.slopeOnSamplingScale = scale == Scale.LOG && !valueMoves && !normalise
          && Double.isFinite(q) && q != 0;
      this.power = q;
    }

    double eval(Frame frame) {
      double y = value.eval(frame);
      double dy = frame.slope;
      double[] a = frame.args[arity];
      double[] da = frame.argSlopes[arity];
      for (int k = 0; k < arity; k++) {
        a[k] = args[k].eval(frame);
        da[k] = frame.slope;
        if (ranges[k] != null && !ranges[k].contains(a[k])) {
          frame.slope = 0;
          return Double.NEGATIVE_INFINITY;
        }
      }
      double[] g = frame.gradient[arity];
      double logDensity = family.logDensity(y, a, g);
      if (slopeOnSamplingScale) {
        frame.slope = power * family.logArgumentSlope(y, a, moving[0], g);
        return logDensity;
      }
      double slope = valueMoves ? g[0] * dy : 0;
      for (int k : moving) {
        slope += g[1 + k] * da[k];
      }
      if (normalise) {
        double[] ag = frame.argGradient[arity];
        logDensity -= family.logProbabilityBetween(lower, upper, a, ag);
        for (int k : moving) {
          slope -= ag[k] * da[k];
        }
      }
      frame.slope = slope;
      return logDensity;
    }
  }
}

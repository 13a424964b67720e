package org.hullbound.sampling;

import java.util.Arrays;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.optim.MaxEval;
import org.apache.commons.math3.optim.nonlinear.scalar.GoalType;
import org.apache.commons.math3.optim.univariate.BrentOptimizer;
import org.apache.commons.math3.optim.univariate.SearchInterval;
import org.apache.commons.math3.optim.univariate.UnivariateObjectiveFunction;
import org.apache.commons.math3.optim.univariate.UnivariatePointValuePair;

/**
 * Finds {@code sup (log f - log g)} over a support: a scan of a grid laid on a bounded transform of
 * the support, with far-out points toward infinite ends and near points toward finite ones,
 * polished by Brent's method (Brent 1973, via commons-math3) around the best grid point.
 *
 * <p>A scan, not a proof: a narrow spike between grid points can be missed. That is why
 * {@link FixedEnvelopeRejection} also checks every proposal against the bound and throws
 * {@link EnvelopeViolationException} when it is exceeded.
 */
final class EnvelopeBound {
  private static final int GRID = 512;
  /**
   * Far points {@code 2^k} from the centre for k up to this: far enough to see a tail ratio
   * grow, near enough that {@code x * x} in a user's density does not overflow.
   */
  private static final int FAR_EXPONENT = 64;
  /** Closeness in log ratio below which a finite end counts as the maximiser. */
  private static final double END_TOLERANCE = 1e-9;

  private EnvelopeBound() {}

  static double logSupremum(
      DoubleUnaryOperator logDensity, double lower, double upper, Proposal proposal) {
    double[] xs = candidatePoints(lower, upper);
    double[] hs = new double[xs.length];
    int best = -1;
    for (int i = 0; i < xs.length; i++) {
      hs[i] = logRatio(logDensity, proposal, xs[i]);
      if (best < 0 || hs[i] > hs[best]) {
        best = i;
      }
    }
    if (hs[best] == Double.NEGATIVE_INFINITY) {
      throw new IllegalArgumentException(
          "the target log-density is -Infinity at every point searched in [" + lower + ", "
              + upper + "]; it has no mass there");
    }
    checkNotAtOpenEnd(xs, hs, best, lower, upper);
    if (best == 0 || best == xs.length - 1) {
      return hs[best];
    }
    return Math.max(hs[best], polish(logDensity, proposal, xs[best - 1], xs[best + 1]));
  }

  private static double logRatio(DoubleUnaryOperator logDensity, Proposal proposal, double x) {
    double logTarget = logDensity.applyAsDouble(x);
    if (Double.isNaN(logTarget)) {
      throw new DensityEvaluationException("log-density", x, logTarget);
    }
    if (logTarget == Double.NEGATIVE_INFINITY) {
      return Double.NEGATIVE_INFINITY;
    }
    double logProposal = proposal.logDensity(x);
    if (Double.isNaN(logProposal) || logProposal == Double.POSITIVE_INFINITY) {
      throw new DensityEvaluationException("proposal log-density", x, logProposal);
    }
    double h = logTarget - logProposal;
    if (h == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException(
          "the ratio f/g is unbounded: at x = " + x + " log f = " + logTarget + " and log g = "
              + logProposal + "; choose a proposal that covers the target, or give log M");
    }
    return h;
  }

  /**
   * A maximum at the outermost far point, or at the point nearest a finite end while the end
   * itself is lower, means the ratio grows toward that end: no finite M was found. The first
   * largest value is taken, so only at the lower far point can it tie with its neighbour: a ratio
   * flat out there (a proposal equal to the target) is bounded, not growing.
   */
  private static void checkNotAtOpenEnd(
      double[] xs, double[] hs, int best, double lower, double upper) {
    int last = xs.length - 1;
    if (best == 0 && lower == Double.NEGATIVE_INFINITY && hs[0] > hs[1]
        || best == last && upper == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException(
          "the ratio f/g still grows at x = " + xs[best] + " toward "
              + (best == 0 ? "-Infinity" : "+Infinity")
              + ": it appears unbounded there (or its supremum is reached only at infinity);"
              + " choose a proposal with heavier tails, or give log M");
    }
    boolean nearLower = best == 1 && Double.isFinite(lower) && hs[0] + END_TOLERANCE < hs[1];
    boolean nearUpper =
        best == last - 1 && Double.isFinite(upper) && hs[last] + END_TOLERANCE < hs[last - 1];
    if (nearLower || nearUpper) {
      throw new IllegalArgumentException(
          "the ratio f/g grows toward the end " + (nearLower ? lower : upper)
              + " of the support (largest at x = " + xs[best]
              + "): it appears unbounded there; give log M");
    }
  }

  private static double polish(
      DoubleUnaryOperator logDensity, Proposal proposal, double left, double right) {
    BrentOptimizer optimizer = new BrentOptimizer(1e-12, Double.MIN_NORMAL);
    UnivariatePointValuePair result = optimizer.optimize(
        new MaxEval(2000),
        GoalType.MAXIMIZE,
        new SearchInterval(left, right),
        new UnivariateObjectiveFunction(x -> {
          double h = logRatio(logDensity, proposal, x);
          return h == Double.NEGATIVE_INFINITY ? -Double.MAX_VALUE : h;
        }));
    return result.getValue();
  }

  /** Sorted distinct points: finite ends, near-end points, a transformed grid, far points. */
  private static double[] candidatePoints(double lower, double upper) {
    double[] points = new double[2 * (FAR_EXPONENT + 64) + GRID + 2];
    int n = 0;
    boolean finiteLower = Double.isFinite(lower);
    boolean finiteUpper = Double.isFinite(upper);
    double centre = finiteLower ? lower : finiteUpper ? upper : 0.0;
    double width = finiteLower && finiteUpper ? upper - lower : 1.0;
    for (int i = 1; i < GRID; i++) {
      double t = (double) i / GRID;
      points[n++] = fromUnit(t, lower, upper);
    }
    if (finiteLower) {
      points[n++] = lower;
      for (int k = 1; k <= 60; k++) {
        points[n++] = lower + width * Math.scalb(1.0, -k);
      }
    } else {
      for (int k = 0; k <= FAR_EXPONENT; k++) {
        points[n++] = centre - Math.scalb(1.0, k);
      }
    }
    if (finiteUpper) {
      points[n++] = upper;
      for (int k = 1; k <= 60; k++) {
        points[n++] = upper - width * Math.scalb(1.0, -k);
      }
    } else {
      for (int k = 0; k <= FAR_EXPONENT; k++) {
        points[n++] = centre + Math.scalb(1.0, k);
      }
    }
    double[] sorted = Arrays.copyOf(points, n);
    Arrays.sort(sorted);
    return Arrays.stream(sorted)
        .filter(x -> x >= lower && x <= upper && Double.isFinite(x))
        .distinct()
        .toArray();
  }

  /** Maps {@code t} in (0, 1) onto the support, bijectively and monotonically. */
  private static double fromUnit(double t, double lower, double upper) {
    boolean finiteLower = Double.isFinite(lower);
    boolean finiteUpper = Double.isFinite(upper);
    if (finiteLower && finiteUpper) {
      return lower + t * (upper - lower);
    }
    if (finiteLower) {
      return lower + t / (1 - t);
    }
    if (finiteUpper) {
      return upper - (1 - t) / t;
    }
    return (t - 0.5) / (t * (1 - t));
  }
}

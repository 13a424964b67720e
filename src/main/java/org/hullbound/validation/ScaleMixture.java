package org.hullbound.validation;

import java.util.function.DoubleFunction;
import java.util.function.ToDoubleFunction;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;

/**
 * Posterior moments of a location {@code mu} and a scale {@code s} when {@code mu} given {@code s}
 * is normal in closed form, so that only the scale's one-dimensional marginal is integrated
 * numerically, over its whole range {@code (0, upper]} ({@code upper} may be infinite).
 *
 * <p>Why: the scale of a normal model has a power-law posterior tail (under a half-Cauchy prior,
 * {@code tau^-10} for the eight schools). A grid placed at the mean +- 14 sd of a coarse pass cuts
 * that tail off, and refining the grid cannot show it; here the substitution
 * {@code s = c t / (1 - t)} maps {@code (0, inf)} onto {@code (0, 1)}, where the integrand vanishes
 * smoothly at both ends, and the integral is taken by commons-math3's iterative Gauss-Legendre rule
 * (Davis and Rabinowitz 1984, <i>Methods of Numerical Integration</i>, 2.7) to a relative accuracy
 * of {@value #RELATIVE_ACCURACY}. {@code mu}'s moments follow from the law of total expectation and
 * variance over the scale.
 */
final class ScaleMixture {
  /** Relative accuracy asked of each integral: far below every floor of the suite (1e-6 and up). */
  static final double RELATIVE_ACCURACY = 1e-13;

  private static final int POINTS_PER_PIECE = 32;
  private static final int SCAN_POINTS = 4_000;

  /**
   * What is known in closed form at one value of the scale: the log of its unnormalised marginal
   * posterior density, and the mean and variance of {@code mu} given it.
   */
  record GivenScale(double scale, double logWeight, double mean, double variance) {}

  private final DoubleFunction<GivenScale> given;
  private final double typicalScale;
  private final double upperT;
  private final double logWeightShift;
  private final double mass;

  private ScaleMixture(DoubleFunction<GivenScale> given, double typicalScale, double upper) {
    this.given = given;
    this.typicalScale = typicalScale;
    this.upperT = upper == Double.POSITIVE_INFINITY ? 1 : upper / (typicalScale + upper);
    this.logWeightShift = largestLogWeight();
    this.mass = integral(c -> 1);
  }

  /**
   * The mixture over {@code (0, inf)}; {@code typicalScale} (a prior scale or a guess at the
   * posterior's) sets where the substitution puts {@code t = 1/2}.
   */
  static ScaleMixture of(DoubleFunction<GivenScale> given, double typicalScale) {
    return over(given, typicalScale, Double.POSITIVE_INFINITY);
  }

  /** The same with the scale cut at {@code upper}: to show in tests what a cut-off tail costs. */
  static ScaleMixture over(DoubleFunction<GivenScale> given, double typicalScale, double upper) {
    if (!(typicalScale > 0) || typicalScale == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException("typicalScale must be positive and finite, got " + typicalScale);
    }
    if (!(upper > 0)) {
      throw new IllegalArgumentException("upper must be positive, got " + upper);
    }
    return new ScaleMixture(given, typicalScale, upper);
  }

  /** The posterior expectation of {@code g}, a function of what is known given the scale. */
  double expectation(ToDoubleFunction<GivenScale> g) {
    return integral(g) / mass;
  }

  double meanMu() {
    return expectation(GivenScale::mean);
  }

  /** Law of total variance, centred on the overall mean so that nothing cancels. */
  double sdMu() {
    double m = meanMu();
    return Math.sqrt(expectation(c -> c.variance() + (c.mean() - m) * (c.mean() - m)));
  }

  double meanScale() {
    return expectation(GivenScale::scale);
  }

  double sdScale() {
    double m = meanScale();
    return Math.sqrt(expectation(c -> (c.scale() - m) * (c.scale() - m)));
  }

  private double scaleAt(double t) {
    return typicalScale * t / (1 - t);
  }

  /**
   * The largest log-weight on a scan of {@code t}: the weights are divided by its exponential so
   * that neither the integrals nor their ratio can overflow.
   */
  private double largestLogWeight() {
    double max = Double.NEGATIVE_INFINITY;
    for (int i = 1; i < SCAN_POINTS; i++) {
      double logWeight = given.apply(scaleAt(upperT * i / SCAN_POINTS)).logWeight();
      if (logWeight > max) {
        max = logWeight;
      }
    }
    if (!(max > Double.NEGATIVE_INFINITY) || max == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException("the scale's log-weight has no finite maximum (got " + max + ")");
    }
    return max;
  }

  /** {@code int_0^upper w(s) g(s) ds} with {@code ds = c dt / (1 - t)^2}; Gauss nodes avoid t = 0, 1. */
  private double integral(ToDoubleFunction<GivenScale> g) {
    IterativeLegendreGaussIntegrator integrator =
        new IterativeLegendreGaussIntegrator(POINTS_PER_PIECE, RELATIVE_ACCURACY, 0, 3, Integer.MAX_VALUE);
    return integrator.integrate(
        Integer.MAX_VALUE,
        t -> {
          GivenScale at = given.apply(scaleAt(t));
          double weight = Math.exp(at.logWeight() - logWeightShift);
          if (weight == 0) {
            return 0; // g may be infinite where the weight has underflowed (a variance at s = 0)
          }
          return weight * g.applyAsDouble(at) * typicalScale / ((1 - t) * (1 - t));
        },
        0,
        upperT);
  }
}

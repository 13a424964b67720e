package org.hullbound.validation;

import java.util.function.DoubleBinaryOperator;
import java.util.function.DoubleUnaryOperator;

/**
 * Posterior expectations by numerical quadrature of an unnormalised log-density on a grid:
 * composite Simpson's rule in one or two dimensions (Davis and Rabinowitz 1984, <i>Methods of
 * Numerical Integration</i>, 2.2), with the log-density shifted by its grid maximum before
 * exponentiating so that nothing under- or overflows.
 *
 * <p>Why: the validation suite's reference values for models without a closed form come from here,
 * written independently of hullbound's compiled densities. The grid is placed in two passes: a
 * coarse pass over the caller's wide box finds each axis's mean and sd, and the fine pass covers
 * mean +- {@value #HALF_WIDTH_SDS} sd clipped to the box, so a caller need only give a box that
 * surely holds the mass.
 */
final class Quadrature {
  /** Half-width of the fine grid in posterior sds: the mass beyond is negligible for our cases. */
  static final double HALF_WIDTH_SDS = 14;

  private static final int COARSE = 400;

  private Quadrature() {}

  /** Normalised Simpson weights (times the density) of a 1-d grid, and the grid itself. */
  record Grid1(double[] x, double[] weight) {
    double expectation(DoubleUnaryOperator g) {
      double total = 0;
      for (int i = 0; i < x.length; i++) {
        total += weight[i] * g.applyAsDouble(x[i]);
      }
      return total;
    }

    double mean() {
      return expectation(v -> v);
    }

    double sd() {
      double m = mean();
      return Math.sqrt(expectation(v -> (v - m) * (v - m)));
    }
  }

  /** The same in two dimensions: {@code weight[i][j]} at {@code (x[i], y[j])}. */
  record Grid2(double[] x, double[] y, double[][] weight) {
    double expectation(DoubleBinaryOperator g) {
      double total = 0;
      for (int i = 0; i < x.length; i++) {
        for (int j = 0; j < y.length; j++) {
          total += weight[i][j] * g.applyAsDouble(x[i], y[j]);
        }
      }
      return total;
    }

    double meanX() {
      return expectation((a, b) -> a);
    }

    double meanY() {
      return expectation((a, b) -> b);
    }

    double sdX() {
      double m = meanX();
      return Math.sqrt(expectation((a, b) -> (a - m) * (a - m)));
    }

    double sdY() {
      double m = meanY();
      return Math.sqrt(expectation((a, b) -> (b - m) * (b - m)));
    }
  }

  /**
   * The posterior with unnormalised log-density {@code logDensity} on {@code [lo, hi]}, with
   * {@code points} fine grid points (made odd).
   */
  static Grid1 posterior1(DoubleUnaryOperator logDensity, double lo, double hi, int points) {
    Grid1 coarse = grid1(logDensity, lo, hi, COARSE + 1);
    double m = coarse.mean();
    double s = coarse.sd();
    return grid1(logDensity, Math.max(lo, m - HALF_WIDTH_SDS * s), Math.min(hi, m + HALF_WIDTH_SDS * s),
        points | 1);
  }

  /** The 2-d version of {@link #posterior1}: box {@code [xLo, xHi] x [yLo, yHi]}. */
  static Grid2 posterior2(
      DoubleBinaryOperator logDensity, double xLo, double xHi, double yLo, double yHi, int points) {
    Grid2 coarse = grid2(logDensity, xLo, xHi, yLo, yHi, COARSE + 1);
    double mx = coarse.meanX();
    double sx = coarse.sdX();
    double my = coarse.meanY();
    double sy = coarse.sdY();
    return grid2(
        logDensity,
        Math.max(xLo, mx - HALF_WIDTH_SDS * sx), Math.min(xHi, mx + HALF_WIDTH_SDS * sx),
        Math.max(yLo, my - HALF_WIDTH_SDS * sy), Math.min(yHi, my + HALF_WIDTH_SDS * sy),
        points | 1);
  }

  static Grid1 grid1(DoubleUnaryOperator logDensity, double lo, double hi, int points) {
    requireBox(lo, hi, points);
    double[] x = nodes(lo, hi, points);
    double[] simpson = simpsonWeights(points);
    double[] log = new double[points];
    double max = Double.NEGATIVE_INFINITY;
    for (int i = 0; i < points; i++) {
      log[i] = logDensity.applyAsDouble(x[i]);
      max = Math.max(max, log[i]);
    }
    requireMass(max);
    double[] weight = new double[points];
    double total = 0;
    for (int i = 0; i < points; i++) {
      weight[i] = simpson[i] * Math.exp(log[i] - max);
      total += weight[i];
    }
    for (int i = 0; i < points; i++) {
      weight[i] /= total;
    }
    return new Grid1(x, weight);
  }

  static Grid2 grid2(
      DoubleBinaryOperator logDensity, double xLo, double xHi, double yLo, double yHi, int points) {
    requireBox(xLo, xHi, points);
    requireBox(yLo, yHi, points);
    double[] x = nodes(xLo, xHi, points);
    double[] y = nodes(yLo, yHi, points);
    double[] simpson = simpsonWeights(points);
    double[][] log = new double[points][points];
    double max = Double.NEGATIVE_INFINITY;
    for (int i = 0; i < points; i++) {
      for (int j = 0; j < points; j++) {
        log[i][j] = logDensity.applyAsDouble(x[i], y[j]);
        max = Math.max(max, log[i][j]);
      }
    }
    requireMass(max);
    double[][] weight = new double[points][points];
    double total = 0;
    for (int i = 0; i < points; i++) {
      for (int j = 0; j < points; j++) {
        weight[i][j] = simpson[i] * simpson[j] * Math.exp(log[i][j] - max);
        total += weight[i][j];
      }
    }
    for (int i = 0; i < points; i++) {
      for (int j = 0; j < points; j++) {
        weight[i][j] /= total;
      }
    }
    return new Grid2(x, y, weight);
  }

  private static void requireBox(double lo, double hi, int points) {
    if (!(lo < hi) || Double.isInfinite(lo) || Double.isInfinite(hi)) {
      throw new IllegalArgumentException("need finite lo < hi, got " + lo + " and " + hi);
    }
    if (points < 3 || points % 2 == 0) {
      throw new IllegalArgumentException("points must be odd and >= 3, got " + points);
    }
  }

  private static void requireMass(double max) {
    if (!(max > Double.NEGATIVE_INFINITY) || Double.isNaN(max) || max == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException(
          "the log-density has no finite maximum on the grid (got " + max + ")");
    }
  }

  private static double[] nodes(double lo, double hi, int points) {
    double[] x = new double[points];
    double h = (hi - lo) / (points - 1);
    for (int i = 0; i < points; i++) {
      x[i] = lo + i * h;
    }
    x[points - 1] = hi;
    return x;
  }

  /** 1, 4, 2, 4, ..., 2, 4, 1 (the common factor h/3 cancels in the normalisation). */
  private static double[] simpsonWeights(int points) {
    double[] w = new double[points];
    for (int i = 0; i < points; i++) {
      w[i] = i == 0 || i == points - 1 ? 1 : (i % 2 == 1 ? 4 : 2);
    }
    return w;
  }
}

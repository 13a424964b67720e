package org.hullbound.gibbs;

import java.util.List;
import java.util.function.DoubleBinaryOperator;

/**
 * Posterior means and standard deviations of two unknowns by the composite Simpson rule on a
 * rectangle (weights 1, 4, 2, ..., 4, 1 on each axis; any numerical-analysis text), for the
 * quadrature references of the Gibbs tests.
 */
final class SimpsonMoments {
  private SimpsonMoments() {}

  /**
   * {mean a, mean b, sd a, sd b} of the density {@code exp(logDensity(a, b))} on [aLo, aHi] x
   * [bLo, bHi], with {@code n} (even) intervals per axis; {@code -inf} outside a region is zero.
   */
  static double[] of(DoubleBinaryOperator logDensity, double aLo, double aHi, double bLo,
      double bHi, int n) {
    double[] e = expectations(logDensity, aLo, aHi, bLo, bHi, n, List.of(
        (a, b) -> a, (a, b) -> b, (a, b) -> a * a, (a, b) -> b * b));
    return new double[] {e[0], e[1], Math.sqrt(e[2] - e[0] * e[0]),
        Math.sqrt(e[3] - e[1] * e[1])};
  }

  /**
   * The expectations of {@code functions} under the density {@code exp(logDensity(a, b))} on
   * [aLo, aHi] x [bLo, bHi], by the same rule.
   */
  static double[] expectations(DoubleBinaryOperator logDensity, double aLo, double aHi,
      double bLo, double bHi, int n, List<DoubleBinaryOperator> functions) {
    double[] as = new double[n + 1];
    double[] bs = new double[n + 1];
    double[] weight = new double[n + 1];
    for (int k = 0; k <= n; k++) {
      as[k] = aLo + (aHi - aLo) * k / n;
      bs[k] = bLo + (bHi - bLo) * k / n;
      weight[k] = (k == 0 || k == n) ? 1 : (k % 2 == 1 ? 4 : 2);
    }
    double[][] log = new double[n + 1][n + 1];
    double max = Double.NEGATIVE_INFINITY;
    for (int i = 0; i <= n; i++) {
      for (int j = 0; j <= n; j++) {
        log[i][j] = logDensity.applyAsDouble(as[i], bs[j]);
        max = Math.max(max, log[i][j]);
      }
    }
    double z = 0;
    double[] sums = new double[functions.size()];
    for (int i = 0; i <= n; i++) {
      for (int j = 0; j <= n; j++) {
        double w = weight[i] * weight[j] * Math.exp(log[i][j] - max);
        z += w;
        for (int f = 0; f < sums.length; f++) {
          sums[f] += w * functions.get(f).applyAsDouble(as[i], bs[j]);
        }
      }
    }
    for (int f = 0; f < sums.length; f++) {
      sums[f] /= z;
    }
    return sums;
  }
}

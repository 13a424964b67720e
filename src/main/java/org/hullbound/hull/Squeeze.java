package org.hullbound.hull;

/**
 * The lower hull ("squeeze"): chords between neighbouring abscissae, -inf outside the outermost
 * ones (Gilks and Wild 1992, equation 3).
 *
 * <p>For a concave h the chord through two points lies below h between them, so accepting a
 * proposal when w &lt;= exp(squeeze - hull) needs no evaluation of h. The samplers store the squeeze
 * inside {@link PiecewiseExponential} as its gap to the hull; this class holds the chord arithmetic
 * and a direct evaluation from the abscissae, used to cross-check that form.
 */
final class Squeeze {

  private Squeeze() {}

  /** Slope of the chord through (x0, h0) and (x1, h1), x0 &lt; x1. */
  static double chordSlope(double x0, double h0, double x1, double h1) {
    return (h1 - h0) / (x1 - x0);
  }

  /**
   * The squeeze at {@code x} computed from sorted abscissae {@code xs[0..k)} and their values:
   * linear interpolation between the neighbours, -inf outside [xs[0], xs[k-1]].
   */
  static double logSqueeze(double[] xs, double[] hs, int k, double x) {
    if (k < 2 || !(x >= xs[0] && x <= xs[k - 1])) {
      return Double.NEGATIVE_INFINITY;
    }
    int lo = 0;
    int hi = k - 1;
    while (hi - lo > 1) {
      int mid = (lo + hi) >>> 1;
      if (xs[mid] <= x) {
        lo = mid;
      } else {
        hi = mid;
      }
    }
    double slope = chordSlope(xs[lo], hs[lo], xs[hi], hs[hi]);
    return x - xs[lo] <= xs[hi] - x ? hs[lo] + slope * (x - xs[lo]) : hs[hi] + slope * (x - xs[hi]);
  }
}

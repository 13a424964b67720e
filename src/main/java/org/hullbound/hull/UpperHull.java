package org.hullbound.hull;

/**
 * The tangent upper hull of Gilks and Wild (1992, equations 1 and 2): at sorted abscissae x_i the
 * tangents h(x_i) + h'(x_i)(x - x_i), each used between the intersections z_{i-1} and z_i with its
 * neighbours.
 *
 * <p>For a concave h every tangent lies above h everywhere, so the hull stays an upper bound even
 * where the intersection is ill-conditioned (neighbouring slopes nearly equal): there the
 * intersection is only clamped into [x_i, x_{i+1}], which keeps exactness. Each tangent is written
 * as two pieces split at its abscissa, so that each piece has a single chord of the squeeze.
 */
final class UpperHull {

  private UpperHull() {}

  /** Writes the hull of {@code k >= 1} abscissae into {@code pieces} and seals it. */
  static void build(
      double[] xs, double[] hs, double[] ds, int k, Support support, PiecewiseExponential pieces) {
    pieces.reset(2 * k, PiecewiseExponential.highest(hs, k));
    double previousBreak = support.lower();
    for (int i = 0; i < k; i++) {
      double nextBreak = i + 1 < k ? intersection(xs, hs, ds, i) : support.upper();
      // left part [z_{i-1}, x_i]: squeeze is the chord to x_{i-1}, none left of x_0
      double leftGap = 0.0;
      double leftGapSlope = 0.0;
      if (i > 0) {
        leftGapSlope = ds[i] - Squeeze.chordSlope(xs[i - 1], hs[i - 1], xs[i], hs[i]);
      } else {
        leftGap = Double.POSITIVE_INFINITY;
      }
      pieces.add(previousBreak, xs[i], xs[i], hs[i], ds[i], leftGap, leftGapSlope);
      // right part [x_i, z_i]: squeeze is the chord to x_{i+1}, none right of x_{k-1}
      double rightGap = 0.0;
      double rightGapSlope = 0.0;
      if (i + 1 < k) {
        rightGapSlope = ds[i] - Squeeze.chordSlope(xs[i], hs[i], xs[i + 1], hs[i + 1]);
      } else {
        rightGap = Double.POSITIVE_INFINITY;
      }
      pieces.add(xs[i], nextBreak, xs[i], hs[i], ds[i], rightGap, rightGapSlope);
      previousBreak = nextBreak;
    }
    pieces.seal();
  }

  /**
   * Where the tangents at x_i and x_{i+1} meet, as the fraction (c - h'_{i+1}) / (h'_i - h'_{i+1})
   * of the interval, c the chord slope; clamped to the interval, the midpoint when the slopes are
   * equal or out of order.
   */
  static double intersection(double[] xs, double[] hs, double[] ds, int i) {
    double width = xs[i + 1] - xs[i];
    double chord = Squeeze.chordSlope(xs[i], hs[i], xs[i + 1], hs[i + 1]);
    double fraction = (chord - ds[i + 1]) / (ds[i] - ds[i + 1]);
    if (!(ds[i] > ds[i + 1]) || Double.isNaN(fraction)) {
      fraction = 0.5;
    } else if (fraction < 0) {
      fraction = 0;
    } else if (fraction > 1) {
      fraction = 1;
    }
    double z = xs[i] + fraction * width;
    return Math.min(Math.max(z, xs[i]), xs[i + 1]);
  }
}

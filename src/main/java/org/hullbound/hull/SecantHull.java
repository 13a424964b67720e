package org.hullbound.hull;

/**
 * The derivative-free upper hull of Gilks (1992): on each interval between abscissae the lower of
 * the two neighbouring chords extended, outside the outermost abscissae the outermost chord
 * extended.
 *
 * <p>For a concave h a chord lies below h between its points and above it outside them, so each
 * extended chord bounds h on the neighbouring intervals; any split point between the two therefore
 * gives an upper bound, and an ill-conditioned intersection is only clamped. Needs {@code k >= 3}.
 */
final class SecantHull {

  private SecantHull() {}

  /** Writes the hull of {@code k >= 3} abscissae into {@code pieces} and seals it. */
  static void build(double[] xs, double[] hs, int k, Support support, PiecewiseExponential pieces) {
    pieces.reset(2 * k + 2, PiecewiseExponential.highest(hs, k));
    double inf = Double.POSITIVE_INFINITY;
    // left of x_0: chord (x_0, x_1) extended; no squeeze
    double first = chord(xs, hs, 0);
    pieces.add(support.lower(), xs[0], xs[0], hs[0], first, inf, 0);
    // [x_0, x_1]: chord (x_1, x_2) extended; squeeze is chord (x_0, x_1)
    double second = chord(xs, hs, 1);
    pieces.add(xs[0], xs[1], xs[1], hs[1], second, 0, second - first);
    // [x_i, x_{i+1}], 1 <= i <= k-3: min of chords (i-1, i) and (i+1, i+2) extended
    for (int i = 1; i <= k - 3; i++) {
      double before = chord(xs, hs, i - 1);
      double middle = chord(xs, hs, i);
      double after = chord(xs, hs, i + 1);
      double fraction = (middle - after) / (before - after);
      if (!(before > after) || Double.isNaN(fraction)) {
        fraction = 0.5;
      } else if (fraction < 0) {
        fraction = 0;
      } else if (fraction > 1) {
        fraction = 1;
      }
      double split = xs[i] + fraction * (xs[i + 1] - xs[i]);
      split = Math.min(Math.max(split, xs[i]), xs[i + 1]);
      pieces.add(xs[i], split, xs[i], hs[i], before, 0, before - middle);
      pieces.add(split, xs[i + 1], xs[i + 1], hs[i + 1], after, 0, after - middle);
    }
    // [x_{k-2}, x_{k-1}]: chord (x_{k-3}, x_{k-2}) extended; squeeze is chord (x_{k-2}, x_{k-1})
    double penultimate = chord(xs, hs, k - 3);
    double last = chord(xs, hs, k - 2);
    pieces.add(xs[k - 2], xs[k - 1], xs[k - 2], hs[k - 2], penultimate, 0, penultimate - last);
    // right of x_{k-1}: chord (x_{k-2}, x_{k-1}) extended; no squeeze
    pieces.add(xs[k - 1], support.upper(), xs[k - 1], hs[k - 1], last, inf, 0);
    pieces.seal();
  }

  /** Slope of the chord through x_i and x_{i+1}. */
  static double chord(double[] xs, double[] hs, int i) {
    return Squeeze.chordSlope(xs[i], hs[i], xs[i + 1], hs[i + 1]);
  }
}

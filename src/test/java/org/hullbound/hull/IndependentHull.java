package org.hullbound.hull;

import java.util.ArrayList;
import java.util.List;

/**
 * The sampler's envelope rebuilt in the test from the abscissae and the density alone, without the
 * sampler's arrays, so that a draw checked against its distribution function cannot agree with a
 * wrong table by sharing its error.
 *
 * <p>Lines: the tangents h(x_i) + h'(x_i) (x - x_i), neighbours meeting at z_i = (h_{i+1} - h_i -
 * x_{i+1} h'_{i+1} + x_i h'_i) / (h'_i - h'_{i+1}) (Gilks and Wild 1992, equation 1), each tangent
 * cut at its abscissa; or, derivative-free, the chords extended (Gilks 1992): outside the outermost
 * abscissae the outermost chord, on [x_0, x_1] and [x_{k-2}, x_{k-1}] the next chord in, and on
 * each inner interval the lower of the chords on either side, cut where they cross. On a piece
 * over which the line rises by at most {@link PiecewiseExponential#UNIFORM_LIMIT} the envelope is
 * flat at the line's top there (docs/hull.md, "uniform pieces"). Masses are integrated in closed
 * form, exp(u(a)) (e^{s (b - a)} - 1) / s.
 */
final class IndependentHull {

  /** One piece: the line value + slope (x - anchor) on [left, right], flat at its top if flat. */
  private record Piece(double left, double right, double anchor, double value, double slope) {

    boolean flat() {
      double width = right - left;
      return width < Double.POSITIVE_INFINITY
          && Math.abs(slope) * width <= PiecewiseExponential.UNIFORM_LIMIT;
    }

    double line(double x) {
      return value + slope * (x - anchor);
    }

    /** The integral of the envelope's exponential over [left, x], relative to exp(scale). */
    double mass(double x, double scale) {
      if (!(x > left)) {
        return 0;
      }
      if (flat()) {
        double top = Math.max(line(left), line(right));
        return Math.exp(top - scale) * (x - left);
      }
      if (left == Double.NEGATIVE_INFINITY) {
        return Math.exp(line(x) - scale) / slope;
      }
      double atLeft = Math.exp(line(left) - scale);
      if (x == Double.POSITIVE_INFINITY) {
        return atLeft / -slope;
      }
      return slope == 0 ? atLeft * (x - left) : atLeft * Math.expm1(slope * (x - left)) / slope;
    }
  }

  private final List<Piece> pieces;
  private final double scale;
  private final double total;

  private IndependentHull(List<Piece> pieces) {
    this.pieces = pieces;
    double highest = Double.NEGATIVE_INFINITY;
    for (Piece p : pieces) {
      highest = Math.max(highest, Math.max(finiteLine(p, p.left), finiteLine(p, p.right)));
    }
    scale = highest;
    double sum = 0;
    for (Piece p : pieces) {
      sum += p.mass(p.right, scale);
    }
    total = sum;
  }

  private static double finiteLine(Piece p, double x) {
    return Double.isFinite(x) ? p.line(x) : Double.NEGATIVE_INFINITY;
  }

  /** The tangent envelope at sorted abscissae xs with values hs and slopes ds. */
  static IndependentHull tangents(double[] xs, double[] hs, double[] ds, Support support) {
    int k = xs.length;
    List<Piece> pieces = new ArrayList<>();
    double previous = support.lower();
    for (int i = 0; i < k; i++) {
      double next = support.upper();
      if (i + 1 < k) {
        next =
            crossing(
                xs[i], hs[i], ds[i], xs[i + 1], hs[i + 1], ds[i + 1], xs[i], xs[i + 1]);
      }
      add(pieces, previous, xs[i], xs[i], hs[i], ds[i]);
      add(pieces, xs[i], next, xs[i], hs[i], ds[i]);
      previous = next;
    }
    return new IndependentHull(pieces);
  }

  /** The secant envelope at sorted abscissae xs (at least 3) with values hs. */
  static IndependentHull secants(double[] xs, double[] hs, Support support) {
    int k = xs.length;
    double[] chord = new double[k - 1];
    for (int i = 0; i < k - 1; i++) {
      chord[i] = (hs[i + 1] - hs[i]) / (xs[i + 1] - xs[i]);
    }
    List<Piece> pieces = new ArrayList<>();
    add(pieces, support.lower(), xs[0], xs[0], hs[0], chord[0]);
    add(pieces, xs[0], xs[1], xs[1], hs[1], chord[1]);
    for (int i = 1; i <= k - 3; i++) {
      // the chord (i-1, i) extended through x_i and the chord (i+1, i+2) through x_{i+1}
      double split =
          crossing(xs[i], hs[i], chord[i - 1], xs[i + 1], hs[i + 1], chord[i + 1], xs[i], xs[i + 1]);
      add(pieces, xs[i], split, xs[i], hs[i], chord[i - 1]);
      add(pieces, split, xs[i + 1], xs[i + 1], hs[i + 1], chord[i + 1]);
    }
    add(pieces, xs[k - 2], xs[k - 1], xs[k - 2], hs[k - 2], chord[k - 3]);
    add(pieces, xs[k - 1], support.upper(), xs[k - 1], hs[k - 1], chord[k - 2]);
    return new IndependentHull(pieces);
  }

  /**
   * Where the line through (a, ha) with slope da meets the line through (b, hb) with slope db,
   * clamped to [low, high]; the middle when the slopes do not fall.
   */
  private static double crossing(
      double a, double ha, double da, double b, double hb, double db, double low, double high) {
    if (!(da > db)) {
      return 0.5 * (low + high);
    }
    double z = (hb - ha - b * db + a * da) / (da - db);
    return Math.min(Math.max(z, low), high);
  }

  private static void add(
      List<Piece> pieces, double left, double right, double anchor, double value, double slope) {
    if (right > left) {
      pieces.add(new Piece(left, right, anchor, value, slope));
    }
  }

  /** The distribution function of the normalised envelope at x. */
  double cdf(double x) {
    double sum = 0;
    for (Piece p : pieces) {
      if (x >= p.right) {
        sum += p.mass(p.right, scale);
      } else {
        sum += p.mass(x, scale);
        break;
      }
    }
    return Math.min(1.0, sum / total);
  }

  int size() {
    return pieces.size();
  }

  /** log of the envelope's total mass, the integral of exp(E) over the support. */
  double logTotalMass() {
    return scale + Math.log(total);
  }
}

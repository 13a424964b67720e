package org.hullbound.hull;

import java.util.Arrays;
import java.util.random.RandomGenerator;

/**
 * The upper envelope and squeeze of a log-concave mass on the whole numbers of {@code [lower,
 * upper]}, built from chords through pairs of neighbouring integers: the discrete analogue of Gilks
 * and Wild's (1992) tangent hull, sampled exactly as a mixture of truncated geometric pieces.
 *
 * <p>Why the chord through {@code (a, a + 1)} bounds h everywhere: h is discretely concave when its
 * differences {@code h(k + 1) - h(k)} do not increase. With {@code d = h(a + 1) - h(a)}, for {@code
 * k > a + 1} the sum of the differences from {@code a + 1} to {@code k} is at most {@code (k - a -
 * 1) d}, and for {@code k < a} the sum from {@code k} to {@code a} is at least {@code (a - k) d};
 * so {@code h(k) <= h(a) + d (k - a)} at every integer, with equality at {@code a} and {@code a +
 * 1}. Each chord alone is an upper bound, so any split of the integers among chords is a valid
 * envelope; the split at their crossings only makes it the tightest (rounding in a crossing can
 * cost acceptance, never exactness). Between two evaluated integers the chord lies below h (the
 * squeeze, Gilks and Wild 1992, section 2.2, on the integers). Devroye (1987, A simple generator
 * for discrete log-concave distributions, Computing 39, 87-91; recalled from memory) bounds such
 * masses by a fixed envelope; chords of neighbouring integers as adaptive tangents are common
 * practice.
 *
 * <p>Everything is kept in log space relative to each chord's anchor, so counts near {@code 2^53}
 * and masses far in a tail (log-mass {@code -1e5}) neither overflow nor underflow. Immutable: {@link
 * #with} returns a new hull.
 */
final class GeometricHull {
  /** The largest whole number a double holds exactly. */
  static final double LARGEST_WHOLE = 0x1p53;

  private final double lower;
  private final double upper;
  /** Chord anchors a, ascending and distinct; the chord passes through (a, h(a)), (a+1, h(a+1)). */
  private final long[] anchors;
  private final double[] values;
  private final double[] slopes;
  /** Integers of each piece: first[j] .. last[j] (doubles, infinite at an open end). */
  private final double[] first;
  private final double[] last;
  private final double[] cumulative;
  private final double logMass;

  private GeometricHull(double lower, double upper, long[] anchors, double[] values, double[] slopes) {
    this.lower = lower;
    this.upper = upper;
    this.anchors = anchors;
    this.values = values;
    this.slopes = slopes;
    int m = anchors.length;
    this.first = new double[m];
    this.last = new double[m];
    double[] pieceMass = new double[m];
    double top = Double.NEGATIVE_INFINITY;
    for (int j = 0; j < m; j++) {
      first[j] = j == 0 ? lower : Math.floor(crossing(j - 1)) + 1;
      last[j] = j == m - 1 ? upper : Math.floor(crossing(j));
      pieceMass[j] = values[j] + logGeometricSum(slopes[j], first[j] - anchors[j], last[j] - anchors[j]);
      top = Math.max(top, pieceMass[j]);
    }
    if (top == Double.POSITIVE_INFINITY || Double.isNaN(top)) {
      throw new NonIntegrableHullException(
          "the envelope has infinite mass: its outermost chord does not fall away on an unbounded"
              + " side", slopes[0] > 0 ? anchors[0] : anchors[m - 1]);
    }
    // log-sum-exp with the largest subtracted: the piece masses may all lie near -1e5.
    this.cumulative = new double[m];
    double sum = 0;
    for (int j = 0; j < m; j++) {
      sum += Math.exp(pieceMass[j] - top);
      cumulative[j] = sum;
    }
    for (int j = 0; j < m; j++) {
      cumulative[j] /= sum;
    }
    this.logMass = top + Math.log(sum);
  }

  /**
   * A hull of chords anchored at {@code anchors} (each with {@code a + 1} inside the range).
   *
   * @param values h at each anchor
   * @param nextValues h at each anchor + 1
   */
  static GeometricHull of(
      double lower, double upper, long[] anchors, double[] values, double[] nextValues) {
    long[] a = anchors.clone();
    Integer[] order = new Integer[a.length];
    for (int i = 0; i < order.length; i++) {
      order[i] = i;
    }
    Arrays.sort(order, (x, y) -> Long.compare(a[x], a[y]));
    long[] sorted = new long[a.length];
    double[] h = new double[a.length];
    double[] d = new double[a.length];
    for (int i = 0; i < order.length; i++) {
      sorted[i] = a[order[i]];
      h[i] = values[order[i]];
      d[i] = nextValues[order[i]] - values[order[i]];
    }
    return new GeometricHull(lower, upper, sorted, h, d);
  }

  /** This hull with the chord at {@code anchor} added (the same hull when it is there already). */
  GeometricHull with(long anchor, double value, double nextValue) {
    int at = Arrays.binarySearch(anchors, anchor);
    if (at >= 0) {
      return this;
    }
    int insert = -at - 1;
    int m = anchors.length;
    long[] a = new long[m + 1];
    double[] h = new double[m + 1];
    double[] d = new double[m + 1];
    System.arraycopy(anchors, 0, a, 0, insert);
    System.arraycopy(values, 0, h, 0, insert);
    System.arraycopy(slopes, 0, d, 0, insert);
    a[insert] = anchor;
    h[insert] = value;
    d[insert] = nextValue - value;
    System.arraycopy(anchors, insert, a, insert + 1, m - insert);
    System.arraycopy(values, insert, h, insert + 1, m - insert);
    System.arraycopy(slopes, insert, d, insert + 1, m - insert);
    return new GeometricHull(lower, upper, a, h, d);
  }

  /**
   * Where chords j and j + 1 cross, clamped to {@code [a_j + 1, a_{j+1}]}, where a concave h puts
   * it; measured from a_j so that large anchors lose no digits.
   */
  private double crossing(int j) {
    double gap = (double) (anchors[j + 1] - anchors[j]);
    double fall = slopes[j] - slopes[j + 1];
    double offset = (values[j + 1] - values[j] - slopes[j + 1] * gap) / fall;
    if (!(offset >= 1)) {
      offset = 1; // parallel chords of a concave h coincide; NaN or rounding: any split is valid
    }
    return anchors[j] + Math.min(offset, gap);
  }

  /**
   * {@code log sum_{i = m}^{n} exp(d i)} for whole {@code m <= n} ({@code m} may be {@code -inf}
   * when {@code d > 0}, {@code n} may be {@code inf} when {@code d < 0}; otherwise the sum is
   * infinite and so is the result). Summed from the end where the terms are largest, by {@code
   * expm1}, so that neither a ratio near 1 nor a long run loses the digits.
   */
  static double logGeometricSum(double d, double m, double n) {
    double count = n - m + 1;
    if (d == 0) {
      return Math.log(count);
    }
    if (d < 0) {
      if (m == Double.NEGATIVE_INFINITY) {
        return Double.POSITIVE_INFINITY;
      }
      return d * m + Math.log(-Math.expm1(d * count)) - Math.log(-Math.expm1(d));
    }
    if (n == Double.POSITIVE_INFINITY) {
      return Double.POSITIVE_INFINITY;
    }
    return d * n + Math.log(-Math.expm1(-d * count)) - Math.log(-Math.expm1(-d));
  }

  /**
   * One integer of {@code [m, n]} with probability proportional to {@code exp(d i)}: the floor of an
   * exponential variable truncated to the run has exactly this law ({@code P(floor(E) = j)} is the
   * integral of {@code e^{d x}} over {@code [j, j + 1)}, proportional to {@code e^{d j}}).
   */
  static double truncatedGeometric(double d, double m, double n, double uniform) {
    double count = n - m + 1;
    if (d == 0) {
      return Math.min(n, m + Math.floor(uniform * count));
    }
    double rate = -Math.abs(d);
    double steps = Math.floor(Math.log1p(uniform * Math.expm1(rate * count)) / rate);
    steps = Math.min(Math.max(steps, 0), count - 1);
    return d < 0 ? m + steps : n - steps;
  }

  /** One integer drawn from the normalised envelope: a piece by its mass, then a point in it. */
  double sample(RandomGenerator rng) {
    double pick = rng.nextDouble();
    int j = 0;
    while (j < cumulative.length - 1 && cumulative[j] <= pick) {
      j++;
    }
    double offset = truncatedGeometric(
        slopes[j], first[j] - anchors[j], last[j] - anchors[j], rng.nextDouble());
    return anchors[j] + offset;
  }

  /** The envelope u(k) at a whole {@code k} inside the range. */
  double upper(double k) {
    int j = 0;
    while (j < anchors.length - 1 && k > last[j]) {
      j++;
    }
    return values[j] + slopes[j] * (k - anchors[j]);
  }

  /**
   * The squeeze at a whole {@code k}: the chord through the evaluated integers on either side of
   * it, {@code -inf} outside the outermost ones.
   */
  double squeeze(double k) {
    double leftAt = Double.NaN;
    double leftValue = Double.NaN;
    for (int j = 0; j < anchors.length; j++) {
      double a = anchors[j];
      double b = a + 1;
      double hb = values[j] + slopes[j];
      if (k == a) {
        return values[j];
      }
      if (k == b) {
        return hb;
      }
      if (k < a) {
        if (Double.isNaN(leftAt)) {
          return Double.NEGATIVE_INFINITY;
        }
        return leftValue + (values[j] - leftValue) * (k - leftAt) / (a - leftAt);
      }
      leftAt = b;
      leftValue = hb;
    }
    return Double.NEGATIVE_INFINITY;
  }

  /** The log of the envelope's total mass, {@code log sum_k exp(u(k))}. */
  double logMass() {
    return logMass;
  }

  int size() {
    return anchors.length;
  }

  long[] anchors() {
    return anchors.clone();
  }

  double[] values() {
    return values.clone();
  }

  double[] slopes() {
    return slopes.clone();
  }

  double lower() {
    return lower;
  }

  double upper() {
    return upper;
  }
}

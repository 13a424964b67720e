package org.hullbound.hull;

import java.util.Arrays;

/**
 * The sampling form of an upper hull: pieces on which the hull is one line u(x) = value + slope (x
 * - anchor) and the squeeze is one line below it, so exp(u) is an exponential density on each.
 *
 * <p>Both hulls (tangents, Gilks and Wild 1992; secants, Gilks 1992) are written into this one form
 * so that the draw path is shared. The squeeze is kept as the gap u(x) - l(x) = gapValue + gapSlope
 * (x - anchor), +inf where there is no squeeze. Masses are kept in log space and normalised to
 * cumulative weights relative to the largest piece; a piece is chosen by binary search over them
 * and the point by inverting its exponential distribution function. Package-private and mutable:
 * the sampler rebuilds it after every insertion and reads its arrays directly on the draw path.
 */
final class PiecewiseExponential {

  /** Below this decay a piece is treated with a series, so near-flat pieces keep full precision. */
  private static final double SMALL_DECAY = 1e-4;

  double[] left;
  double[] right;
  double[] anchor;
  double[] value;
  double[] slope;
  double[] gapValue;
  double[] gapSlope;
  /** 1 - exp(-|slope| width): the share of an untruncated exponential that the piece holds. */
  double[] decay;
  /** decay / |slope|, computed without dividing by a tiny slope: the piece's effective width. */
  double[] effectiveWidth;
  double[] logMass;
  double[] cumulative;
  int size;
  double total;
  double logScale;

  PiecewiseExponential(int capacity) {
    allocate(capacity);
  }

  private void allocate(int capacity) {
    left = new double[capacity];
    right = new double[capacity];
    anchor = new double[capacity];
    value = new double[capacity];
    slope = new double[capacity];
    gapValue = new double[capacity];
    gapSlope = new double[capacity];
    decay = new double[capacity];
    effectiveWidth = new double[capacity];
    logMass = new double[capacity];
    cumulative = new double[capacity];
  }

  /** Empties the pieces and makes room for at least {@code capacity} of them. */
  void reset(int capacity) {
    if (left.length < capacity) {
      allocate(Math.max(capacity, 2 * left.length));
    }
    size = 0;
  }

  /**
   * Appends a piece on [lower, upper] (pieces come in increasing order); a piece of zero width is
   * dropped since it has no mass.
   */
  void add(
      double lower,
      double upper,
      double anchorAt,
      double valueAtAnchor,
      double slopeOfHull,
      double gapAtAnchor,
      double slopeOfGap) {
    if (!(upper > lower)) {
      return;
    }
    int j = size++;
    left[j] = lower;
    right[j] = upper;
    anchor[j] = anchorAt;
    value[j] = valueAtAnchor;
    slope[j] = slopeOfHull;
    gapValue[j] = gapAtAnchor;
    gapSlope[j] = gapAtAnchor == Double.POSITIVE_INFINITY ? 0.0 : slopeOfGap;
  }

  /**
   * Computes log masses and cumulative weights.
   *
   * @throws NonIntegrableHullException when an unbounded piece does not fall away
   */
  void seal() {
    double largest = Double.NEGATIVE_INFINITY;
    for (int j = 0; j < size; j++) {
      double s = slope[j];
      double width = right[j] - left[j];
      if (width == Double.POSITIVE_INFINITY) {
        boolean falls = left[j] == Double.NEGATIVE_INFINITY ? s > 0 : s < 0;
        if (!falls) {
          double at = left[j] == Double.NEGATIVE_INFINITY ? right[j] : left[j];
          throw new NonIntegrableHullException(
              "the hull is not integrable: on the unbounded "
                  + (left[j] == Double.NEGATIVE_INFINITY ? "lower" : "upper")
                  + " side the outermost slope at x = "
                  + at
                  + " is "
                  + s
                  + ", expected "
                  + (left[j] == Double.NEGATIVE_INFINITY ? "> 0" : "< 0")
                  + "; is the density proper on this support?",
              at);
        }
        decay[j] = 1.0;
        effectiveWidth[j] = 1.0 / Math.abs(s);
      } else {
        double t = Math.abs(s) * width;
        double relative = relativeDecay(t);
        decay[j] = t > 1 ? -Math.expm1(-t) : t * relative;
        effectiveWidth[j] = width * relative;
      }
      logMass[j] = logMass(left[j], right[j], anchor[j], value[j], s);
      if (logMass[j] > largest) {
        largest = logMass[j];
      }
    }
    if (!(largest > Double.NEGATIVE_INFINITY) || largest == Double.POSITIVE_INFINITY) {
      throw new NonIntegrableHullException(
          "the hull has no finite positive mass (largest log mass " + largest + ")",
          size == 0 ? Double.NaN : anchor[0]);
    }
    double sum = 0;
    for (int j = 0; j < size; j++) {
      sum += Math.exp(logMass[j] - largest);
      cumulative[j] = sum;
    }
    total = sum;
    logScale = largest;
  }

  /** The piece whose cumulative weight first exceeds {@code u * total}, u in [0, 1). */
  int select(double u) {
    double target = u * total;
    double[] c = cumulative;
    int lo = 0;
    int hi = size - 1;
    while (lo < hi) {
      int mid = (lo + hi) >>> 1;
      if (c[mid] > target) {
        hi = mid;
      } else {
        lo = mid + 1;
      }
    }
    return lo;
  }

  /**
   * Inverts the exponential distribution of piece {@code j} at {@code u} in [0, 1): measured from
   * the lower end (P(X &lt;= x) = u) on falling or flat pieces, from the upper end (P(X &gt;= x) =
   * u) on rising ones, so that the logarithm always acts on the side where the mass is.
   */
  double position(int j, double u) {
    double s = slope[j];
    double q = decay[j];
    double y;
    if (q < SMALL_DECAY) {
      // -log(1 - p) / p = 1 + p/2 + p^2/3 + p^3/4 + ...; truncation error below p^4/5 < 3e-17
      double p = u * q;
      y = u * effectiveWidth[j] * (1.0 + p * (0.5 + p * (1.0 / 3.0 + 0.25 * p)));
    } else {
      y = -Math.log(1.0 - u * q) / Math.abs(s);
    }
    double x = s > 0 ? right[j] - y : left[j] + y;
    if (x < left[j]) {
      return left[j];
    }
    return x > right[j] ? right[j] : x;
  }

  /** The index of the piece containing {@code x}, or -1 outside all pieces. */
  int pieceOf(double x) {
    if (size == 0 || !(x >= left[0] && x <= right[size - 1])) {
      return -1;
    }
    int lo = 0;
    int hi = size - 1;
    while (lo < hi) {
      int mid = (lo + hi + 1) >>> 1;
      if (left[mid] <= x) {
        lo = mid;
      } else {
        hi = mid - 1;
      }
    }
    return lo;
  }

  /** log of the integral of exp(value + slope (x - anchor)) over [lower, upper]. */
  static double logMass(double lower, double upper, double anchor, double value, double slope) {
    double width = upper - lower;
    if (!(width > 0)) {
      return Double.NEGATIVE_INFINITY;
    }
    if (width == Double.POSITIVE_INFINITY) {
      double end = lower == Double.NEGATIVE_INFINITY ? upper : lower;
      return value + slope * (end - anchor) - Math.log(Math.abs(slope));
    }
    double high = slope > 0 ? upper : lower;
    double top = value + slope * (high - anchor);
    double t = Math.abs(slope) * width;
    if (t > 1) {
      // integral = exp(top) (1 - exp(-t)) / |slope|
      return top + Math.log1p(-Math.exp(-t)) - Math.log(Math.abs(slope));
    }
    // integral = exp(top) width (1 - exp(-t)) / t, stable as t -> 0
    return top + Math.log(width) + Math.log(relativeDecay(t));
  }

  /** (1 - exp(-t)) / t for t &gt;= 0, equal to 1 at t = 0, accurate for tiny t via expm1. */
  static double relativeDecay(double t) {
    if (t == 0) {
      return 1.0;
    }
    if (t == Double.POSITIVE_INFINITY) {
      return 0.0;
    }
    return -Math.expm1(-t) / t;
  }

  /** A trimmed, independent copy for read-only views. */
  PiecewiseExponential copy() {
    PiecewiseExponential c = new PiecewiseExponential(Math.max(1, size));
    c.size = size;
    c.total = total;
    c.logScale = logScale;
    System.arraycopy(left, 0, c.left, 0, size);
    System.arraycopy(right, 0, c.right, 0, size);
    System.arraycopy(anchor, 0, c.anchor, 0, size);
    System.arraycopy(value, 0, c.value, 0, size);
    System.arraycopy(slope, 0, c.slope, 0, size);
    System.arraycopy(gapValue, 0, c.gapValue, 0, size);
    System.arraycopy(gapSlope, 0, c.gapSlope, 0, size);
    System.arraycopy(decay, 0, c.decay, 0, size);
    System.arraycopy(effectiveWidth, 0, c.effectiveWidth, 0, size);
    System.arraycopy(logMass, 0, c.logMass, 0, size);
    System.arraycopy(cumulative, 0, c.cumulative, 0, size);
    return c;
  }

  @Override
  public String toString() {
    return "PiecewiseExponential" + Arrays.toString(Arrays.copyOf(left, size));
  }
}

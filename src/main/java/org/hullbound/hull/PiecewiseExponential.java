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
  /** 1 / |slope|, so that the draw path multiplies instead of dividing. */
  double[] inverseSlope;
  /**
   * What the draw path reads, packed {@value #STRIDE} doubles a piece so that one draw touches one
   * or two cache lines: the end the inversion measures from (upper on rising pieces), 1 / |slope|
   * signed toward the inside of the piece (no branch on the slope's sign), decay, both ends, anchor
   * and the squeeze gap.
   */
  double[] packed;

  static final int STRIDE = 8;
  static final int ORIGIN = 0;
  static final int SIGNED_INVERSE_SLOPE = 1;
  static final int DECAY = 2;
  static final int LEFT = 3;
  static final int RIGHT = 4;
  static final int ANCHOR = 5;
  static final int GAP_VALUE = 6;
  static final int GAP_SLOPE = 7;
  double[] logMass;
  double[] cumulative;
  /**
   * Guide table of the indexed search (Chen and Asau 1974): guide[i] is the first piece whose
   * cumulative weight exceeds i / size of the total, so a piece is found in about one step.
   */
  int[] guide;
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
    inverseSlope = new double[capacity];
    packed = new double[STRIDE * capacity];
    logMass = new double[capacity];
    cumulative = new double[capacity];
    guide = new int[capacity];
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
        double end = left[j] == Double.NEGATIVE_INFINITY ? right[j] : left[j];
        logMass[j] = value[j] + s * (end - anchor[j]) - Math.log(Math.abs(s));
      } else {
        // the same masses as logMass(...), sharing exp(-t) with the decay
        double t = Math.abs(s) * width;
        double top = value[j] + s * ((s > 0 ? right[j] : left[j]) - anchor[j]);
        if (t > 1) {
          decay[j] = 1.0 - Math.exp(-t);
          logMass[j] = top + Math.log(decay[j]) - Math.log(Math.abs(s));
          effectiveWidth[j] = decay[j] / Math.abs(s);
        } else {
          double relative = relativeDecay(t);
          decay[j] = t * relative;
          logMass[j] = top + Math.log(width) + Math.log(relative);
          effectiveWidth[j] = width * relative;
        }
      }
      inverseSlope[j] = 1.0 / Math.abs(s);
      int at = STRIDE * j;
      packed[at + ORIGIN] = s > 0 ? right[j] : left[j];
      packed[at + SIGNED_INVERSE_SLOPE] = s > 0 ? -inverseSlope[j] : inverseSlope[j];
      packed[at + DECAY] = decay[j];
      packed[at + LEFT] = left[j];
      packed[at + RIGHT] = right[j];
      packed[at + ANCHOR] = anchor[j];
      packed[at + GAP_VALUE] = gapValue[j];
      packed[at + GAP_SLOPE] = gapSlope[j];
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
    int j = 0;
    for (int i = 0; i < size; i++) {
      double threshold = ((double) i / size) * sum;
      while (j < size - 1 && cumulative[j] <= threshold) {
        j++;
      }
      guide[i] = j;
    }
  }

  /**
   * The piece whose cumulative weight first exceeds {@code u * total}, u in [0, 1): the inverse of
   * the discrete distribution of piece masses, by the guide table.
   */
  int select(double u) {
    double target = u * total;
    double[] c = cumulative;
    int j = guide[(int) (u * size)];
    // the guide entry is at or, by rounding of the thresholds, one past the answer
    if (j > 0 && c[j - 1] > target) {
      j--;
    }
    int last = size - 1;
    while (j < last && c[j] <= target) {
      j++;
    }
    return j;
  }

  /**
   * Inverts the exponential distribution of piece {@code j} at {@code u} in [0, 1): measured from
   * the lower end (P(X &lt;= x) = u) on falling or flat pieces, from the upper end (P(X &gt;= x) =
   * u) on rising ones, so that the logarithm always acts on the side where the mass is.
   */
  double position(int j, double u) {
    double[] d = packed;
    int at = STRIDE * j;
    double q = d[at + DECAY];
    double step;
    if (q < SMALL_DECAY) {
      // -log(1 - p) / p = 1 + p/2 + p^2/3 + p^3/4 + ...; truncation error below p^4/5 < 3e-17
      double p = u * q;
      double y = u * effectiveWidth[j] * (1.0 + p * (0.5 + p * (1.0 / 3.0 + 0.25 * p)));
      step = Math.copySign(y, d[at + SIGNED_INVERSE_SLOPE]);
    } else {
      step = -Math.log(1.0 - u * q) * d[at + SIGNED_INVERSE_SLOPE];
    }
    double x = d[at + ORIGIN] + step;
    return Math.min(Math.max(x, d[at + LEFT]), d[at + RIGHT]);
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
      // 1 - exp(-t) >= 0.63 here, so the subtraction loses nothing
      return top + Math.log(1.0 - Math.exp(-t)) - Math.log(Math.abs(slope));
    }
    // integral = exp(top) width (1 - exp(-t)) / t, stable as t -> 0
    return top + Math.log(width) + Math.log(relativeDecay(t));
  }

  /**
   * (1 - exp(-t)) / t for t &gt;= 0, equal to 1 at t = 0, accurate for tiny t: for t &lt;= 1 by
   * Kahan's form of expm1, (e - 1) t / log e with e = exp(-t) rounded (Kahan's note, as given in
   * Higham 2002, Accuracy and Stability of Numerical Algorithms, section 1.14.1), which needs only
   * the fast intrinsic exp and log; above 1 directly.
   */
  static double relativeDecay(double t) {
    if (t == 0) {
      return 1.0;
    }
    if (t == Double.POSITIVE_INFINITY) {
      return 0.0;
    }
    double e = Math.exp(-t);
    if (t > 1) {
      return (1.0 - e) / t;
    }
    if (e == 1.0) {
      return 1.0 - 0.5 * t;
    }
    return (1.0 - e) / -Math.log(e);
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
    System.arraycopy(inverseSlope, 0, c.inverseSlope, 0, size);
    System.arraycopy(packed, 0, c.packed, 0, STRIDE * size);
    System.arraycopy(guide, 0, c.guide, 0, size);
    System.arraycopy(logMass, 0, c.logMass, 0, size);
    System.arraycopy(cumulative, 0, c.cumulative, 0, size);
    return c;
  }

  @Override
  public String toString() {
    return "PiecewiseExponential" + Arrays.toString(Arrays.copyOf(left, size));
  }
}

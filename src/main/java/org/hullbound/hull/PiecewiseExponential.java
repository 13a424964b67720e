package org.hullbound.hull;

import java.util.Arrays;

/**
 * The sampling form of an upper hull: pieces on which the hull is one line u(x) = value + slope (x
 * - anchor) and the squeeze is one line below it, so exp(u) is an exponential density on each.
 *
 * <p>Both hulls (tangents, Gilks and Wild 1992; secants, Gilks 1992) are written into this one form
 * so that the draw path is shared. The squeeze is kept as the gap u(x) - l(x) = gapValue + gapSlope
 * (x - anchor), +inf where there is no squeeze. Masses are kept in log space and normalised to
 * cumulative weights relative to the largest piece; a piece is chosen by a guide table over them
 * and the point by inverting its exponential distribution function.
 *
 * <p>A piece over which u rises by at most {@value #UNIFORM_LIMIT} is drawn from as if the hull
 * were constant at its top there (the envelope E = max u on the piece, still above h): its point
 * is uniform and needs no logarithm, which is most of the cost of a draw; a proposal that falls
 * between u and E is rejected without evaluating h. On such a piece at most 1 - (1 - e^-0.5) / 0.5
 * = 21% of proposals are lost that way. Package-private and mutable: the sampler rebuilds it after
 * insertions and reads {@link #pieceRecords} directly on the draw path.
 */
final class PiecewiseExponential {

  /** Largest rise |slope| * width of u over a piece that is drawn from uniformly. */
  static final double UNIFORM_LIMIT = 0.5;

  double[] left;
  double[] right;
  double[] anchor;
  double[] value;
  double[] slope;
  /** u - l at the anchor and its slope; +inf (slope 0) where there is no squeeze. */
  double[] gapValue;
  double[] gapSlope;
  /** E - u at the anchor and its slope: 0 on exponential pieces, top - u on uniform ones. */
  double[] raiseValue;
  double[] raiseSlope;
  /** True where the piece is drawn from uniformly under its top. */
  boolean[] uniform;
  /** log of the integral of exp(E) over the piece. */
  double[] logMass;
  double[] cumulative;
  /**
   * Guide table of the indexed search (Chen and Asau 1974): guide[i] is the first piece whose
   * cumulative weight exceeds i / size of the total, so a piece is found in about one step.
   */
  int[] guide;

  /**
   * What the draw path reads: one record of {@link PackedRecords#PIECE_STRIDE} doubles per piece,
   * laid out as {@link PackedRecords} defines.
   */
  double[] pieceRecords;

  int size;
  double total;
  double logScale;
  /**
   * The log-density value every {@link #value} is measured from: the largest h at the abscissae, so
   * that a constant added to h (a log-density is defined only up to one) never enters the hull's
   * arithmetic; values, masses and the tests are differences from it.
   */
  double reference;

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
    raiseValue = new double[capacity];
    raiseSlope = new double[capacity];
    uniform = new boolean[capacity];
    logMass = new double[capacity];
    cumulative = new double[capacity];
    guide = new int[capacity];
    pieceRecords = new double[PackedRecords.PIECE_STRIDE * capacity];
  }

  /** Empties the pieces and makes room for at least {@code capacity} of them; reference 0. */
  void reset(int capacity) {
    reset(capacity, 0.0);
  }

  /**
   * Empties the pieces, makes room for at least {@code capacity} of them and measures the values
   * added next from {@code referenceValue}.
   */
  void reset(int capacity, double referenceValue) {
    if (left.length < capacity) {
      allocate(Math.max(capacity, 2 * left.length));
    }
    size = 0;
    reference = referenceValue;
  }

  /** The largest of {@code hs[0..k)}: the reference of a hull through those values. */
  static double highest(double[] hs, int k) {
    double top = hs[0];
    for (int i = 1; i < k; i++) {
      top = Math.max(top, hs[i]);
    }
    return top;
  }

  /**
   * Appends a piece on [lower, upper] (pieces come in increasing order); a piece of zero width is
   * dropped since it has no mass. {@code valueAtAnchor} is h itself: it is stored less the
   * reference.
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
    value[j] = valueAtAnchor - reference;
    slope[j] = slopeOfHull;
    gapValue[j] = gapAtAnchor;
    gapSlope[j] = gapAtAnchor == Double.POSITIVE_INFINITY ? 0.0 : slopeOfGap;
  }

  /**
   * Computes the envelope of each piece, its log mass and the cumulative weights.
   *
   * @throws NonIntegrableHullException when an unbounded piece does not fall away
   */
  void seal() {
    double largest = Double.NEGATIVE_INFINITY;
    for (int j = 0; j < size; j++) {
      sealPiece(j);
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

  private void sealPiece(int j) {
    double s = slope[j];
    double width = right[j] - left[j];
    double decay;
    double scale;
    double origin;
    if (width == Double.POSITIVE_INFINITY) {
      boolean lowerSide = left[j] == Double.NEGATIVE_INFINITY;
      double end = lowerSide ? right[j] : left[j];
      if (!(lowerSide ? s > 0 : s < 0)) {
        throw new NonIntegrableHullException(
            "the hull is not integrable: on the unbounded "
                + (lowerSide ? "lower" : "upper")
                + " side the outermost slope at x = "
                + end
                + " is "
                + s
                + ", expected "
                + (lowerSide ? "> 0" : "< 0")
                + "; is the density proper on this support?",
            end);
      }
      uniform[j] = false;
      raiseValue[j] = 0;
      raiseSlope[j] = 0;
      logMass[j] = value[j] + s * (end - anchor[j]) - Math.log(Math.abs(s));
      decay = 1.0;
      origin = end;
      scale = -1.0 / s; // toward the inside: < 0 on the lower side, > 0 on the upper
    } else {
      double t = Math.abs(s) * width;
      double top = value[j] + s * ((s > 0 ? right[j] : left[j]) - anchor[j]);
      if (t <= UNIFORM_LIMIT) {
        uniform[j] = true;
        raiseValue[j] = top - value[j];
        raiseSlope[j] = -s;
        logMass[j] = top + Math.log(width);
        decay = -1.0;
        origin = left[j];
        scale = width;
      } else {
        // t > 0.5: 1 - exp(-t) >= 0.39, so the subtraction loses nothing
        uniform[j] = false;
        raiseValue[j] = 0;
        raiseSlope[j] = 0;
        decay = 1.0 - Math.exp(-t);
        logMass[j] = top + Math.log(decay) - Math.log(Math.abs(s));
        origin = s > 0 ? right[j] : left[j];
        scale = -1.0 / s;
      }
    }
    int at = PackedRecords.PIECE_STRIDE * j;
    pieceRecords[at + PackedRecords.PIECE_ORIGIN] = origin;
    pieceRecords[at + PackedRecords.PIECE_SCALE] = scale;
    pieceRecords[at + PackedRecords.PIECE_DECAY] = decay;
    pieceRecords[at + PackedRecords.PIECE_LEFT] = left[j];
    pieceRecords[at + PackedRecords.PIECE_RIGHT] = right[j];
    pieceRecords[at + PackedRecords.PIECE_ANCHOR] = anchor[j];
    pieceRecords[at + PackedRecords.PIECE_GAP_VALUE] = raiseValue[j] + gapValue[j];
    pieceRecords[at + PackedRecords.PIECE_GAP_SLOPE] = raiseSlope[j] + gapSlope[j];
    pieceRecords[at + PackedRecords.PIECE_RAISE_VALUE] = raiseValue[j];
    pieceRecords[at + PackedRecords.PIECE_RAISE_SLOPE] = raiseSlope[j];
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
   * The point of piece {@code j} at {@code u} in [0, 1) under its envelope: uniform pieces at u of
   * their width; exponential pieces by inverting the distribution function from the end where the
   * mass is (P(X &lt;= x) = u on falling pieces, P(X &gt;= x) = u on rising ones).
   */
  double position(int j, double u) {
    double[] d = pieceRecords;
    int at = PackedRecords.PIECE_STRIDE * j;
    double q = d[at + PackedRecords.PIECE_DECAY];
    double x;
    if (q < 0) {
      x = d[at + PackedRecords.PIECE_ORIGIN] + u * d[at + PackedRecords.PIECE_SCALE];
    } else {
      // -log(1 - u q) / |slope|, with q >= 0.39, so 1 - u q keeps its digits
      x =
          d[at + PackedRecords.PIECE_ORIGIN]
              - Math.log(1.0 - u * q) * d[at + PackedRecords.PIECE_SCALE];
    }
    // rounding may step just outside the piece; plain comparisons, cheaper than Math.min/max
    double lower = d[at + PackedRecords.PIECE_LEFT];
    if (x < lower) {
      return lower;
    }
    double upper = d[at + PackedRecords.PIECE_RIGHT];
    return x > upper ? upper : x;
  }

  /** The envelope E(x) of piece {@code j}: u(x) raised to the piece's top on uniform pieces. */
  double envelope(int j, double x) {
    double offset = x - anchor[j];
    return value[j] + slope[j] * offset + raiseValue[j] + raiseSlope[j] * offset;
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
      // integral = exp(top) (1 - exp(-t)) / |slope|; 1 - exp(-t) >= 0.63 loses nothing
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
    c.reference = reference;
    System.arraycopy(left, 0, c.left, 0, size);
    System.arraycopy(right, 0, c.right, 0, size);
    System.arraycopy(anchor, 0, c.anchor, 0, size);
    System.arraycopy(value, 0, c.value, 0, size);
    System.arraycopy(slope, 0, c.slope, 0, size);
    System.arraycopy(gapValue, 0, c.gapValue, 0, size);
    System.arraycopy(gapSlope, 0, c.gapSlope, 0, size);
    System.arraycopy(raiseValue, 0, c.raiseValue, 0, size);
    System.arraycopy(raiseSlope, 0, c.raiseSlope, 0, size);
    System.arraycopy(uniform, 0, c.uniform, 0, size);
    System.arraycopy(logMass, 0, c.logMass, 0, size);
    System.arraycopy(cumulative, 0, c.cumulative, 0, size);
    System.arraycopy(guide, 0, c.guide, 0, size);
    System.arraycopy(pieceRecords, 0, c.pieceRecords, 0, PackedRecords.PIECE_STRIDE * size);
    return c;
  }

  @Override
  public String toString() {
    return "PiecewiseExponential" + Arrays.toString(Arrays.copyOf(left, size));
  }
}

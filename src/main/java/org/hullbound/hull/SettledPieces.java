package org.hullbound.hull;

/**
 * The fast draw path of a settled hull: the pieces of a {@link PiecewiseExponential} split into
 * entries of an alias table (Walker 1977, An efficient method for generating discrete random
 * variables with general distributions, ACM TOMS 3, 253-256; stable construction of Vose 1991, A
 * linear algorithm for generating random numbers with a given distribution, IEEE TSE 17, 972-975),
 * so that one random long picks an entry in constant time.
 *
 * <p>A piece drawn uniformly under its top is split as in the ziggurat (Marsaglia and Tsang 2000,
 * The ziggurat method for generating random variables, J. Stat. Softw. 5(8)): its inner rectangle
 * lies under the squeeze everywhere on the piece (height exp(-max gap) of the top, the squeeze
 * being linear there), so a point drawn in it is accepted at once with x uniform on the piece and
 * no squeeze, exp or log; its outer rectangle, between that height and the top, keeps the usual
 * tests with the vertical uniform drawn above the inner height. Both are rectangles because the
 * envelope is flat on such a piece, so together they are exactly the region under the envelope.
 * Exponential pieces (and pieces without a squeeze) are one whole entry with the usual draw.
 *
 * <p>Bits: the top {@code columnBits} bits of the long choose a column, the low {@code
 * thresholdBits} (at most 53) bits are compared with the column's threshold; the two fields are
 * disjoint. The point and the vertical uniform come from separate draws of the generator.
 * Package-private and mutable: rebuilt in place when the hull has settled again.
 */
final class SettledPieces {

  /** Most bits of the long compared with a column's threshold: the precision of a double. */
  static final int MAXIMUM_THRESHOLD_BITS = 53;

  /**
   * Per entry: left end, width, and the range [floor, floor + share) of the vertical uniform: -1
   * and 0 on an inner entry (no vertical test), [inner height, 1) on an outer one, [0, 1) on a
   * whole piece.
   */
  static final int STRIDE = 4;
  static final int LEFT = 0;
  static final int WIDTH = 1;
  static final int FLOOR = 2;
  static final int SHARE = 3;

  int entries;
  int columnShift;
  long thresholdMask;
  /** Column c keeps its own entry when the low bits are below threshold[c], else alias[c]. */
  long[] threshold;
  int[] alias;
  int[] piece;
  double[] data;
  /** Weight of each entry, relative to the largest piece as in {@link PiecewiseExponential}. */
  double[] weight;
  double total;
  int thresholdBits;

  // Vose's work lists and scaled probabilities, kept to rebuild without allocating
  private double[] scaled;
  private int[] small;
  private int[] large;

  SettledPieces() {
    allocate(8, 8);
  }

  private void allocate(int entryCapacity, int columnCapacity) {
    piece = new int[entryCapacity];
    data = new double[STRIDE * entryCapacity];
    weight = new double[entryCapacity];
    threshold = new long[columnCapacity];
    alias = new int[columnCapacity];
    scaled = new double[columnCapacity];
    small = new int[columnCapacity];
    large = new int[columnCapacity];
  }

  /** Splits the sealed {@code pieces} into entries and builds the alias table over them. */
  void build(PiecewiseExponential pieces) {
    int n = pieces.size;
    int columns = Integer.highestOneBit(Math.max(2, 2 * n - 1)) << 1;
    if (piece.length < 2 * n || threshold.length < columns) {
      allocate(Math.max(2 * n, piece.length), Math.max(columns, threshold.length));
    }
    entries = 0;
    double[] d = pieces.packed;
    for (int j = 0; j < n; j++) {
      // from the log mass, not a difference of cumulative weights, which would cancel
      double pieceWeight = Math.exp(pieces.logMass[j] - pieces.logScale);
      int at = PiecewiseExponential.STRIDE * j;
      double left = d[at + PiecewiseExponential.LEFT];
      double right = d[at + PiecewiseExponential.RIGHT];
      double gapValue = d[at + PiecewiseExponential.GAP_VALUE];
      double gapSlope = d[at + PiecewiseExponential.GAP_SLOPE];
      double anchor = d[at + PiecewiseExponential.ANCHOR];
      // the gap E - l is linear on the piece: its largest value is at one end
      double maximumGap =
          Math.max(gapValue + gapSlope * (left - anchor), gapValue + gapSlope * (right - anchor));
      if (!pieces.uniform[j] || !(maximumGap < Double.POSITIVE_INFINITY)) {
        add(j, left, right - left, 0, 1, pieceWeight);
        continue;
      }
      double floor = Math.exp(-maximumGap);
      double share = -Math.expm1(-maximumGap);
      if (floor > 0) {
        add(j, left, right - left, -1, 0, pieceWeight * floor);
      }
      add(j, left, right - left, floor, share, pieceWeight * share);
    }
    buildAlias(columns);
  }

  private void add(int j, double left, double width, double floor, double share, double w) {
    int e = entries++;
    piece[e] = j;
    int at = STRIDE * e;
    data[at + LEFT] = left;
    data[at + WIDTH] = width;
    data[at + FLOOR] = floor;
    data[at + SHARE] = share;
    weight[e] = w;
  }

  /** Vose 1991: columns of equal probability, each split between its own entry and one alias. */
  private void buildAlias(int columns) {
    double sum = 0;
    for (int e = 0; e < entries; e++) {
      sum += weight[e];
    }
    total = sum;
    int columnBits = Integer.numberOfTrailingZeros(columns);
    thresholdBits = Math.min(MAXIMUM_THRESHOLD_BITS, Long.SIZE - columnBits);
    columnShift = Long.SIZE - columnBits;
    thresholdMask = (1L << thresholdBits) - 1;
    double one = (double) (1L << thresholdBits);
    int smallCount = 0;
    int largeCount = 0;
    for (int c = 0; c < columns; c++) {
      scaled[c] = c < entries ? weight[c] * columns / sum : 0.0;
      if (scaled[c] < 1.0) {
        small[smallCount++] = c;
      } else {
        large[largeCount++] = c;
      }
    }
    while (smallCount > 0 && largeCount > 0) {
      int s = small[--smallCount];
      int l = large[--largeCount];
      threshold[s] = Math.round(scaled[s] * one);
      alias[s] = l;
      // Vose's order of operations: (p_l + p_s) - 1 keeps the digits that p_l - (1 - p_s) loses
      scaled[l] = (scaled[l] + scaled[s]) - 1.0;
      if (scaled[l] < 1.0) {
        small[smallCount++] = l;
      } else {
        large[largeCount++] = l;
      }
    }
    // what is left has probability one up to rounding
    while (largeCount > 0) {
      int l = large[--largeCount];
      threshold[l] = 1L << thresholdBits;
      alias[l] = l;
    }
    while (smallCount > 0) {
      int s = small[--smallCount];
      threshold[s] = 1L << thresholdBits;
      alias[s] = s;
    }
  }

  /** The entry chosen by the 64 random bits {@code bits}. */
  int select(long bits) {
    int c = (int) (bits >>> columnShift);
    // without a branch, which would be mispredicted on a good share of draws: the sign of
    // (low bits - threshold) is all ones when the column keeps its own entry, else zero
    int own = (int) (((bits & thresholdMask) - threshold[c]) >> 63);
    return (c & own) | (alias[c] & ~own);
  }

  /** True when entry {@code e} lies under the squeeze on all its piece. */
  boolean isInner(int e) {
    return data[STRIDE * e + FLOOR] < 0;
  }

  /** The point at {@code u} in [0, 1) of entry {@code e}'s piece, uniform over its width. */
  double uniformPoint(int e, double u) {
    int at = STRIDE * e;
    double left = data[at + LEFT];
    double width = data[at + WIDTH];
    double x = left + u * width;
    // rounding of left + u width may pass the right end by an ulp
    return x - left > width ? left + width : x;
  }

  /** The probability with which {@link #select} returns entry {@code e}, read off the table. */
  double selectionProbability(int e) {
    int columns = 1 << (Long.SIZE - columnShift);
    double one = (double) (1L << thresholdBits);
    double p = threshold[e] / one;
    for (int c = 0; c < columns; c++) {
      if (c != e && alias[c] == e) {
        p += 1.0 - threshold[c] / one;
      }
    }
    return p / columns;
  }
}

package org.hullbound.hull;

import java.util.random.RandomGenerator;

/**
 * The fast draw path of a settled hull, in two layers over a {@link PiecewiseExponential}.
 *
 * <p>Inner rectangles, as in the ziggurat (Marsaglia and Tsang 2000, The ziggurat method for
 * generating random variables, J. Stat. Softw. 5(8)): on a piece drawn uniformly under its top, the
 * rectangle of height exp(-max gap) of the top lies under the squeeze everywhere on the piece (the
 * squeeze is linear there), so a point drawn in it is accepted at once with x uniform on the piece
 * and no squeeze, exp or log. The outer rectangle, between that height and the top, keeps the usual
 * tests with the vertical uniform drawn above the inner height. Both are rectangles because the
 * envelope is flat on such a piece, so together they are exactly the region under the envelope.
 * Exponential pieces (and pieces without a squeeze) are one whole entry with the usual draw.
 *
 * <p>Layer 1, equal columns: the envelope's mass is cut into {@code 2^b} columns of equal mass. Each
 * inner rectangle gives as many whole columns as fit in its mass (n_j = floor(inner mass / column
 * mass)), each with x uniform on the piece; the columns left over are "slow". One random long
 * decides a fast draw: its top b bits (b at most {@value #MAXIMUM_COLUMN_BITS}) pick the column and
 * its low 53 bits, a disjoint field, place x, exactly as {@code nextDouble} would.
 *
 * <p>Layer 2, the remainder (what the fast columns leave: the rest of each inner rectangle, the outer
 * rectangles and the whole pieces, of total mass (slow columns) x (column mass)): an alias table
 * (Walker 1977, An efficient method for generating discrete random variables with general
 * distributions, ACM TOMS 3, 253-256; stable construction of Vose 1991, A linear algorithm for
 * generating random numbers with a given distribution, IEEE TSE 17, 972-975) picks an entry from a
 * fresh random long: its top bits choose a column, its low bits (at most 53, disjoint) are compared
 * with the column's threshold; the point and the vertical uniform come from separate draws.
 * Package-private and mutable: rebuilt in place when the hull has settled again.
 */
final class SettledPieces {

  /** Most bits of the long compared with a column's threshold: the precision of a double. */
  static final int MAXIMUM_THRESHOLD_BITS = 53;

  /** Most bits for an equal column, so that 53 bits of the same long remain for x. */
  static final int MAXIMUM_COLUMN_BITS = Long.SIZE - 53;

  /** Equal columns per piece aimed at, so that the part left to layer 2 stays small. */
  private static final int COLUMNS_PER_PIECE = 16;

  /** The low 53 bits of a long, and their scale to [0, 1), as {@code nextDouble} uses them. */
  static final long POINT_MASK = (1L << 53) - 1;
  static final double POINT_SCALE = 0x1.0p-53;

  /** Layer 1: top bits of the long that choose an equal column. */
  int equalShift;
  /** Layer 1: left end and width of each equal column's piece; width -1 on a slow column. */
  double[] equal;
  /** Layer 1: number of fast columns, and the number of columns. */
  int fastColumns;
  int equalColumns;

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
    equal = new double[0];
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

  /** Splits the sealed {@code pieces} into equal columns and alias entries for the rest. */
  void build(PiecewiseExponential pieces) {
    int n = pieces.size;
    int columns = Integer.highestOneBit(Math.max(2, 2 * n - 1)) << 1;
    if (piece.length < 2 * n || threshold.length < columns) {
      allocate(Math.max(2 * n, piece.length), Math.max(columns, threshold.length));
    }
    int equalBits =
        Math.min(
            MAXIMUM_COLUMN_BITS,
            Math.max(6, Long.SIZE - Long.numberOfLeadingZeros((long) COLUMNS_PER_PIECE * n - 1)));
    equalColumns = 1 << equalBits;
    equalShift = Long.SIZE - equalBits;
    if (equal.length < 2 * equalColumns) {
      equal = new double[2 * equalColumns];
    }
    double[] weights = new double[n];
    double sumOfPieces = 0;
    for (int j = 0; j < n; j++) {
      // from the log mass, not a difference of cumulative weights, which would cancel
      weights[j] = Math.exp(pieces.logMass[j] - pieces.logScale);
      sumOfPieces += weights[j];
    }
    double columnMass = sumOfPieces / equalColumns;
    fastColumns = 0;
    entries = 0;
    double[] d = pieces.packed;
    for (int j = 0; j < n; j++) {
      double pieceWeight = weights[j];
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
      double inner = pieceWeight * floor;
      int whole = (int) Math.min(inner / columnMass, equalColumns - fastColumns);
      for (int c = 0; c < whole; c++) {
        equal[2 * fastColumns] = left;
        equal[2 * fastColumns + 1] = right - left;
        fastColumns++;
      }
      double rest = inner - whole * columnMass;
      if (rest > 0) {
        add(j, left, right - left, -1, 0, rest);
      }
      add(j, left, right - left, floor, share, pieceWeight * share);
    }
    for (int c = fastColumns; c < equalColumns; c++) {
      equal[2 * c] = 0;
      equal[2 * c + 1] = -1;
    }
    buildAlias(columns);
  }

  /**
   * Layer 1: the point of a fast column chosen by {@code bits}, or NaN on a slow column (the draw
   * then goes to layer 2 with fresh random bits).
   */
  double fastPoint(long bits) {
    int c = (int) (bits >>> equalShift);
    double width = equal[2 * c + 1];
    if (!(width > 0)) {
      return Double.NaN;
    }
    double left = equal[2 * c];
    double x = left + ((bits & POINT_MASK) * POINT_SCALE) * width;
    // rounding of left + u width may pass the right end by an ulp
    return x - left > width ? left + width : x;
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

  /**
   * One draw of x from the normalised envelope through both layers alone, without the acceptance
   * test, as the sampler makes its proposals; for tests against the hull's distribution function.
   */
  double drawFromEnvelope(RandomGenerator rng, PiecewiseExponential pieces) {
    double x = fastPoint(rng.nextLong());
    if (!Double.isNaN(x)) {
      return x;
    }
    int e = select(rng.nextLong());
    int j = piece[e];
    return pieces.uniform[j] ? uniformPoint(e, rng.nextDouble()) : pieces.position(j, rng.nextDouble());
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

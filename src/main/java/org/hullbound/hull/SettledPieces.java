package org.hullbound.hull;

/**
 * The fast draw path of a settled hull: a staircase envelope over a {@link PiecewiseExponential},
 * its inner rectangles cut into columns of equal mass, and an alias table for the rest.
 *
 * <p>Staircase: a piece drawn uniformly is cut into steps of equal width, each flat at the top of
 * the hull u on it (so the envelope still lies above u, hence above h), few enough that u rises by
 * at most {@value #STEP_RISE} over a step. A step's inner rectangle, as in the ziggurat (Marsaglia
 * and Tsang 2000, The ziggurat method for generating random variables, J. Stat. Softw. 5(8)), has
 * the height of the lowest point of the squeeze on the step (the squeeze is linear there), so a
 * point drawn in it is accepted at once with x uniform on the step: no squeeze, exp or log. The
 * outer rectangle, between that height and the step's top, keeps the usual tests with the vertical
 * uniform drawn above the inner height. Steps shrink both the outer rectangles and the part of them
 * above u, which is rejected without an evaluation. Exponential pieces (and pieces without a
 * squeeze) are one whole entry with the usual draw.
 *
 * <p>Layer 1, equal columns: the inner rectangles are laid end to end on a mass axis [0, inner
 * mass), followed by the rest, and the whole axis is cut into {@code 2^b} columns of equal mass
 * (b at most {@value #MAXIMUM_COLUMN_BITS}). One random long decides a draw: its top b bits pick
 * the column and its low 52 bits place a point u in it (finer than the rounding of x itself). A
 * column inside one rectangle maps u to x by one multiply-add; a column across two rectangles side
 * by side adds a second, branch-free term past the point where it crosses; any other column (a
 * rectangle boundary among tiny rectangles, the end of the inner mass, a bound of the support)
 * finds its rectangle by a short search from the first one it touches (the guide table of Chen and
 * Asau 1974). No inner mass is lost to rounding columns.
 *
 * <p>Layer 2, the rest (a point past the inner mass): an alias table (Walker 1977, An efficient
 * method for generating discrete random variables with general distributions, ACM TOMS 3, 253-256;
 * stable construction of Vose 1991, A linear algorithm for generating random numbers with a given
 * distribution, IEEE TSE 17, 972-975) over the outer rectangles and whole pieces picks an entry
 * from a fresh random long: its top bits choose a column, its low bits (at most 53, disjoint) are
 * compared with the column's threshold; the point and the vertical uniform come from separate
 * draws. Package-private and mutable: rebuilt in place when the hull has settled again.
 */
final class SettledPieces {

  /** Most bits of the long compared with an alias column's threshold: the precision of a double. */
  static final int MAXIMUM_THRESHOLD_BITS = 53;

  /** Most bits that choose an equal column: 4096 columns of four doubles, 128 KiB. */
  static final int MAXIMUM_COLUMN_BITS = 12;

  /** Fewest bits that choose an equal column. */
  private static final int MINIMUM_COLUMN_BITS = 6;

  /** Equal columns per inner rectangle aimed at, so that few columns straddle two of them. */
  private static final int COLUMNS_PER_RECTANGLE = 64;

  /** Largest rise of the hull u over one step of a staircase. */
  static final double STEP_RISE = 0.02;

  /** Most steps per piece. */
  static final int MAXIMUM_STEPS = 16;

  /** The low bits of the long that place a point in its column, and their scale to [0, 1). */
  static final long POINT_MASK = (1L << (Long.SIZE - MAXIMUM_COLUMN_BITS)) - 1;
  static final double POINT_SCALE = 1.0 / (1L << (Long.SIZE - MAXIMUM_COLUMN_BITS));

  /** Layer 1: top bits of the long that choose an equal column. */
  int columnShift;
  int columnCount;
  double columnMass;
  /**
   * One record of {@link PackedRecords#COLUMN_STRIDE} doubles per equal column: where it starts in
   * x, its width, where it crosses into a second rectangle and the change of width there (see
   * {@link PackedRecords}).
   */
  double[] columnRecords;

  /** Per column: the first inner rectangle it touches, -1 past the inner mass. */
  int[] firstRectangle;

  /**
   * The inner rectangles on the mass axis: where each starts (rectangles + 1 entries, the last the
   * inner mass), its left and right ends, and its mass per unit of x.
   */
  int rectangles;
  double[] rectangleStart;
  double[] rectangleLeft;
  double[] rectangleRight;
  double[] rectangleDensity;
  /** A point of the mass axis below this is inner; +inf when there is no rest. */
  double innerLimit;
  double innerMass;

  int entries;
  int aliasShift;
  long thresholdMask;
  /**
   * Walker's alias table over the rest: column c keeps its own entry when the low bits are
   * below threshold[c], else it gives alias[c].
   */
  long[] threshold;
  int[] alias;
  /** Per rest entry: the envelope piece it belongs to. */
  int[] restPiece;
  /**
   * One record of {@link PackedRecords#REST_STRIDE} doubles per rest entry: left end, width, the
   * range of the vertical uniform and the step's drop (see {@link PackedRecords}).
   */
  double[] restRecords;
  /** Mass of each entry, relative to the largest piece as in {@link PiecewiseExponential}. */
  double[] restWeight;
  double total;
  int thresholdBits;

  // Vose's work lists and scaled probabilities, kept to rebuild without allocating
  private double[] scaled;
  private int[] small;
  private int[] large;

  SettledPieces() {
    allocateEntries(8);
    allocateAlias(8);
    allocateRectangles(8);
    columnRecords = new double[0];
    firstRectangle = new int[0];
  }

  private void allocateEntries(int capacity) {
    restPiece = new int[capacity];
    restRecords = new double[PackedRecords.REST_STRIDE * capacity];
    restWeight = new double[capacity];
  }

  private void allocateAlias(int aliasCapacity) {
    threshold = new long[aliasCapacity];
    alias = new int[aliasCapacity];
    scaled = new double[aliasCapacity];
    small = new int[aliasCapacity];
    large = new int[aliasCapacity];
  }

  private void allocateRectangles(int capacity) {
    rectangleStart = new double[capacity + 1];
    rectangleLeft = new double[capacity];
    rectangleRight = new double[capacity];
    rectangleDensity = new double[capacity];
  }

  /** Cuts the sealed {@code pieces} into a staircase, its inner rectangles into equal columns. */
  void build(PiecewiseExponential pieces) {
    int n = pieces.size;
    int mostSteps = MAXIMUM_STEPS * n;
    if (rectangleLeft.length < mostSteps) {
      allocateRectangles(mostSteps);
    }
    if (restPiece.length < mostSteps + n) {
      allocateEntries(mostSteps + n);
    }
    rectangles = 0;
    entries = 0;
    double innerSum = 0;
    double[] d = pieces.pieceRecords;
    for (int j = 0; j < n; j++) {
      // from the log mass, not a difference of cumulative weights, which would cancel
      double pieceWeight = Math.exp(pieces.logMass[j] - pieces.logScale);
      int at = PackedRecords.PIECE_STRIDE * j;
      double left = d[at + PackedRecords.PIECE_LEFT];
      double right = d[at + PackedRecords.PIECE_RIGHT];
      double width = right - left;
      if (!pieces.uniform[j] || !(pieces.gapValue[j] < Double.POSITIVE_INFINITY)) {
        addEntry(j, left, width, 0, 1, 0, pieceWeight);
        continue;
      }
      // E - u (the raise) and E - l (the gap) are linear on the piece: extremes at the ends
      double rise = Math.max(raise(d, at, left), raise(d, at, right));
      int steps = (int) Math.min(MAXIMUM_STEPS, Math.max(1, Math.ceil(rise / STEP_RISE)));
      for (int s = 0; s < steps; s++) {
        double a = s == 0 ? left : left + width * s / steps;
        double b = s == steps - 1 ? right : left + width * (s + 1) / steps;
        if (!(b > a)) {
          continue;
        }
        double drop = Math.max(0.0, Math.min(raise(d, at, a), raise(d, at, b)));
        double innerGap = Math.max(0.0, Math.max(gap(d, at, a), gap(d, at, b)) - drop);
        double stepMass = pieceWeight * ((b - a) / width) * Math.exp(-drop);
        double floor = Math.exp(-innerGap);
        double share = -Math.expm1(-innerGap);
        double inner = stepMass * floor;
        if (inner > 0) {
          addRectangle(a, b, innerSum, inner);
          innerSum += inner;
        }
        if (stepMass * share > 0) {
          addEntry(j, a, b - a, floor, share, drop, stepMass * share);
        }
      }
    }
    rectangleStart[rectangles] = innerSum;
    innerMass = innerSum;
    int aliasColumns = Integer.highestOneBit(Math.max(1, entries - 1)) << 1;
    if (threshold.length < aliasColumns) {
      allocateAlias(aliasColumns);
    }
    double restMass = buildAlias(aliasColumns);
    innerLimit = entries == 0 ? Double.POSITIVE_INFINITY : innerSum;
    buildColumns(
        innerSum + restMass, d[PackedRecords.PIECE_LEFT],
        d[PackedRecords.PIECE_STRIDE * (n - 1) + PackedRecords.PIECE_RIGHT]);
  }

  private static double raise(double[] d, int at, double x) {
    return d[at + PackedRecords.PIECE_RAISE_VALUE]
        + d[at + PackedRecords.PIECE_RAISE_SLOPE] * (x - d[at + PackedRecords.PIECE_ANCHOR]);
  }

  private static double gap(double[] d, int at, double x) {
    return d[at + PackedRecords.PIECE_GAP_VALUE]
        + d[at + PackedRecords.PIECE_GAP_SLOPE] * (x - d[at + PackedRecords.PIECE_ANCHOR]);
  }

  private void addRectangle(double left, double right, double start, double mass) {
    int r = rectangles++;
    rectangleStart[r] = start;
    rectangleLeft[r] = left;
    rectangleRight[r] = right;
    rectangleDensity[r] = mass / (right - left);
  }

  private void addEntry(
      int j, double left, double width, double floor, double share, double drop, double w) {
    int e = entries++;
    restPiece[e] = j;
    int at = PackedRecords.REST_STRIDE * e;
    restRecords[at + PackedRecords.REST_LEFT] = left;
    restRecords[at + PackedRecords.REST_WIDTH] = width;
    restRecords[at + PackedRecords.REST_FLOOR] = floor;
    restRecords[at + PackedRecords.REST_SHARE] = share;
    restRecords[at + PackedRecords.REST_DROP] = drop;
    restWeight[e] = w;
  }

  /**
   * Cuts the mass axis [0, totalMass) into equal columns and maps those inside one rectangle, or
   * two side by side, to x.
   */
  private void buildColumns(double totalMass, double supportLower, double supportUpper) {
    int bits =
        Math.min(
            MAXIMUM_COLUMN_BITS,
            Math.max(
                MINIMUM_COLUMN_BITS,
                Long.SIZE
                    - Long.numberOfLeadingZeros((long) COLUMNS_PER_RECTANGLE * rectangles - 1)));
    columnCount = 1 << bits;
    columnShift = Long.SIZE - bits;
    columnMass = totalMass / columnCount;
    if (columnRecords.length < PackedRecords.COLUMN_STRIDE * columnCount) {
      columnRecords = new double[PackedRecords.COLUMN_STRIDE * columnCount];
      firstRectangle = new int[columnCount];
    }
    int r = 0;
    for (int c = 0; c < columnCount; c++) {
      double low = c * columnMass;
      double high = (c + 1) * columnMass;
      while (r < rectangles && rectangleStart[r + 1] <= low) {
        r++;
      }
      int at = PackedRecords.COLUMN_STRIDE * c;
      // NaN makes the fast point NaN without a test of its own
      columnRecords[at + PackedRecords.COLUMN_BASE] = Double.NaN;
      columnRecords[at + PackedRecords.COLUMN_SPAN] = Double.NaN;
      columnRecords[at + PackedRecords.COLUMN_CUT] = 1;
      columnRecords[at + PackedRecords.COLUMN_BEND] = 0;
      if (r >= rectangles || !(low < innerLimit)) {
        firstRectangle[c] = -1;
        continue;
      }
      firstRectangle[c] = r;
      boolean one = high <= rectangleStart[r + 1];
      boolean two =
          !one
              && r + 1 < rectangles
              && high <= rectangleStart[r + 2]
              && rectangleRight[r] == rectangleLeft[r + 1];
      double left = rectangleLeft[r];
      double right = one ? rectangleRight[r] : two ? rectangleRight[r + 1] : Double.NaN;
      // at a bound of the support x must not pass it by an ulp: those columns take the slow
      // path, which clamps; elsewhere an ulp over a rectangle's end is only rounding
      if (!(one || two) || left == supportLower || right == supportUpper) {
        continue;
      }
      double span = columnMass / rectangleDensity[r];
      columnRecords[at + PackedRecords.COLUMN_BASE] =
          left + (low - rectangleStart[r]) / rectangleDensity[r];
      columnRecords[at + PackedRecords.COLUMN_SPAN] = span;
      if (two) {
        // past u = cut the mass axis is in the next rectangle, from its left end at its rate
        columnRecords[at + PackedRecords.COLUMN_CUT] = (rectangleStart[r + 1] - low) / columnMass;
        columnRecords[at + PackedRecords.COLUMN_BEND] =
            columnMass / rectangleDensity[r + 1] - span;
      }
    }
  }

  /**
   * Layer 1: the point of a column inside one inner rectangle, or two side by side, chosen by
   * {@code bits}, or NaN on any other column (then {@link #innerPoint} with the same bits).
   */
  double fastPoint(long bits) {
    int at = PackedRecords.COLUMN_STRIDE * (int) (bits >>> columnShift);
    return columnPoint(columnRecords, at, columnRecords[at + PackedRecords.COLUMN_SPAN], bits);
  }

  /** The point of the column at {@code at} (of width {@code span} there) that {@code bits} place. */
  static double columnPoint(double[] columns, int at, double span, long bits) {
    double u = (bits & POINT_MASK) * POINT_SCALE;
    // max(0, u - cut) without a branch, which would be mispredicted on two-rectangle columns:
    // the sign bit of u - cut, spread over the word, clears a negative difference
    long over = Double.doubleToRawLongBits(u - columns[at + PackedRecords.COLUMN_CUT]);
    double past = Double.longBitsToDouble(over & ~(over >> 63));
    return columns[at + PackedRecords.COLUMN_BASE]
        + u * span
        + past * columns[at + PackedRecords.COLUMN_BEND];
  }

  /**
   * Layer 1 on a column that is not inside one rectangle: the point of the mass axis that
   * {@code bits} chooses, mapped to x when it is inner, else NaN (a draw from the rest follows).
   */
  double innerPoint(long bits) {
    int c = (int) (bits >>> columnShift);
    double s = c * columnMass + ((bits & POINT_MASK) * POINT_SCALE) * columnMass;
    if (!(s < innerLimit)) {
      return Double.NaN;
    }
    // -1 past the last rectangle's start, reached here only by rounding when nothing follows the
    // inner mass (innerLimit +inf)
    int r = Math.max(0, firstRectangle[c]);
    int last = rectangles - 1;
    while (r < last && rectangleStart[r + 1] <= s) {
      r++;
    }
    double left = rectangleLeft[r];
    double x = left + (s - rectangleStart[r]) / rectangleDensity[r];
    if (!(x >= left)) {
      return left;
    }
    double right = rectangleRight[r];
    return x > right ? right : x;
  }

  /** Layer 1 whole: the inner point {@code bits} choose, fast or searched; NaN for the rest. */
  double innerDraw(long bits) {
    double x = fastPoint(bits);
    return Double.isNaN(x) ? innerPoint(bits) : x;
  }

  /**
   * Vose 1991: columns of equal probability, each split between its own entry and one alias.
   *
   * @return the mass of the rest
   */
  private double buildAlias(int columns) {
    double sum = 0;
    for (int e = 0; e < entries; e++) {
      sum += restWeight[e];
    }
    total = sum;
    int columnBits = Integer.numberOfTrailingZeros(columns);
    thresholdBits = Math.min(MAXIMUM_THRESHOLD_BITS, Long.SIZE - columnBits);
    aliasShift = Long.SIZE - columnBits;
    thresholdMask = (1L << thresholdBits) - 1;
    if (entries == 0) {
      return 0;
    }
    double one = (double) (1L << thresholdBits);
    int smallCount = 0;
    int largeCount = 0;
    for (int c = 0; c < columns; c++) {
      scaled[c] = c < entries ? restWeight[c] * columns / sum : 0.0;
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
    return sum;
  }

  /** The entry of the rest chosen by the 64 random bits {@code bits}. */
  int select(long bits) {
    int c = (int) (bits >>> aliasShift);
    // without a branch, which would be mispredicted on a good share of draws: the sign of
    // (low bits - threshold) is all ones when the column keeps its own entry, else zero
    int own = (int) (((bits & thresholdMask) - threshold[c]) >> 63);
    return (c & own) | (alias[c] & ~own);
  }

  /** The point at {@code u} in [0, 1) of entry {@code e}'s step or piece, uniform over its width. */
  double uniformPoint(int e, double u) {
    int at = PackedRecords.REST_STRIDE * e;
    double left = restRecords[at + PackedRecords.REST_LEFT];
    double width = restRecords[at + PackedRecords.REST_WIDTH];
    double x = left + u * width;
    // rounding of left + u width may pass the right end by an ulp
    return x - left > width ? left + width : x;
  }
}

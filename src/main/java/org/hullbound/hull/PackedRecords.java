package org.hullbound.hull;

/**
 * The layout of the three packed tables the draw path reads, in one place: each table holds one
 * fixed-size record per item in a flat {@code double[]}, record i starting at {@code STRIDE * i},
 * so that one draw touches one or two cache lines instead of one per array (common practice).
 *
 * <ul>
 *   <li>Envelope pieces ({@link PiecewiseExponential#pieceRecords}): one record of {@value
 *       #PIECE_STRIDE} doubles per piece of the piecewise-exponential envelope (the upper hull of
 *       Gilks and Wild 1992, Applied Statistics 41, 337-348) with its squeeze.
 *   <li>Equal columns ({@link SettledPieces#columnRecords}): one record of {@value #COLUMN_STRIDE}
 *       doubles per column of equal mass over the inner rectangles of the staircase (the ziggurat
 *       idea of Marsaglia and Tsang 2000, J. Stat. Softw. 5(8)).
 *   <li>Rest entries ({@link SettledPieces#restRecords}): one record of {@value #REST_STRIDE}
 *       doubles per entry of the alias table (Walker 1977, ACM TOMS 3, 253-256; Vose 1991, IEEE TSE
 *       17, 972-975) over the outer rectangles and whole pieces.
 * </ul>
 *
 * <p>Here u is the linear hull on a piece, l the squeeze and E the envelope the proposals come
 * from (E = u on an exponential piece, the flat top of u on a piece drawn uniformly).
 */
final class PackedRecords {

  private PackedRecords() {}

  /** Doubles per envelope piece. */
  static final int PIECE_STRIDE = 10;
  /** The end a point is measured from: the lower end, or the upper end of a rising exponential. */
  static final int PIECE_ORIGIN = 0;
  /** Uniform piece: its width; exponential piece: 1 / |slope| signed toward the inside. */
  static final int PIECE_SCALE = 1;
  /**
   * Exponential piece: 1 - exp(-|slope| width), the share of the exponential it holds; -1 on a
   * uniform piece.
   */
  static final int PIECE_DECAY = 2;
  /** Lower end of the piece. */
  static final int PIECE_LEFT = 3;
  /** Upper end of the piece. */
  static final int PIECE_RIGHT = 4;
  /** The x the linear forms of the piece are measured from. */
  static final int PIECE_ANCHOR = 5;
  /** E - l at the anchor; +inf where there is no squeeze. */
  static final int PIECE_GAP_VALUE = 6;
  /** Slope of E - l. */
  static final int PIECE_GAP_SLOPE = 7;
  /** E - u at the anchor (0 on an exponential piece). */
  static final int PIECE_RAISE_VALUE = 8;
  /** Slope of E - u. */
  static final int PIECE_RAISE_SLOPE = 9;

  /** Doubles per equal column. */
  static final int COLUMN_STRIDE = 4;
  /** The x where the column starts; NaN on a slow column (one that needs the search). */
  static final int COLUMN_BASE = 0;
  /** The column's width in x while in its first rectangle; NaN on a slow column. */
  static final int COLUMN_SPAN = 1;
  /** The point u in [0, 1) where the column crosses into a second rectangle; 1 for none. */
  static final int COLUMN_CUT = 2;
  /** The change of width in x past the cut. */
  static final int COLUMN_BEND = 3;

  /** Doubles per rest entry. */
  static final int REST_STRIDE = 5;
  /** Left end of the step or piece. */
  static final int REST_LEFT = 0;
  /** Width of the step or piece. */
  static final int REST_WIDTH = 1;
  /**
   * Lower end of the vertical uniform's range [floor, floor + share), relative to the step's top:
   * the inner height on an outer rectangle, 0 on a whole piece.
   */
  static final int REST_FLOOR = 2;
  /** Length of the vertical uniform's range. */
  static final int REST_SHARE = 3;
  /** Drop of the step's top below the piece's envelope E (0 on a whole piece). */
  static final int REST_DROP = 4;
}

package org.hullbound.hull;

import java.util.random.RandomGenerator;

/** Test-side draws from a hull's tables alone, without the rejection step. */
final class HullSnapshots {

  private HullSnapshots() {}

  /** One draw from the normalised envelope exp(E) of {@code snapshot} alone. */
  static double drawFromHull(HullSnapshot snapshot, RandomGenerator rng) {
    PiecewiseExponential pieces = snapshot.pieces;
    int j = pieces.select(rng.nextDouble());
    return pieces.position(j, rng.nextDouble());
  }

  /**
   * One draw from the normalised linear hull exp(u) through both layers of a settled table:
   * proposals from the staircase, those above u rejected (Gilks and Wild 1992's envelope with the
   * ziggurat layers of Marsaglia and Tsang 2000).
   */
  static double drawUnderHull(
      SettledPieces table, RandomGenerator rng, PiecewiseExponential pieces) {
    while (true) {
      double x = table.innerDraw(rng.nextLong());
      if (!Double.isNaN(x)) {
        return x;
      }
      int e = table.select(rng.nextLong());
      int j = table.restPiece[e];
      if (!pieces.uniform[j]) {
        return pieces.position(j, rng.nextDouble());
      }
      int at = PackedRecords.REST_STRIDE * e;
      double[] rest = table.restRecords;
      x = table.uniformPoint(e, rng.nextDouble());
      double w =
          rest[at + PackedRecords.REST_FLOOR]
              + rest[at + PackedRecords.REST_SHARE] * rng.nextDouble();
      double[] d = pieces.pieceRecords;
      int p = PackedRecords.PIECE_STRIDE * j;
      double raise =
          d[p + PackedRecords.PIECE_RAISE_VALUE]
              + d[p + PackedRecords.PIECE_RAISE_SLOPE] * (x - d[p + PackedRecords.PIECE_ANCHOR]);
      if (w < Math.exp(rest[at + PackedRecords.REST_DROP] - raise)) {
        return x;
      }
    }
  }

  /** The probability with which {@link SettledPieces#select} returns entry {@code e}, read off. */
  static double selectionProbability(SettledPieces table, int e) {
    int columns = 1 << (Long.SIZE - table.aliasShift);
    double one = (double) (1L << table.thresholdBits);
    double p = table.threshold[e] / one;
    for (int c = 0; c < columns; c++) {
      if (c != e && table.alias[c] == e) {
        p += 1.0 - table.threshold[c] / one;
      }
    }
    return p / columns;
  }
}

package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The fast path of a settled hull ({@link SettledPieces}): its equal columns and alias table
 * reproduce the segment masses of the envelope, its inner rectangles lie under the squeeze, draws
 * through it alone follow the hull's own distribution function, and a sampler drawing through it
 * stays exact against commons-math3 3.6.1.
 *
 * <p>KS tests (commons-math3 {@code KolmogorovSmirnovTest}) of 5000 draws at level 0.001: each
 * fails an exact sampler with probability 0.001 and detects a CDF error of 0.04 with probability
 * above 0.99 (critical distance 1.95 / sqrt(n) = 0.028; asymptotic Kolmogorov quantile, common
 * practice).
 */
class SettledPiecesTest {

  private static final int N = 5000;
  private static final double ALPHA = 0.001;

  /** Targets in both forms: the fast path must serve unbounded, half-bounded and bounded hulls. */
  static List<Object[]> targets() {
    return List.of(
        new Object[] {Target.normal(0, 1), false},
        new Object[] {Target.normal(0, 1), true},
        new Object[] {Target.gamma(2.5, 1), false},
        new Object[] {Target.gamma(2.5, 1), true},
        new Object[] {Target.beta(2, 5), false},
        new Object[] {Target.beta(2, 5), true});
  }

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  /** A sampler adapted by 20000 draws (the hull at its cap of 64, so it no longer changes). */
  private static AdaptiveSampler settled(Target target, boolean derivativeFree) {
    AdaptiveSampler sampler = (AdaptiveSampler) target.sampler(derivativeFree, HullOptions.defaults());
    RandomGenerator rng = rng(99);
    for (int i = 0; i < 20_000; i++) {
      sampler.sample(rng);
    }
    assertNotNull(sampler.settledOrNull(), "the hull has settled after 20000 draws");
    return sampler;
  }

  private static SettledPieces table(AdaptiveSampler sampler) {
    SettledPieces table = new SettledPieces();
    table.build(sampler.pieces);
    return table;
  }

  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void aliasTableReproducesTheEntryProbabilities(Target target, boolean derivativeFree) {
    SettledPieces table = table(settled(target, derivativeFree));
    double sum = 0;
    for (int e = 0; e < table.entries; e++) {
      double p = table.selectionProbability(e);
      assertEquals(table.weight[e] / table.total, p, 1e-12, "entry " + e);
      sum += p;
    }
    assertEquals(1.0, sum, 1e-12, "no column falls outside the entries");
  }

  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void columnsAndEntriesSplitEachPieceMassExactly(Target target, boolean derivativeFree) {
    AdaptiveSampler sampler = settled(target, derivativeFree);
    PiecewiseExponential pieces = sampler.pieces;
    SettledPieces table = table(sampler);
    double[] pieceMass = new double[pieces.size];
    double sumOfPieces = 0;
    for (int j = 0; j < pieces.size; j++) {
      pieceMass[j] = Math.exp(pieces.logMass[j] - pieces.logScale);
      sumOfPieces += pieceMass[j];
    }
    double columnMass = sumOfPieces / table.equalColumns;
    double[] split = new double[pieces.size];
    for (int c = 0; c < table.fastColumns; c++) {
      int j = pieces.pieceOf(table.equal[2 * c] + 0.5 * table.equal[2 * c + 1]);
      assertEquals(pieces.left[j], table.equal[2 * c], "column " + c + " starts its piece");
      assertEquals(pieces.right[j] - pieces.left[j], table.equal[2 * c + 1], "column " + c);
      split[j] += columnMass;
    }
    for (int e = 0; e < table.entries; e++) {
      split[table.piece[e]] += table.weight[e];
    }
    for (int j = 0; j < pieces.size; j++) {
      assertEquals(pieceMass[j], split[j], 1e-12 * pieceMass[j], "piece " + j);
    }
    double slow = table.equalColumns - table.fastColumns;
    assertEquals(slow * columnMass, table.total, 1e-12 * sumOfPieces, "remainder = slow columns");
    assertTrue(table.fastColumns > 0.85 * table.equalColumns, table.fastColumns + " fast columns");
  }

  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void innerRectanglesLieUnderTheSqueeze(Target target, boolean derivativeFree) {
    AdaptiveSampler sampler = settled(target, derivativeFree);
    PiecewiseExponential pieces = sampler.pieces;
    SettledPieces table = table(sampler);
    HullSnapshot snapshot = sampler.snapshot();
    int checked = 0;
    for (int e = 0; e < table.entries; e++) {
      int j = table.piece[e];
      double floor = table.data[SettledPieces.STRIDE * e + SettledPieces.FLOOR];
      if (table.isInner(e)) {
        assertTrue(pieces.uniform[j], "inner rectangles only on uniform pieces");
        continue;
      }
      if (floor == 0) {
        continue; // a whole piece: no inner rectangle
      }
      // an outer entry holds the height of its piece's inner rectangle as its floor
      assertTrue(pieces.uniform[j] && floor > 0 && floor <= 1, "inner height " + floor);
      checked++;
      for (int i = 0; i <= 20; i++) {
        double x = pieces.left[j] + i / 20.0 * (pieces.right[j] - pieces.left[j]);
        // the squeeze from the chords themselves, independent of the pieces
        double below = snapshot.logSqueezeFromChords(x) - pieces.envelope(j, x);
        assertTrue(
            Math.log(floor) <= below + 1e-12,
            "inner rectangle above the squeeze at " + x + ": log height " + Math.log(floor)
                + ", squeeze - envelope " + below + ", piece " + j + " [" + pieces.left[j] + ", "
                + pieces.right[j] + "]");
      }
    }
    assertTrue(checked > 10, checked + " inner rectangles checked");
  }

  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void drawsThroughTheFastPathAloneFollowTheHullCdf(Target target, boolean derivativeFree) {
    AdaptiveSampler sampler = settled(target, derivativeFree);
    SettledPieces table = table(sampler);
    HullSnapshot snapshot = sampler.snapshot();
    RandomGenerator rng = rng(1234);
    double[] draws = new double[N];
    for (int i = 0; i < N; i++) {
      draws[i] = table.drawFromEnvelope(rng, sampler.pieces);
    }
    double p = CdfReference.of(snapshot::hullCdf).ksPValue(draws);
    assertTrue(p >= ALPHA, "KS p-value " + p + " of fast-path draws against the hull CDF");
  }

  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void aSettledSamplerDrawsMostlyThroughTheColumnsAndStaysExact(
      Target target, boolean derivativeFree) {
    AdaptiveSampler sampler = settled(target, derivativeFree);
    long before = sampler.innerAcceptances;
    double[] draws = new double[N];
    sampler.sample(rng(4321), draws);
    long fast = sampler.innerAcceptances - before;
    assertTrue(fast > 0.85 * N, fast + " of " + N + " draws through the equal columns");
    double p = target.reference().ksPValue(draws);
    assertTrue(p >= ALPHA, target + ": KS p-value " + p);
  }

  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void settledDrawsRepeatWithTheSeed(Target target, boolean derivativeFree) {
    double[] first = new double[N];
    double[] second = new double[N];
    settled(target, derivativeFree).sample(rng(5), first);
    settled(target, derivativeFree).sample(rng(5), second);
    assertArrayEquals(first, second);
  }

  @Test
  void aSamplerUsedForAFewDrawsNeverBuildsTheTable() {
    AdaptiveSampler sampler =
        (AdaptiveSampler) Target.normal(3, 2).sampler(false, HullOptions.defaults());
    RandomGenerator rng = rng(6);
    for (int i = 0; i < 8; i++) {
      sampler.sample(rng);
    }
    assertNull(sampler.settledOrNull());
  }

  @Test
  void fastColumnsSplitTheLongIntoDisjointFields() {
    AdaptiveSampler sampler = settled(Target.normal(0, 1), false);
    SettledPieces table = table(sampler);
    int c = 0; // the first column is fast: the normal's inner mass is far above one column
    double left = table.equal[0];
    double width = table.equal[1];
    long column = (long) c << table.equalShift;
    assertEquals(left, table.fastPoint(column), "low bits 0: the left end");
    double top = table.fastPoint(column | SettledPieces.POINT_MASK);
    double slack = 1e-15 * (Math.abs(left) + width);
    assertTrue(top <= left + width && top >= left + width - slack, "low bits all ones: " + top);
    // the column bits do not reach the point: 53 + column bits fit in the long
    assertTrue(Long.SIZE - table.equalShift <= SettledPieces.MAXIMUM_COLUMN_BITS);
  }

  /**
   * The Taylor bounds of {@link AdaptiveSampler#belowExp} decide as w &lt; exp(-g) itself, on a grid
   * of gaps from -1e-3 (rounding below a chord) to 40 and on w at and around exp(-g).
   */
  @Test
  void theSqueezeTestWithoutTheExponentialDecidesAsTheExponential() {
    double[] gaps = {-1e-3, -1e-12, 0, 1e-300, 1e-12, 1e-6, 1e-3, 0.01, 0.1, 0.3, 0.5, 1, 2, 5, 40};
    int disagreements = 0;
    for (double g : gaps) {
      double e = Math.exp(-g);
      double[] ws = {0, 0.5 * e, e * (1 - 1e-9), Math.nextDown(e), e, Math.nextUp(e), e * (1 + 1e-9),
          Math.min(Math.nextDown(1.0), 2 * e), Math.nextDown(1.0)};
      for (double w : ws) {
        if (w >= 1) {
          continue;
        }
        if (AdaptiveSampler.belowExp(w, g) != (w < e)) {
          // only within rounding of exp(-g) itself may the polynomial and exp disagree
          assertTrue(Math.abs(w - e) <= 4 * Math.ulp(1.0), "w " + w + ", g " + g);
          disagreements++;
        }
      }
    }
    assertTrue(disagreements <= 2, disagreements + " disagreements, all at rounding level");
    assertTrue(!AdaptiveSampler.belowExp(0.0, Double.POSITIVE_INFINITY), "no squeeze: never below");
  }
}

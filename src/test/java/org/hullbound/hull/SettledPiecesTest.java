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
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The fast path of a settled hull ({@link SettledPieces}): its staircase holds between the hull and
 * the flat tops, its equal columns and alias table reproduce the masses of the inner rectangles and
 * the rest, inner rectangles lie under the squeeze, draws through it alone follow the hull's own
 * distribution function, and a sampler drawing through it stays exact against commons-math3 3.6.1.
 *
 * <p>KS tests (commons-math3 {@code KolmogorovSmirnovTest}) of 8000 draws at level 1e-5: each
 * fails an exact sampler with probability 1e-5, so that the 20 of them add at most 2e-4 to the
 * false-alarm rate of the whole build (DEVELOPERS.md, Tests), and detects a CDF error of 0.04 with
 * probability above 0.98 (critical distance sqrt(-ln(1e-5 / 2) / 2) / sqrt(n) = 2.47 / sqrt(n) =
 * 0.028, empirical-CDF sd at most 0.0056; asymptotic Kolmogorov quantile, common practice).
 */
class SettledPiecesTest {

  private static final int N = 8000;
  private static final double ALPHA = 1e-5;

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
      double p = HullSnapshots.selectionProbability(table, e);
      assertEquals(table.restWeight[e] / table.total, p, 1e-12, "entry " + e);
      sum += p;
    }
    assertEquals(1.0, sum, 1e-12, "no column falls outside the entries");
  }

  /**
   * Each uniform piece's steps (inner rectangles and outer entries) hold between the mass of the
   * hull u itself and that of the flat top E over the piece; every other piece is one whole entry.
   */
  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void theStaircaseHoldsBetweenTheHullAndTheFlatTop(Target target, boolean derivativeFree) {
    AdaptiveSampler sampler = settled(target, derivativeFree);
    PiecewiseExponential pieces = sampler.pieces;
    SettledPieces table = table(sampler);
    double[] staircase = new double[pieces.size];
    int[] wholeEntries = new int[pieces.size];
    for (int r = 0; r < table.rectangles; r++) {
      double width = table.rectangleRight[r] - table.rectangleLeft[r];
      int j = pieces.pieceOf(table.rectangleLeft[r] + 0.5 * width);
      staircase[j] += table.rectangleDensity[r] * width;
      assertEquals(table.rectangleStart[r + 1] - table.rectangleStart[r],
          table.rectangleDensity[r] * width, 1e-12, "rectangle " + r + " on the mass axis");
    }
    for (int e = 0; e < table.entries; e++) {
      staircase[table.restPiece[e]] += table.restWeight[e];
      if (table.restRecords[PackedRecords.REST_STRIDE * e + PackedRecords.REST_FLOOR] == 0) {
        wholeEntries[table.restPiece[e]]++;
      }
    }
    for (int j = 0; j < pieces.size; j++) {
      double flat = Math.exp(pieces.logMass[j] - pieces.logScale);
      if (!pieces.uniform[j]) {
        assertEquals(1, wholeEntries[j], "piece " + j + " is one whole entry");
        assertEquals(flat, staircase[j], 1e-12 * flat, "piece " + j);
        continue;
      }
      double hull =
          segmentHullMass(pieces, j, pieces.left[j], pieces.right[j]) / Math.exp(pieces.logScale);
      double slack = 1e-12 * flat;
      assertTrue(staircase[j] <= flat + slack, "piece " + j + ": staircase above the flat top");
      assertTrue(staircase[j] >= hull - slack, "piece " + j + ": staircase below the hull");
    }
  }

  /**
   * The columns cut the mass axis exactly: every point a column chooses, fast or not, lands in the
   * rectangle that holds that point of the axis, at its place; and the inner rectangles hold
   * nearly all the envelope, most of it in fast columns.
   */
  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void columnsMapTheMassAxisOntoTheRectangles(Target target, boolean derivativeFree) {
    SettledPieces table = table(settled(target, derivativeFree));
    double axis = table.columnMass * table.columnCount;
    assertEquals(table.innerMass + table.total, axis, 1e-12 * axis, "the columns cover the axis");
    RandomGenerator rng = rng(8);
    int fast = 0;
    int checked = 0;
    for (int c = 0; c < table.columnCount; c++) {
      boolean isFast = !Double.isNaN(table.columnRecords[PackedRecords.COLUMN_STRIDE * c]);
      fast += isFast ? 1 : 0;
      for (int i = 0; i < 8; i++) {
        long low = i == 0 ? 0 : i == 1 ? SettledPieces.POINT_MASK : rng.nextLong();
        long bits = ((long) c << table.columnShift) | (low & SettledPieces.POINT_MASK);
        double u = (bits & SettledPieces.POINT_MASK) * SettledPieces.POINT_SCALE;
        double s = c * table.columnMass + u * table.columnMass;
        double x = isFast ? table.fastPoint(bits) : table.innerPoint(bits);
        if (!(s < table.innerMass)) {
          assertTrue(Double.isNaN(x), "column " + c + ": past the inner mass, the rest");
          continue;
        }
        assertTrue(!Double.isNaN(x), "column " + c + " at u " + u);
        int r = rectangleAt(table, s);
        double slack = 1e-12 * (Math.abs(x) + 1);
        assertTrue(x >= table.rectangleLeft[r] - slack && x <= table.rectangleRight[r] + slack,
            "column " + c + " at u " + u + ": x " + x + " outside rectangle " + r);
        double back =
            table.rectangleStart[r] + (x - table.rectangleLeft[r]) * table.rectangleDensity[r];
        assertEquals(s, back, 1e-9 * table.columnMass + 1e-13 * axis, "column " + c + " at " + u);
        checked++;
      }
    }
    double innerShare = table.innerMass / axis;
    assertTrue(innerShare > 0.97, "inner share " + innerShare);
    assertTrue(fast > 0.9 * table.columnCount, fast + " fast columns of " + table.columnCount);
    assertTrue(checked > 1000, checked + " points checked");
  }

  /** The rectangle whose stretch of the mass axis holds s, by a plain scan. */
  private static int rectangleAt(SettledPieces table, double s) {
    int r = 0;
    while (r + 1 < table.rectangles && table.rectangleStart[r + 1] <= s) {
      r++;
    }
    return r;
  }

  /** Inner rectangles lie under the squeeze and every step's top lies above the hull u. */
  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void innerRectanglesLieUnderTheSqueezeAndStepsAboveTheHull(
      Target target, boolean derivativeFree) {
    AdaptiveSampler sampler = settled(target, derivativeFree);
    PiecewiseExponential pieces = sampler.pieces;
    SettledPieces table = table(sampler);
    HullSnapshot snapshot = sampler.snapshot();
    for (int r = 0; r < table.rectangles; r++) {
      double left = table.rectangleLeft[r];
      double right = table.rectangleRight[r];
      int j = pieces.pieceOf(0.5 * (left + right));
      assertTrue(pieces.uniform[j], "inner rectangles only on uniform pieces");
      // height relative to the flat top E of the piece, whose mass per unit x is weight / width
      double flatDensity =
          Math.exp(pieces.logMass[j] - pieces.logScale) / (pieces.right[j] - pieces.left[j]);
      double logHeight = Math.log(table.rectangleDensity[r] / flatDensity);
      for (int i = 0; i <= 20; i++) {
        double x = left + i / 20.0 * (right - left);
        // the squeeze from the chords themselves, independent of the pieces
        double below =
            snapshot.logSqueezeFromChords(x) - pieces.reference - pieces.envelope(j, x);
        assertTrue(logHeight <= below + 1e-12,
            "rectangle " + r + " above the squeeze at " + x + ": " + logHeight + " > " + below);
      }
    }
    int steps = 0;
    for (int e = 0; e < table.entries; e++) {
      int j = table.restPiece[e];
      int at = PackedRecords.REST_STRIDE * e;
      if (!pieces.uniform[j]) {
        continue;
      }
      steps++;
      double left = table.restRecords[at + PackedRecords.REST_LEFT];
      double width = table.restRecords[at + PackedRecords.REST_WIDTH];
      double top = -table.restRecords[at + PackedRecords.REST_DROP];
      for (int i = 0; i <= 20; i++) {
        double x = left + i / 20.0 * width;
        // the hull u of this piece (at a shared end the next piece's line may differ)
        double hull = pieces.value[j] + pieces.slope[j] * (x - pieces.anchor[j])
            - pieces.envelope(j, x);
        assertTrue(top >= hull - 1e-12, "step " + e + " below the hull at " + x);
      }
    }
    assertTrue(table.rectangles > 10 && steps > 10, table.rectangles + " rectangles, " + steps);
  }

  /**
   * Proposals through both layers, those above the hull u rejected, follow exp(u) normalised: the
   * CDF of the linear hull, integrated here from the snapshot's segments.
   */
  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void drawsThroughBothLayersFollowTheHullCdf(Target target, boolean derivativeFree) {
    AdaptiveSampler sampler = settled(target, derivativeFree);
    SettledPieces table = table(sampler);
    PiecewiseExponential pieces = sampler.pieces;
    RandomGenerator rng = rng(1234);
    double[] draws = new double[N];
    for (int i = 0; i < N; i++) {
      draws[i] = HullSnapshots.drawUnderHull(table, rng, pieces);
    }
    double totalMass = linearHullMass(pieces, pieces.size - 1, pieces.right[pieces.size - 1]);
    int last = pieces.size - 1;
    double p =
        CdfReference.of(
                x -> {
                  if (!(x > pieces.left[0])) {
                    return 0.0;
                  }
                  if (x >= pieces.right[last]) {
                    return 1.0;
                  }
                  return linearHullMass(pieces, pieces.pieceOf(x), x) / totalMass;
                })
            .ksPValue(draws);
    assertTrue(p >= ALPHA, "KS p-value " + p + " of draws against the hull CDF");
  }

  /**
   * The integral of exp(u) from the support's lower end to x in piece {@code j}, summed segment by
   * segment in closed form (exp(u(a)) (e^{s (x - a)} - 1) / s), for the reference CDF.
   */
  private static double linearHullMass(PiecewiseExponential pieces, int j, double x) {
    double sum = 0;
    for (int i = 0; i <= j; i++) {
      sum += segmentHullMass(pieces, i, pieces.left[i], i == j ? x : pieces.right[i]);
    }
    return sum;
  }

  /** The integral of exp(u) over [a, b] inside piece i. */
  private static double segmentHullMass(PiecewiseExponential pieces, int i, double a, double b) {
    double s = pieces.slope[i];
    if (a == Double.NEGATIVE_INFINITY) {
      return Math.exp(pieces.value[i] + s * (b - pieces.anchor[i])) / s;
    }
    if (b == Double.POSITIVE_INFINITY) {
      return Math.exp(pieces.value[i] + s * (a - pieces.anchor[i])) / -s;
    }
    double atA = Math.exp(pieces.value[i] + s * (a - pieces.anchor[i]));
    return s == 0 ? atA * (b - a) : atA * Math.expm1(s * (b - a)) / s;
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
    assertTrue(fast > 0.96 * N, fast + " of " + N + " draws through the inner rectangles");
    double p = target.reference().ksPValue(draws);
    assertTrue(p >= ALPHA, target + ": KS p-value " + p);
  }

  /**
   * With a cap of 6 abscissae the settled hull is coarse: the outer rectangles and whole pieces,
   * where the staircase's drop and the usual tests decide, hold a good share of the mass, and the
   * draws must still follow the target (32000 draws: the KS test then detects a CDF error of 0.02
   * with probability above 0.99, critical distance 2.47 / sqrt(n) = 0.014).
   */
  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("targets")
  void aCoarseSettledHullStaysExactThroughItsRest(Target target, boolean derivativeFree) {
    AdaptiveSampler sampler =
        (AdaptiveSampler) target.sampler(derivativeFree, HullOptions.defaults().withMaximumHullSize(6));
    RandomGenerator rng = rng(77);
    for (int i = 0; i < 2000; i++) {
      sampler.sample(rng);
    }
    SettledPieces table = sampler.settledOrNull();
    assertNotNull(table, "a hull at its cap settles");
    double restShare = table.total / (table.innerMass + table.total);
    assertTrue(restShare > 0.05, "rest share " + restShare);
    double[] draws = new double[32_000];
    sampler.sample(rng, draws);
    double p = target.reference().ksPValue(draws);
    assertTrue(p >= ALPHA, target + ": KS p-value " + p + ", rest share " + restShare);
  }

  /**
   * An exact sampler takes a draw from the inner rectangles with probability (inner mass) / (the
   * target's mass): for h = -x^2/2 that mass is sqrt(2 pi) (the Gaussian integral). 200000 draws
   * at caps of 16 and 64 abscissae, both forms; the observed share must lie within 4 binomial
   * standard errors (false alarm 6e-5 a case). Wrong tests on the rest (a step's drop ignored,
   * say) move the share by many standard errors.
   */
  @ParameterizedTest(name = "cap {0}, derivative-free {1}")
  @CsvSource({"16, false", "16, true", "64, false", "64, true"})
  void drawsComeFromTheInnerRectanglesInProportionToTheirMass(int cap, boolean derivativeFree) {
    AdaptiveSampler sampler =
        (AdaptiveSampler)
            Target.normal(0, 1).sampler(derivativeFree, HullOptions.defaults().withMaximumHullSize(cap));
    RandomGenerator rng = rng(31);
    for (int i = 0; i < 20_000; i++) {
      sampler.sample(rng);
    }
    SettledPieces table = sampler.settledOrNull();
    assertNotNull(table);
    double expected =
        table.innerMass * Math.exp(sampler.pieces.logScale + sampler.pieces.reference)
            / Math.sqrt(2 * Math.PI);
    int n = 200_000;
    long before = sampler.innerAcceptances;
    for (int i = 0; i < n; i++) {
      sampler.sample(rng);
    }
    assertTrue(sampler.settledOrNull() == table, "the hull stayed settled");
    double observed = (sampler.innerAcceptances - before) / (double) n;
    double standardError = Math.sqrt(expected * (1 - expected) / n);
    assertEquals(expected, observed, 4 * standardError, "share of draws from inner rectangles");
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

  /**
   * A flat density (beta(1, 1), h = 0 on (0, 1)): between the outermost abscissae the squeeze
   * meets the hull, so the only rest is the two end pieces, which have no squeeze; draws stay
   * uniform (KS at level 1e-5).
   */
  @ParameterizedTest(name = "derivative-free {0}")
  @ValueSource(booleans = {false, true})
  void aFlatDensityLeavesOnlyItsEndPiecesToTheRest(boolean derivativeFree) {
    Target flat = Target.beta(1, 1);
    AdaptiveSampler sampler = (AdaptiveSampler) flat.sampler(derivativeFree, HullOptions.defaults());
    RandomGenerator rng = rng(12);
    double[] draws = new double[N];
    sampler.sample(rng, draws);
    sampler.sample(rng, draws);
    SettledPieces table = sampler.settledOrNull();
    assertNotNull(table, "a flat hull settles at once");
    assertEquals(2, table.entries, "the end pieces only");
    for (int e = 0; e < table.entries; e++) {
      assertEquals(0.0, table.restRecords[PackedRecords.REST_STRIDE * e + PackedRecords.REST_FLOOR], "whole piece");
    }
    double p = flat.reference().ksPValue(draws);
    assertTrue(p >= ALPHA, "KS p-value " + p);
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
    SettledPieces table = table(settled(Target.normal(0, 1), false));
    int c = 0;
    int at = 0;
    while (Double.isNaN(table.columnRecords[at]) || table.columnRecords[at + PackedRecords.COLUMN_CUT] < 1) {
      at = PackedRecords.COLUMN_STRIDE * ++c; // a fast column inside one rectangle
    }
    double base = table.columnRecords[at];
    double span = table.columnRecords[at + PackedRecords.COLUMN_SPAN];
    long column = (long) c << table.columnShift;
    assertEquals(base, table.fastPoint(column), "low bits 0: the column's left end");
    double top = table.fastPoint(column | SettledPieces.POINT_MASK);
    double slack = 1e-15 * (Math.abs(base) + span);
    assertTrue(top <= base + span && top >= base + span - slack, "low bits all ones: " + top);
    // the column bits do not reach the point's bits
    int columnBits = Long.SIZE - table.columnShift;
    assertTrue(columnBits <= SettledPieces.MAXIMUM_COLUMN_BITS);
    assertEquals(0, SettledPieces.POINT_MASK >>> (Long.SIZE - SettledPieces.MAXIMUM_COLUMN_BITS));
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

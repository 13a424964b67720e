package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Arrays;
import java.util.stream.DoubleStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The updating step of Gilks and Wild (1992, section 2.2) as each form does it, driven point by
 * point (deterministic): a point evaluated at the rejection test joins the abscissae while the hull
 * is below its cap; a point where h is -inf, or one already an abscissa, adds nothing to the
 * tangent hull; the secant hull (Gilks 1992) adds a point only when it lies at least {@link
 * SecantSampler#MINIMUM_SEPARATION} of its interval from its neighbours (the class comment: an
 * extended chord through two almost equal points has a slope dominated by rounding), and otherwise
 * the middle of the point's piece, or one scale length 1 / |slope| out from the finite end of an
 * unbounded piece. The value returned is h less the hull's reference value, as the rejection test
 * needs it.
 *
 * <p>The target is the normal with mean 3.5 and sd 2, h(x) = -(x - 3.5)^2 / 8, cut to -inf above
 * 10 (a support that ends inside the line, as a user may state it through h alone); the starting
 * abscissae 1, 2, 4, 8 have unequal intervals (1, 2, 4), so that a separation measured on the wrong
 * interval shows.
 */
class UpdatingStepTest {

  private static final double[] START = {1, 2, 4, 8};

  private static double h(double x) {
    return x > 10 ? Double.NEGATIVE_INFINITY : -(x - 3.5) * (x - 3.5) / 8;
  }

  private static HullOptions options(int cap) {
    return HullOptions.defaults().withStartingAbscissae(START).withMaximumHullSize(cap);
  }

  private static SecantSampler secant(int cap) {
    return (SecantSampler)
        AdaptiveRejectionSampler.derivativeFree(UpdatingStepTest::h, Support.real(), options(cap));
  }

  private static TangentSampler tangent(int cap) {
    return (TangentSampler)
        AdaptiveRejectionSampler.withDerivatives(
            x -> new Evaluation(h(x), x > 10 ? 0 : -(x - 3.5) / 4), Support.real(), options(cap));
  }

  /**
   * Runs the updating step at x with the hull far above h and no squeeze (so the envelope checks
   * pass) and checks the value returned.
   */
  private static void update(AdaptiveSampler sampler, double x) {
    int piece = sampler.pieces.pieceOf(x);
    double expected = h(x) - sampler.pieces.reference;
    double returned = sampler.evaluateAndRefine(piece, x, 1000, Double.NEGATIVE_INFINITY, 0);
    assertEquals(expected, returned, 0, "h(x) less the reference at x = " + x);
  }

  private static double[] with(double... added) {
    double[] all = DoubleStream.concat(Arrays.stream(START), Arrays.stream(added)).toArray();
    Arrays.sort(all);
    return all;
  }

  // ---- the secant form

  @ParameterizedTest(name = "x = {0}")
  @CsvSource({
    // left of the first abscissa: separation measured on the first interval (1)
    "0.999998",
    // right of the last: on the last interval (4)
    "8.000008",
    // inside [2, 4] (interval 2), near either end
    "2.000004",
    "3.999996",
  })
  void aPointFarEnoughFromItsNeighboursIsAdded(double x) {
    SecantSampler sampler = secant(64);
    update(sampler, x);
    assertArrayEquals(with(x), sampler.abscissae());
  }

  @ParameterizedTest(name = "x = {0}")
  @CsvSource({
    "0.9999995", "8.000002", "2.000001", "3.999999", "1.0000009", "1.9999991",
  })
  void aPointTooCloseToANeighbourAddsTheMiddleOfItsPieceInstead(double x) {
    SecantSampler sampler = secant(64);
    int piece = sampler.pieces.pieceOf(x);
    double lower = sampler.pieces.left[piece];
    double upper = sampler.pieces.right[piece];
    double scale = 1 / Math.abs(sampler.pieces.slope[piece]);
    double instead =
        lower == Double.NEGATIVE_INFINITY
            ? upper - scale
            : upper == Double.POSITIVE_INFINITY ? lower + scale : 0.5 * (lower + upper);
    update(sampler, x);
    assertArrayEquals(with(instead), sampler.abscissae(), "x = " + x + " replaced by " + instead);
  }

  @Test
  void aSeparationOfExactlyTheMinimumIsEnough() {
    // abscissae 0, 1, 3, 7: x = -1e-6 lies 1e-6 (exactly, as doubles) from 0, and the first
    // interval is 1
    double[] start = {0, 1, 3, 7};
    SecantSampler sampler =
        (SecantSampler)
            AdaptiveRejectionSampler.derivativeFree(
                UpdatingStepTest::h,
                Support.real(),
                HullOptions.defaults().withStartingAbscissae(start));
    assertEquals(SecantSampler.MINIMUM_SEPARATION, start[0] - -1e-6, 0);
    update(sampler, -1e-6);
    assertArrayEquals(new double[] {-1e-6, 0, 1, 3, 7}, sampler.abscissae());
  }

  @Test
  void theOuterPiecesAreRefinedOneScaleLengthOutFromTheirEnd() {
    // outside the abscissae the secant hull is the outermost chord extended (Gilks 1992)
    double leftSlope = (h(2) - h(1)) / (2 - 1);
    double rightSlope = (h(8) - h(4)) / (8 - 4);
    SecantSampler left = secant(64);
    update(left, 1 - 1e-7);
    assertArrayEquals(with(1 - 1 / leftSlope), left.abscissae(), 1e-12);
    SecantSampler right = secant(64);
    update(right, 8 + 1e-6);
    assertArrayEquals(with(8 - 1 / rightSlope), right.abscissae(), 1e-12);
  }

  @Test
  void aPointOnAnAbscissaAddsTheMiddleOfItsPiece() {
    SecantSampler sampler = secant(64);
    int piece = sampler.pieces.pieceOf(4);
    double middle = 0.5 * (sampler.pieces.left[piece] + sampler.pieces.right[piece]);
    update(sampler, 4);
    assertArrayEquals(with(middle), sampler.abscissae());
  }

  @Test
  void atTheCapTheSecantHullAddsNothing() {
    SecantSampler full = secant(START.length);
    update(full, 3);
    update(full, 4);
    update(full, 2.0000001);
    assertArrayEquals(START, full.abscissae());
    SecantSampler oneLeft = secant(START.length + 1);
    update(oneLeft, 3);
    assertArrayEquals(with(3), oneLeft.abscissae());
  }

  @Test
  void whereHIsMinusInfinityTheSecantHullAddsNothing() {
    SecantSampler sampler = secant(64);
    update(sampler, 11);
    assertArrayEquals(START, sampler.abscissae());
  }

  /**
   * Each point evaluated is checked for concavity against its neighbours (Gilks 1992; the class
   * comments), whatever hull the caller passed: a value that breaks concavity with only the two
   * abscissae on its left, only its two neighbours, or only the two on its right is refused.
   */
  @ParameterizedTest(name = "h({0}) = {1}")
  @CsvSource({
    // above chord (1, 2) extended, whose value at 3 is 0.21875
    "3, 0.3",
    // far below chord (1, 2), whose value at 1.5 is -0.53125
    "1.5, -2",
    // above chord (4, 8) extended back, whose value at 3.9 is 0.03125
    "3.9, 0.1",
  })
  void aPointThatBreaksConcavityWithAnyTwoNeighboursIsRefused(double x, double hx) {
    SecantSampler sampler =
        (SecantSampler)
            AdaptiveRejectionSampler.derivativeFree(
                t -> t == x ? hx : h(t), Support.real(), options(64));
    assertThrows(
        NotLogConcaveException.class,
        () ->
            sampler.evaluateAndRefine(
                sampler.pieces.pieceOf(x), x, 1000, Double.NEGATIVE_INFINITY, 0));
  }

  /** The same for tangents: a slope at 3 that rises from 2's, or falls below 4's. */
  @ParameterizedTest(name = "h'(3) = {0}")
  @CsvSource({"1", "-2"})
  void aTangentThatBreaksConcavityWithEitherNeighbourIsRefused(double slope) {
    TangentSampler sampler =
        (TangentSampler)
            AdaptiveRejectionSampler.withDerivatives(
                t -> new Evaluation(h(t), t == 3 ? slope : -(t - 3.5) / 4),
                Support.real(),
                options(64));
    assertThrows(
        NotLogConcaveException.class,
        () ->
            sampler.evaluateAndRefine(
                sampler.pieces.pieceOf(3), 3, 1000, Double.NEGATIVE_INFINITY, 0));
  }

  // ---- the tangent form

  @Test
  void theTangentHullAddsEachNewPointBelowItsCap() {
    TangentSampler sampler = tangent(START.length + 1);
    update(sampler, 3);
    assertArrayEquals(with(3), sampler.abscissae());
    update(sampler, 5);
    assertArrayEquals(with(3), sampler.abscissae(), "at the cap");
  }

  @Test
  void aPointOnAnAbscissaOrWhereHIsMinusInfinityAddsNoTangent() {
    TangentSampler sampler = tangent(64);
    update(sampler, 4);
    update(sampler, 11);
    assertArrayEquals(START, sampler.abscissae());
  }
}

package org.hullbound.sampling;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.DoubleUnaryOperator;
import java.util.random.RandomGenerator;
import org.junit.jupiter.api.Test;

/**
 * The search for {@code log M = sup (log f - log g)} (EnvelopeBound's contract: a grid on a
 * bounded transform of the support, points {@code width 2^-k} from each finite end, points
 * {@code 2^k} from the centre toward each infinite end, Brent's method around the best one; a
 * largest value at the outermost point, or next to a finite end that is lower, means no finite M).
 * Most targets here are given through a proposal whose log-density is 0 everywhere, so that the
 * log ratio is {@code log f} itself and each expected supremum follows by direct calculation.
 */
class EnvelopeBoundTest {
  private static final double INF = Double.POSITIVE_INFINITY;

  /** log g = 0 everywhere: the log ratio is the target's log-density. */
  private static final Proposal FLAT = new Proposal() {
    @Override
    public double draw(RandomGenerator rng) {
      throw new UnsupportedOperationException("the bound search never draws");
    }

    @Override
    public double logDensity(double x) {
      return 0;
    }
  };

  private static double supremum(DoubleUnaryOperator logRatio, double lower, double upper) {
    return EnvelopeBound.logSupremum(logRatio, lower, upper, FLAT);
  }

  private static String refusal(DoubleUnaryOperator logRatio, double lower, double upper) {
    return assertThrows(IllegalArgumentException.class,
        () -> supremum(logRatio, lower, upper)).getMessage();
  }

  /**
   * A peak of height 3 and half-width {@code width} at {@code centre}, over a broad bump of height
   * 1 at 0.3 that falls like {@code -y^2} far out: the supremum is 3 by construction, and a
   * search that missed the peak would return about 1.
   */
  private static double peakAt(double y, double centre, double width) {
    double z = (y - centre) / width;
    return Math.max(3 * Math.exp(-z * z), 1 - (y - 0.3) * (y - 0.3));
  }

  @Test
  void aProposalsSupportIsTheWholeLineUnlessItSaysOtherwise() {
    assertEquals(Double.NEGATIVE_INFINITY, FLAT.lower());
    assertEquals(INF, FLAT.upper());
  }

  @Test
  void aRatioLargestAtAFiniteEndHasItsValueThereAsTheBound() {
    // Direct calculation: x on (2, 5) is largest at 5, -x at 2 (sup over the closed interval;
    // the ends are searched as limits).
    assertEquals(5, supremum(x -> x, 2, 5), 1e-12);
    assertEquals(-2, supremum(x -> -x, 2, 5), 1e-12);
    // A half-line: -x on (0, inf) is largest at its finite end.
    assertEquals(0, supremum(x -> -x, 0, INF), 1e-12);
  }

  @Test
  void whereTheTargetIsZeroTheRatioDoesNotRaiseTheBound() {
    // f = 0 (log f = -inf) on (0, 0.5); on [0.5, 1) log f = -1 - (x - 0.75)^2, largest -1 at 0.75.
    assertEquals(-1, supremum(
        x -> x < 0.5 ? Double.NEGATIVE_INFINITY : -1 - (x - 0.75) * (x - 0.75), 0, 1), 1e-9);
  }

  @Test
  void aProposalEqualToTheTargetHasBoundOne() {
    // f = g: the ratio is 1 everywhere, so M = 1 (acceptance 1), on a half-line and on the whole
    // line; a flat ratio does not grow toward an infinite end.
    Proposal exponential = Proposal.exponentialTail(0, 1);
    assertEquals(0, EnvelopeBound.logSupremum(exponential::logDensity, 0, INF, exponential));
    Proposal normal = new Proposal() {
      @Override
      public double draw(RandomGenerator rng) {
        return rng.nextGaussian();
      }

      @Override
      public double logDensity(double x) {
        return -0.5 * x * x - 0.5 * Math.log(2 * Math.PI);
      }
    };
    assertEquals(0, EnvelopeBound.logSupremum(normal::logDensity, -INF, INF, normal));
    assertEquals(1.0, FixedEnvelopeRejection.withComputedBound(normal::logDensity, -INF, INF,
        normal).bound());
  }

  @Test
  void aRatioGrowingTowardOneInfiniteEndIsRefusedNamingThatEnd() {
    // Target Exp(1) under the proposal Exp(2): f/g = e^x / 2 grows toward +inf (direct
    // calculation); mirrored, toward -inf.
    Proposal twice = Proposal.exponentialTail(0, 2);
    String upper = assertThrows(IllegalArgumentException.class,
        () -> EnvelopeBound.logSupremum(x -> -x, 0, INF, twice)).getMessage();
    assertTrue(upper.contains("still grows") && upper.contains("toward +Infinity"), upper);
    String lower = refusal(x -> -x, -INF, 3);
    assertTrue(lower.contains("still grows") && lower.contains("toward -Infinity"), lower);
  }

  @Test
  void anEndValueBelowItsNeighbourByRoundingOnlyIsNotGrowthTowardTheEnd() {
    // log f = -(distance to the end) inside, so sup = 0 as the end is approached, but at the end
    // itself a value 5e-10 lower, as a formula evaluated at its end may round: within the 1e-9
    // that EnvelopeBound puts down to rounding, so the ratio is bounded with log M = 0.
    assertEquals(0, supremum(x -> x == 0 ? -5e-10 : -x, 0, 1), 1e-12);
    assertEquals(0, supremum(x -> x == 1 ? -5e-10 : -(1 - x), 0, 1), 1e-12);
    // 2e-9 lower is beyond rounding: the ratio grows toward that end and no M is given.
    assertTrue(refusal(x -> x == 0 ? -2e-9 : -x, 0, 1).contains("grows toward the end 0.0"));
    assertTrue(refusal(x -> x == 1 ? -2e-9 : -(1 - x), 0, 1).contains("grows toward the end 1.0"));
    // the same at an end at 0, where the points near it do not round onto the end itself
    assertTrue(refusal(x -> x == 0 ? -2e-9 : x, -1, 0).contains("grows toward the end 0.0"));
  }

  @Test
  void aNarrowPeakFarTowardAnInfiniteEndIsFoundByTheFarPoints() {
    // The peak sits 2^20 from the finite end (or from 0 on the whole line), half-width 2^18:
    // beyond the grid's reach (its transform puts its outermost points a few hundred out), at one
    // of the far points 2^k the search lays toward the infinite end.
    double far = Math.scalb(1.0, 20);
    double width = Math.scalb(1.0, 18);
    double end = 1e6;
    assertEquals(3, supremum(x -> peakAt(x - end, far, width), end, INF), 1e-9);
    assertEquals(3, supremum(x -> peakAt(-end - x, far, width), -INF, -end), 1e-9);
    assertEquals(3, supremum(x -> peakAt(x, far, width), -INF, INF), 1e-9);
    assertEquals(3, supremum(x -> peakAt(-x, far, width), -INF, INF), 1e-9);
    // The far points reach 2^64: a peak at 2^63 is inside the scan, not at its outermost point.
    double outer = Math.scalb(1.0, 63);
    double outerWidth = Math.scalb(1.0, 61);
    assertEquals(3, supremum(x -> peakAt(x, outer, outerWidth), -INF, INF), 1e-9);
    assertEquals(3, supremum(x -> peakAt(-x, outer, outerWidth), -INF, INF), 1e-9);
  }

  @Test
  void aNarrowPeakNextToAFiniteEndIsFoundByTheNearPoints() {
    // Support (2, 5), width 3: the peak sits 3 * 2^-22 (7.2e-7) from an end, half-width 5e-8,
    // at one of the near points width 2^-k, far finer than the grid's spacing 3 / 512.
    double offset = 3 * Math.scalb(1.0, -22);
    assertEquals(3, supremum(x -> peakAt(x - 2, offset, 5e-8), 2, 5), 1e-9);
    assertEquals(3, supremum(x -> peakAt(5 - x, offset, 5e-8), 2, 5), 1e-9);
  }

  @Test
  void theGridSpansABoundedSupportOfAnyWidth() {
    // The narrow peak of FixedEnvelopeRejectionTest (0.7 of the way along, half-width 0.02 of
    // it) on (100, 104) instead of (0, 1): found by the grid laid over the whole width.
    assertEquals(3, supremum(
        x -> FixedEnvelopeRejectionTest.narrowPeakRatio((x - 100) / 4), 100, 104), 1e-9);
  }
}

package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * Numerical edges of the piecewise-exponential pieces: near-flat and flat slopes, huge slopes,
 * unbounded pieces, nearly equal neighbouring slopes. References are closed forms and Taylor
 * series (common practice).
 */
class PiecewiseExponentialTest {

  @Test
  void nearFlatPieceMassKeepsFullPrecision() {
    // integral of exp(s (x - 0)) over [0, 10] = (exp(10 s) - 1) / s; for s = 1e-14 its log is
    // log 10 + log(1 + t/2 + t^2/6) with t = 1e-13 (Taylor series); the naive form loses ~1e-3
    double s = 1e-14;
    double t = 10 * s;
    double expected = Math.log(10) + Math.log1p(t / 2 + t * t / 6);
    assertEquals(expected, PiecewiseExponential.logMass(0, 10, 0, 0, s), 1e-15);
    // the mirror image, exp(-s (x - 10)) over [0, 10], has the same mass
    assertEquals(expected, PiecewiseExponential.logMass(0, 10, 10, 0, -s), 1e-15);
  }

  @Test
  void flatPieceMassIsWidthTimesHeight() {
    assertEquals(Math.log(4) + 2.5, PiecewiseExponential.logMass(-1, 3, 0, 2.5, 0.0), 1e-15);
  }

  @Test
  void steepPieceMassIsTopOverSlope() {
    // integral of exp(1e300 (x - 1)) over [0, 1] = (1 - exp(-1e300)) / 1e300
    assertEquals(-Math.log(1e300), PiecewiseExponential.logMass(0, 1, 1, 0, 1e300), 1e-12);
  }

  @Test
  void unboundedPieceMassIsTheExponentialIntegral() {
    // integral of exp(-3 - 2 (x - 1)) over [1, inf) = exp(-3) / 2
    assertEquals(
        -3 - Math.log(2),
        PiecewiseExponential.logMass(1, Double.POSITIVE_INFINITY, 1, -3, -2),
        1e-15);
  }

  @Test
  void relativeDecayIsOneAtZeroAndAccurateForTinyArguments() {
    assertEquals(1.0, PiecewiseExponential.relativeDecay(0.0));
    assertEquals(1.0 - 5e-21, PiecewiseExponential.relativeDecay(1e-20), 1e-16);
    assertEquals((1 - Math.exp(-2)) / 2, PiecewiseExponential.relativeDecay(2), 1e-16);
  }

  @Test
  void positionInvertsTheExponentialCdf() {
    // piece [0, 3] with slope -2: CDF(x) = (1 - exp(-2x)) / (1 - exp(-6))
    PiecewiseExponential p = single(0, 3, 0, 0, -2);
    for (double u : new double[] {0.0, 0.1, 0.5, 0.9, 0.999}) {
      double x = p.position(0, u);
      assertEquals(u, -Math.expm1(-2 * x) / -Math.expm1(-6), 1e-14, "u = " + u);
    }
    // increasing piece [-1, 2] with slope 0.7 is inverted from its upper end: P(X >= x) = u
    PiecewiseExponential q = single(-1, 2, 2, 0, 0.7);
    for (double u : new double[] {0.0, 0.3, 0.8}) {
      double x = q.position(0, u);
      assertEquals(u, -Math.expm1(-0.7 * (2 - x)) / -Math.expm1(-0.7 * 3), 1e-14, "u = " + u);
    }
  }

  @Test
  void nearFlatAndFlatPiecesAreDrawnUniformlyUnderTheirTop() {
    for (double s : new double[] {0.0, 1e-300, 1e-14, -1e-14, 0.1}) {
      PiecewiseExponential p = single(2, 6, 2, 0, s);
      assertTrue(p.uniform[0], "slope " + s);
      assertEquals(3.0, p.position(0, 0.25), 1e-12, "slope " + s);
      // the envelope is the top of the line: value at the upper end when rising
      double top = s > 0 ? 4 * s : 0.0;
      assertEquals(top, p.envelope(0, 2.5), 1e-15, "slope " + s);
      assertEquals(top + Math.log(4), p.logMass[0], 1e-15, "slope " + s);
    }
  }

  @Test
  void piecesRisingMoreThanTheLimitKeepTheExponential() {
    // |slope| * width = 0.5 is the last uniform piece; just above it is exponential
    assertTrue(single(0, 1, 0, 0, PiecewiseExponential.UNIFORM_LIMIT).uniform[0]);
    assertFalse(single(0, 1, 0, 0, Math.nextUp(PiecewiseExponential.UNIFORM_LIMIT)).uniform[0]);
  }

  @Test
  void unboundedPieceThatDoesNotFallIsRefused() {
    PiecewiseExponential p = new PiecewiseExponential(2);
    p.add(0, Double.POSITIVE_INFINITY, 0, 0, 0.0, Double.POSITIVE_INFINITY, 0);
    NonIntegrableHullException e = assertThrows(NonIntegrableHullException.class, p::seal);
    assertTrue(e.getMessage().contains("upper"), e.getMessage());
    assertTrue(e.getMessage().contains("expected < 0"), e.getMessage());
  }

  @Test
  void tangentIntersectionOfEqualOrNearlyEqualSlopesStaysInTheInterval() {
    double[] xs = {0, 1};
    double[] hs = {0, -1};
    double[] equal = {-1, -1};
    assertEquals(0.5, UpperHull.intersection(xs, hs, equal, 0));
    double[] nearlyEqual = {-1 + 1e-15, -1 - 1e-15};
    double z = UpperHull.intersection(xs, hs, nearlyEqual, 0);
    assertTrue(z >= 0 && z <= 1, "z = " + z);
  }

  @Test
  void selectionFollowsTheCumulativeWeights() {
    PiecewiseExponential p = new PiecewiseExponential(3);
    p.add(0, 1, 0, 0, 0, Double.POSITIVE_INFINITY, 0); // mass 1
    p.add(1, 2, 1, Math.log(3), 0, Double.POSITIVE_INFINITY, 0); // mass 3
    p.seal();
    assertEquals(0, p.select(0.0));
    assertEquals(0, p.select(0.249));
    assertEquals(1, p.select(0.251));
    assertEquals(1, p.select(Math.nextDown(1.0)));
  }

  @Test
  void selectionAfterResealingFollowsTheNewWeights() {
    // Four flat pieces of width 1 and masses 1, 1, 1, 1, then, resealed in the same object (as
    // the sampler does after each insertion), 100, 1, 1, 1: the inverse of the new discrete
    // distribution (cumulative 100, 101, 102, 103 of 103) gives piece 0 below u = 100/103, the
    // others in thirds of the remaining 3/103; the guide table of the first layout must not
    // survive into the second (Chen and Asau 1974's table is rebuilt with the weights).
    PiecewiseExponential p = new PiecewiseExponential(4);
    for (double[] values : new double[][] {{0, 0, 0, 0}, {Math.log(100), 0, 0, 0}}) {
      p.reset(4, 0);
      for (int j = 0; j < 4; j++) {
        p.add(j, j + 1, j, values[j], 0, Double.POSITIVE_INFINITY, 0);
      }
      p.seal();
    }
    for (double u = 0; u < 1; u += 1.0 / 1024) {
      double mass = u * 103;
      int expected = mass < 100 ? 0 : mass < 101 ? 1 : mass < 102 ? 2 : 3;
      assertEquals(expected, p.select(u), "u = " + u);
    }
  }

  @Test
  void massesAwayFromTheAnchorKeepTheLineThere() {
    // Closed forms (direct integration): exp(v + s (x - a)) over [b, inf) with s < 0 is
    // exp(v + s (b - a)) / |s|; over (-inf, b] with s > 0 it is exp(v + s (b - a)) / s; over
    // [0, 1] with v = 0, s = 2, a = 0 it is (e^2 - 1) / 2.
    assertEquals(0.5 - 2 * (3 - 1) - Math.log(2),
        PiecewiseExponential.logMass(3, Double.POSITIVE_INFINITY, 1, 0.5, -2), 1e-15);
    assertEquals(0.5 + 2 * (3 - 1) - Math.log(2),
        PiecewiseExponential.logMass(Double.NEGATIVE_INFINITY, 3, 1, 0.5, 2), 1e-15);
    assertEquals(Math.log(Math.expm1(2) / 2), PiecewiseExponential.logMass(0, 1, 0, 0, 2), 1e-15);
    // an empty or inverted interval has no mass
    assertEquals(Double.NEGATIVE_INFINITY, PiecewiseExponential.logMass(1, 1, 0, 0, 1));
    assertEquals(Double.NEGATIVE_INFINITY, PiecewiseExponential.logMass(2, 1, 0, 0, 1));
    // the same for an unbounded piece sealed in place, anchored away from its end
    PiecewiseExponential p = new PiecewiseExponential(1);
    p.add(3, Double.POSITIVE_INFINITY, 1, 0.5, -2, Double.POSITIVE_INFINITY, 0);
    p.seal();
    assertEquals(0.5 - 4 - Math.log(2), p.logMass[0], 1e-15);
  }

  @Test
  void theReferenceIsTheLargestOfTheFirstValues() {
    assertEquals(5, PiecewiseExponential.highest(new double[] {-3, 5, 2, 9}, 3));
    assertEquals(-3, PiecewiseExponential.highest(new double[] {-3, 5}, 1));
  }

  @Test
  void pieceOfFindsThePieceStartingAtOrBeforeThePointAndNoneOutside() {
    PiecewiseExponential p = new PiecewiseExponential(3);
    p.add(0, 1, 0, 0, 0, Double.POSITIVE_INFINITY, 0);
    p.add(1, 2.5, 1, 0, 0, Double.POSITIVE_INFINITY, 0);
    p.add(2.5, 4, 2.5, 0, 0, Double.POSITIVE_INFINITY, 0);
    p.seal();
    assertEquals(0, p.pieceOf(0));
    assertEquals(0, p.pieceOf(0.5));
    assertEquals(1, p.pieceOf(1));
    assertEquals(2, p.pieceOf(2.5));
    assertEquals(2, p.pieceOf(4));
    assertEquals(-1, p.pieceOf(Math.nextDown(0.0)));
    assertEquals(-1, p.pieceOf(Math.nextUp(4.0)));
    assertEquals(-1, p.pieceOf(Double.NaN));
    assertEquals("PiecewiseExponential[0.0, 1.0, 2.5]", p.toString());
  }

  @Test
  void aHullWithoutPiecesHasNoMassAndNamesNoPoint() {
    NonIntegrableHullException e =
        assertThrows(NonIntegrableHullException.class, new PiecewiseExponential(1)::seal);
    assertTrue(e.getMessage().contains("no finite positive mass"), e.getMessage());
    assertTrue(Double.isNaN(e.x()));
  }

  @Test
  void aLowerUnboundedPieceThatDoesNotRiseIsRefusedNamingThatSide() {
    PiecewiseExponential p = new PiecewiseExponential(2);
    p.add(Double.NEGATIVE_INFINITY, 0, 0, 0, 0.0, Double.POSITIVE_INFINITY, 0);
    NonIntegrableHullException e = assertThrows(NonIntegrableHullException.class, p::seal);
    assertTrue(e.getMessage().contains("on the unbounded lower side"), e.getMessage());
    assertTrue(e.getMessage().contains("expected > 0"), e.getMessage());
    assertEquals(0, e.x());
  }

  private static PiecewiseExponential single(
      double left, double right, double anchor, double value, double slope) {
    PiecewiseExponential p = new PiecewiseExponential(1);
    p.add(left, right, anchor, value, slope, Double.POSITIVE_INFINITY, 0);
    p.seal();
    return p;
  }
}

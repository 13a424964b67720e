package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * A snapshot reads back the hull of Gilks and Wild (1992) as the sampler holds it. The target is
 * h(x) = 1000 - x^2/2 on [-3, inf) (the constant makes the hull's own reference value matter),
 * with tangents at -1, 0.5 and 2 and no draw made, so the hull is fixed. Every value is checked
 * against a formula written here: the tangent hull of a concave h is the smallest of its
 * tangents (Gilks and Wild 1992, section 2.2), the squeeze the chord between neighbouring
 * abscissae, and the masses those of {@link IndependentHull}, integrated in closed form.
 */
class HullSnapshotTest {
  private static final double TOP = 1000;
  private static final double[] XS = {-1, 0.5, 2};
  private static final double LOWER = -3;

  private static double h(double x) {
    return TOP - 0.5 * x * x;
  }

  private static HullSnapshot snapshot() {
    AdaptiveRejectionSampler sampler = AdaptiveRejectionSampler.withDerivatives(
        x -> new Evaluation(h(x), -x), Support.above(LOWER),
        HullOptions.defaults().withStartingAbscissae(XS));
    return sampler.snapshot();
  }

  /** The smallest of the tangents at XS: the tangent hull u(x). */
  private static double smallestTangent(double x) {
    double u = Double.POSITIVE_INFINITY;
    for (double a : XS) {
      u = Math.min(u, h(a) - a * (x - a));
    }
    return u;
  }

  private static double[] values() {
    double[] hs = new double[XS.length];
    for (int i = 0; i < XS.length; i++) {
      hs[i] = h(XS[i]);
    }
    return hs;
  }

  @Test
  void theAbscissaeAndValuesAreThoseEvaluated() {
    HullSnapshot snapshot = snapshot();
    assertArrayEquals(XS, snapshot.abscissae());
    assertArrayEquals(values(), snapshot.logDensityValues());
  }

  @Test
  void theLinearHullIsTheSmallestTangentAndTheEnvelopeLiesOnOrAboveIt() {
    HullSnapshot snapshot = snapshot();
    for (double x = LOWER; x <= 6; x += 0.125) {
      assertEquals(smallestTangent(x), snapshot.logLinearHull(x), 1e-12, "x = " + x);
      assertTrue(snapshot.logHull(x) >= snapshot.logLinearHull(x), "x = " + x);
    }
    assertEquals(Double.NEGATIVE_INFINITY, snapshot.logLinearHull(LOWER - 1));
    assertEquals(Double.NEGATIVE_INFINITY, snapshot.logHull(LOWER - 1));
  }

  @Test
  void segmentsTileTheSupportEachWithItsTangentsSlope() {
    HullSnapshot snapshot = snapshot();
    int n = snapshot.segmentCount();
    assertEquals(LOWER, snapshot.segmentLower(0));
    assertEquals(Double.POSITIVE_INFINITY, snapshot.segmentUpper(n - 1));
    for (int i = 0; i < n; i++) {
      double a = snapshot.segmentLower(i);
      double b = snapshot.segmentUpper(i);
      assertTrue(b > a, "segment " + i);
      if (i > 0) {
        assertEquals(snapshot.segmentUpper(i - 1), a, "segment " + i + " starts where the last ends");
      }
      // the slope of the smallest tangent inside the segment, by a difference over a part of it
      double m = Double.isFinite(b) ? 0.5 * (a + b) : a + 1;
      double d = Math.min(1e-3, 0.25 * (b - a));
      double slope = (smallestTangent(m + d) - smallestTangent(m - d)) / (2 * d);
      assertEquals(slope, snapshot.segmentSlope(i), 1e-9, "segment " + i);
      // drawn uniformly exactly when the hull rises by at most 0.5 over it (docs/hull.md)
      boolean flat = Math.abs(slope) * (b - a) <= PiecewiseExponential.UNIFORM_LIMIT;
      assertEquals(flat, snapshot.isUniformSegment(i), "segment " + i);
      double top = Math.max(smallestTangent(a), Double.isFinite(b) ? smallestTangent(b) : -1e300);
      assertEquals(flat ? top : smallestTangent(m), snapshot.logHull(m), 1e-12, "segment " + i);
    }
    // tangents at -1 and 0.5 meet at -0.25: [-0.25, 0.5] rises by 0.375 (uniform), [-1, -0.25]
    // by 0.75 (exponential)
    assertTrue(java.util.stream.IntStream.range(0, n).anyMatch(snapshot::isUniformSegment));
    assertTrue(java.util.stream.IntStream.range(0, n).anyMatch(i -> !snapshot.isUniformSegment(i)));
  }

  @Test
  void aSegmentIndexOutsideTheSegmentsIsRefusedWithTheRange() {
    HullSnapshot snapshot = snapshot();
    int n = snapshot.segmentCount();
    IndexOutOfBoundsException past =
        assertThrows(IndexOutOfBoundsException.class, () -> snapshot.segmentLower(n));
    assertEquals("segment index must be in [0, " + n + "), got " + n, past.getMessage());
    assertThrows(IndexOutOfBoundsException.class, () -> snapshot.segmentSlope(-1));
  }

  @Test
  void theMassesAreThoseOfTheEnvelopeIntegratedInClosedForm() {
    HullSnapshot snapshot = snapshot();
    double independent = IndependentHull.tangents(
        XS, values(), new double[] {1, -0.5, -2}, Support.above(LOWER)).logTotalMass();
    assertEquals(independent, snapshot.logTotalMass(), 1e-12 * TOP);
    double sum = 0;
    for (double logMass : snapshot.logSegmentMasses()) {
      sum += Math.exp(logMass - TOP);
    }
    assertEquals(snapshot.logTotalMass(), TOP + Math.log(sum), 1e-12 * TOP);
  }

  @Test
  void theSqueezeIsTheChordBetweenNeighbouringAbscissae() {
    HullSnapshot snapshot = snapshot();
    double[] hs = values();
    // the last abscissa starts the outer segment, where the sampler keeps no squeeze
    for (double x = XS[0]; x < XS[2]; x += 0.125) {
      int i = x <= XS[1] ? 0 : 1;
      double chord = hs[i] + (hs[i + 1] - hs[i]) / (XS[i + 1] - XS[i]) * (x - XS[i]);
      assertEquals(chord, snapshot.logSqueeze(x), 1e-12, "x = " + x);
      assertEquals(chord, snapshot.logSqueezeFromChords(x), 1e-12, "x = " + x);
    }
    // no squeeze outside the outermost abscissae
    for (double x : new double[] {-2, XS[2] + 0.5}) {
      assertEquals(Double.NEGATIVE_INFINITY, snapshot.logSqueeze(x), "x = " + x);
      assertEquals(Double.NEGATIVE_INFINITY, snapshot.logSqueezeFromChords(x), "x = " + x);
    }
  }
}

package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * Per-class edges of the integer hull, deterministic: the flat run's draw, a chord added twice, and
 * the envelope as the lowest of the chords.
 */
class GeometricHullTest {

  /**
   * With d = 0 every integer of the run has the same weight: the draw is m + floor(u · count), the
   * uniform on {m, ..., n} (common practice: inversion of the discrete uniform).
   */
  @Test
  void aFlatRunIsDrawnUniformly() {
    assertEquals(3, GeometricHull.truncatedGeometric(0, 3, 7, 0.0));
    assertEquals(5, GeometricHull.truncatedGeometric(0, 3, 7, 0.5));
    assertEquals(7, GeometricHull.truncatedGeometric(0, 3, 7, Math.nextDown(1.0)));
    assertEquals(-2, GeometricHull.truncatedGeometric(0, -2, -2, 0.9));
  }

  @Test
  void addingAChordThatIsThereAlreadyGivesTheSameHull() {
    GeometricHull hull = GeometricHull.of(0, 100, new long[] {2, 5, 9}, new double[] {1, 2, 0},
        new double[] {1.5, 1.8, -1});
    assertSame(hull, hull.with(2, 1, 1.5));
    assertSame(hull, hull.with(9, 0, -1));
    assertEquals(4, hull.with(7, 1.2, 0.8).size());
  }

  /**
   * Each chord alone bounds a concave h (the class comment), and the pieces split the integers at
   * the chords' crossings: the envelope at every integer is the lowest chord there (to rounding).
   * Poisson(30), chords at 10, 25, 30, 36, 60 on [0, 200].
   */
  @Test
  void theEnvelopeIsTheLowestChordAtEveryInteger() {
    LogMass h = GeneratedLogConcaveMass.poisson(30);
    long[] anchors = {10, 25, 30, 36, 60};
    double[] values = new double[anchors.length];
    double[] next = new double[anchors.length];
    for (int j = 0; j < anchors.length; j++) {
      values[j] = h.value(anchors[j]);
      next[j] = h.value(anchors[j] + 1);
    }
    GeometricHull hull = GeometricHull.of(0, 200, anchors, values, next);
    for (int k = 0; k <= 200; k++) {
      double lowest = Double.POSITIVE_INFINITY;
      for (int j = 0; j < anchors.length; j++) {
        lowest = Math.min(lowest, values[j] + (next[j] - values[j]) * (k - anchors[j]));
      }
      double u = hull.upper(k);
      assertTrue(u >= lowest - 1e-9 * (1 + Math.abs(lowest)), "k " + k);
      assertTrue(u <= lowest + 1e-9 * (1 + Math.abs(lowest)), "k " + k + ": " + u + " > " + lowest);
    }
  }
}

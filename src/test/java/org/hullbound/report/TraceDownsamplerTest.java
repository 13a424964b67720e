package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** Min/max thinning keeps every bucket's extremes, in draw order (common practice for traces). */
class TraceDownsamplerTest {

  @Test
  void shortChainsAreKeptWhole() {
    Series s = TraceDownsampler.minMax("c", new double[] {4, 5, 6}, 1000);
    assertEquals(3, s.size());
    assertEquals(1, s.x()[0]);
    assertEquals(6, s.y()[2]);
  }

  @Test
  void longChainsKeepAtMostTheBudgetAndASingleSpike() {
    double[] chain = new double[100_000];
    for (int i = 0; i < chain.length; i++) {
      chain[i] = Math.sin(i * 0.001);
    }
    chain[54_321] = 40;
    chain[77_777] = -40;
    Series s = TraceDownsampler.minMax("c", chain, 1000);
    assertTrue(s.size() <= 1000, "points " + s.size());
    double max = Double.NEGATIVE_INFINITY;
    double min = Double.POSITIVE_INFINITY;
    for (int i = 0; i < s.size(); i++) {
      max = Math.max(max, s.y()[i]);
      min = Math.min(min, s.y()[i]);
      if (i > 0) {
        assertTrue(s.x()[i] >= s.x()[i - 1], "x must not go back at " + i);
      }
    }
    assertEquals(40, max);
    assertEquals(-40, min);
  }

  @Test
  void aBucketWithNothingFiniteIsAGapAndNaNsElsewhereAreSkipped() {
    double[] chain = new double[40];
    for (int i = 0; i < chain.length; i++) {
      chain[i] = i < 10 ? Double.NaN : i;
    }
    chain[25] = Double.POSITIVE_INFINITY;
    Series s = TraceDownsampler.minMax("c", chain, 8); // 4 buckets of 10
    assertTrue(Double.isNaN(s.y()[0]) && Double.isNaN(s.y()[1]));
    for (int i = 2; i < s.size(); i++) {
      assertTrue(Double.isFinite(s.y()[i]), "point " + i);
    }
  }
}

package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Arrays;
import java.util.random.RandomGenerator;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.junit.jupiter.api.Test;

class QuantilesTest {

  @Test
  void handExampleOfDefinitionSeven() {
    // Hyndman and Fan (1996) definition 7 on {1, 2, 3, 4}: h = 3p, so p = 0.25 gives
    // 1 + 0.75 (2 - 1) = 1.75 and p = 0.5 gives 2.5; the ends are the minimum and maximum.
    double[] x = {1, 2, 3, 4};
    assertEquals(1.75, Quantiles.of(x, 0.25));
    assertEquals(2.5, Quantiles.of(x, 0.5));
    assertEquals(1, Quantiles.of(x, 0));
    assertEquals(4, Quantiles.of(x, 1));
    assertEquals(7, Quantiles.of(new double[] {7}, 0.3));
  }

  @Test
  void agreesWithCommonsMathPercentileR7() {
    Percentile reference = new Percentile().withEstimationType(Percentile.EstimationType.R_7);
    RandomGenerator random = SimulatedChains.random(424_242);
    for (int n : new int[] {2, 3, 10, 999, 4000}) {
      double[] x = new double[n];
      for (int i = 0; i < n; i++) {
        x[i] = random.nextGaussian() * 3 + (i % 7 == 0 ? 2 : 0);
      }
      double[] sorted = x.clone();
      Arrays.sort(sorted);
      for (double p : new double[] {0.001, 0.025, 0.05, 0.25, 0.5, 0.75, 0.95, 0.975, 0.999, 1}) {
        assertEquals(
            reference.evaluate(x, 100 * p),
            Quantiles.of(sorted, p),
            1e-12 * Math.max(1, Math.abs(sorted[n - 1])),
            "n " + n + ", p " + p);
      }
    }
  }

  @Test
  void pooledQuantileOfDrawsTakesAllChains() {
    assertEquals(2.5, Quantiles.of(Draws.of(new double[][] {{4, 1}, {3, 2}}), 0.5));
  }

  @Test
  void extremeValuesDoNotOverflowTheInterpolation() {
    double max = Double.MAX_VALUE;
    assertEquals(0, Quantiles.of(new double[] {-max, max}, 0.5));
    assertEquals(-max, Quantiles.of(new double[] {-max, max}, 0));
    // Definition 7 at h = 1.75: x_1 + 0.75 (x_2 - x_1) = max / 2, though x_2 - x_1 overflows.
    assertEquals(max / 2, Quantiles.of(new double[] {-max, max}, 0.75), Math.ulp(max));
  }

  @Test
  void rejectsBadArguments() {
    assertThrows(IllegalArgumentException.class, () -> Quantiles.of(new double[0], 0.5));
    assertThrows(IllegalArgumentException.class, () -> Quantiles.of((double[]) null, 0.5));
    assertThrows(IllegalArgumentException.class, () -> Quantiles.of(new double[] {1}, 1.5));
    assertThrows(IllegalArgumentException.class, () -> Quantiles.of(new double[] {1}, Double.NaN));
    assertThrows(
        NonFiniteDrawException.class,
        () -> Quantiles.of(Draws.of(new double[][] {{1, Double.NaN}}), 0.5));
  }
}

package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;

class RhatTest {

  @Test
  void basicRhatOfAHandExample() {
    // Gelman and Rubin (1992); Vehtari et al. (2021), equations 3-4. Chains {1,2,3} and {4,5,6}:
    // means 2 and 5, within variances 1 and 1, so W = 1 and B/N = var(2, 5) = 4.5;
    // var+ = (2/3) 1 + 4.5 = 31/6 and R-hat = sqrt(31/6) = 2.2730...
    Draws draws = Draws.of(new double[][] {{1, 2, 3}, {4, 5, 6}});
    assertEquals(Math.sqrt(31.0 / 6), Rhat.basic(draws), 1e-14);
  }

  @Test
  void iidChainsFromOneDistributionGiveRhatNearOne() {
    // Split R-hat of 8 half-chains of 500 iid draws: R-hat^2 - 1 is about (F - 1)/N with F an
    // F(7, 3992) variable (sd about 0.53), so |R-hat - 1| is about 0.0005 and 0.01 is ~20 sd.
    for (long seed = 1; seed <= 3; seed++) {
      Draws draws = Draws.of(SimulatedChains.normal(seed, 4, 1000, 3, 0.5));
      RankNormalizedRhat rhat = Rhat.rankNormalized(draws);
      assertTrue(Math.abs(rhat.bulk() - 1) < 0.01, "bulk " + rhat.bulk());
      assertTrue(Math.abs(rhat.tail() - 1) < 0.01, "tail " + rhat.tail());
      assertTrue(rhat.max() < 1.01, "max " + rhat.max());
      assertTrue(Math.abs(Rhat.split(draws) - 1) < 0.01);
    }
  }

  @Test
  void chainsWithShiftedMeansGiveRhatWellAboveOne() {
    // Two of four chains shifted by one sd. Expected on the raw scale: half-chain means 0 and 1
    // in equal numbers have variance 8/7 x 1/4 = 0.2857, so R-hat ~ sqrt(1.2857) = 1.134 (the
    // rank transform changes this little). Noise in R-hat here is about 0.005.
    for (long seed = 1; seed <= 3; seed++) {
      double[][] draws = SimulatedChains.normal(seed, 4, 1000, 0, 1);
      for (int c = 2; c < 4; c++) {
        for (int i = 0; i < draws[c].length; i++) {
          draws[c][i] += 1;
        }
      }
      RankNormalizedRhat rhat = Rhat.rankNormalized(Draws.of(draws));
      assertTrue(rhat.bulk() > 1.1, "bulk " + rhat.bulk());
      assertTrue(rhat.max() > 1.1, "max " + rhat.max());
    }
  }

  @Test
  void chainsDifferingOnlyInScaleAreCaughtByTheFoldedRhat() {
    // Vehtari et al. (2021), section 4.2: folding turns a scale difference into a location one.
    // Two chains N(0, 1), two N(0, 9): bulk R-hat stays near 1; seeds 1-5 gave tail 1.15-1.18.
    double[][] draws = SimulatedChains.normal(2, 4, 1000, 0, 1);
    for (int c = 2; c < 4; c++) {
      for (int i = 0; i < draws[c].length; i++) {
        draws[c][i] *= 3;
      }
    }
    RankNormalizedRhat rhat = Rhat.rankNormalized(Draws.of(draws));
    assertTrue(rhat.bulk() < 1.01, "bulk " + rhat.bulk());
    assertTrue(rhat.tail() > 1.1, "tail " + rhat.tail());
    assertEquals(rhat.tail(), rhat.max());
  }

  @Test
  void splittingCatchesATrendWithinChains() {
    // Each chain drifts the same way: the chains agree with each other, their halves do not.
    double[][] draws = SimulatedChains.normal(9, 4, 1000, 0, 1);
    for (double[] chain : draws) {
      for (int i = 0; i < chain.length; i++) {
        chain[i] += 2.0 * i / chain.length;
      }
    }
    Draws d = Draws.of(draws);
    assertTrue(Rhat.basic(d) < 1.01, "basic " + Rhat.basic(d));
    assertTrue(Rhat.split(d) > 1.1, "split " + Rhat.split(d));
    assertTrue(Rhat.rankNormalized(d).max() > 1.1);
  }

  @Test
  void hugeAndTinyScalesGiveTheSameRhat() {
    double[][] raw = SimulatedChains.normal(4, 4, 200, 0, 1);
    raw[0][0] += 3;
    double reference = Rhat.split(Draws.of(raw));
    for (double scale : new double[] {1e-300, 1e300}) {
      assertEquals(reference, Rhat.split(Draws.of(raw).map(x -> x * scale)), 1e-12);
    }
    // Near the top of the double range, where a draw plus the centre would overflow.
    assertEquals(reference, Rhat.split(Draws.of(raw).map(x -> 0x1p1023 + 0x1p1019 * x)), 1e-12);
  }

  @Test
  void constantDrawsGiveNaNAndStuckChainsGiveInfinity() {
    double[][] constant = new double[4][8];
    for (double[] chain : constant) {
      Arrays.fill(chain, -1);
    }
    RankNormalizedRhat undefined = Rhat.rankNormalized(Draws.of(constant));
    assertTrue(Double.isNaN(undefined.bulk()) && Double.isNaN(undefined.max()));
    assertTrue(Double.isNaN(Rhat.basic(Draws.of(constant))));

    double[][] stuck = new double[4][8];
    for (int c = 0; c < 4; c++) {
      Arrays.fill(stuck[c], c);
    }
    assertEquals(Double.POSITIVE_INFINITY, Rhat.basic(Draws.of(stuck)));
    assertEquals(Double.POSITIVE_INFINITY, Rhat.rankNormalized(Draws.of(stuck)).bulk());
  }

  @Test
  void rejectsTooFewDrawsAndNonFiniteDraws() {
    assertThrows(IllegalArgumentException.class, () -> Rhat.basic(Draws.of(new double[][] {{1}})));
    for (Executable call :
        new Executable[] {
          () -> Rhat.rankNormalized(Draws.of(new double[][] {{1, 2, 3}, {3, 2, 1}})),
          () -> Rhat.split(Draws.of(new double[][] {{1, 2, 3}, {3, 2, 1}}))
        }) {
      // Split chains need two halves of at least two draws (Vehtari et al. 2021, section 4.1).
      String message = assertThrows(IllegalArgumentException.class, call).getMessage();
      assertTrue(message.contains("at least 4"), message);
    }
    assertThrows(
        NonFiniteDrawException.class,
        () -> Rhat.rankNormalized(Draws.of(new double[][] {{1, 2, 3, Double.NaN}})));
  }
}

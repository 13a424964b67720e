package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class EffectiveSampleSizeTest {

  /**
   * A stationary AR(1) chain with coefficient rho has integrated autocorrelation time
   * (1 + rho) / (1 - rho), so S draws are worth S (1 - rho) / (1 + rho) independent ones
   * (Geyer 1992, Statistical Science 7(4), section 3; Sokal 1997, "Monte Carlo methods in
   * statistical mechanics", section 2).
   *
   * <p>Tolerance: each of 5 independent seeds runs 4 chains of 25000 draws (S = 100000), and the
   * mean of the 5 ratios estimate/theory must lie within 6% of 1. Over 20 further seeds (measured
   * with a throwaway loop while writing this test, seeds 1000-1019) a single S = 100000 estimate had
   * relative sd 1.6% (rho 0.5), 3.8% (rho 0.9) and 1.7% (rho -0.3), and a bias of about -1% from
   * truncating the autocorrelation sum; so the mean of 5 has sd at most 1.7%, and 6% is at least
   * 3 sd for rho 0.9 and over 7 sd for the others. Sokal's large-sample formula var(tau)/tau^2 ~
   * 2(2K + 1)/S with window K about 5 tau gives 6% for one rho = 0.9 estimate, consistent.
   * A wrong estimator fails by far: ignoring the correlation would give ratio 19 at rho = 0.9.
   */
  @ParameterizedTest
  @ValueSource(doubles = {0.5, 0.9, -0.3})
  void ar1ChainsHaveTheTheoreticalEffectiveSampleSize(double rho) {
    int chains = 4;
    int n = 25_000;
    double theory = chains * n * (1 - rho) / (1 + rho);
    double ratioSum = 0;
    int seeds = 5;
    for (int seed = 0; seed < seeds; seed++) {
      Draws draws = Draws.of(SimulatedChains.ar1(31_000 + seed, chains, n, rho));
      ratioSum += EffectiveSampleSize.of(draws) / theory;
    }
    assertEquals(1, ratioSum / seeds, 0.06, "rho " + rho);
  }

  @Test
  void iidNormalDrawsHaveEffectiveSampleSizeNearTheirCount() {
    // iid draws: tau = 1, ESS = S. One estimate at S = 10000 has relative sd about 2.7%
    // (0.86% at S = 100000 measured, scaled by sqrt(10)); 10% is over 3.5 sd.
    Draws draws = Draws.of(SimulatedChains.normal(5, 4, 2500, 1, 2));
    assertEquals(1, EffectiveSampleSize.of(draws) / 10_000, 0.10);
    assertEquals(1, EffectiveSampleSize.bulk(draws) / 10_000, 0.10);
    assertEquals(1, EffectiveSampleSize.mean(draws) / 10_000, 0.10);
    // The tail indicators of iid draws are iid too; their ESS estimate is noisier (5% of ones).
    assertEquals(1, EffectiveSampleSize.tail(draws) / 10_000, 0.15);
  }

  @Test
  void chainsDifferingOnlyInScaleHaveASmallTailButLargeBulkEffectiveSampleSize() {
    // Two chains N(0, 1), two N(0, 9): the centre agrees, the tails do not (Vehtari et al.
    // 2021, section 4.3, the motivation for tail ESS). Seeds 1-5 gave tail ESS 116-156 and bulk
    // ESS 3755-4309 of S = 4000 while writing this test.
    double[][] draws = SimulatedChains.normal(1, 4, 1000, 0, 1);
    for (int c = 2; c < 4; c++) {
      for (int i = 0; i < draws[c].length; i++) {
        draws[c][i] *= 3;
      }
    }
    Draws d = Draws.of(draws);
    double bulk = EffectiveSampleSize.bulk(d);
    double tail = EffectiveSampleSize.tail(d);
    assertTrue(tail < 400, "tail " + tail);
    assertTrue(bulk > 3000, "bulk " + bulk);
    assertTrue(tail < bulk / 10, "tail " + tail + ", bulk " + bulk);
  }

  @Test
  void antitheticDrawsCanBeWorthMoreThanTheirCountButAreCapped() {
    // Strictly alternating draws have rho_1 = -1: tau = 0 is capped at 1/log10(S) (safeguard).
    double[] x = new double[1000];
    for (int i = 0; i < x.length; i++) {
      x[i] = i % 2 == 0 ? 1 : -1;
    }
    double ess = EffectiveSampleSize.of(Draws.of(new double[][] {x}));
    assertTrue(ess > 1000 && ess <= 1000 * Math.log10(1000) + 1e-9, "ess " + ess);
  }

  @Test
  void isInvariantToLocationAndToHugeOrTinyScales() {
    double[][] raw = SimulatedChains.ar1(77, 3, 800, 0.7);
    double reference = EffectiveSampleSize.of(Draws.of(raw));
    for (double scale : new double[] {1e-300, 1e-150, 1e150, 1e300}) {
      Draws scaled = Draws.of(raw).map(x -> 5 * scale + scale * x);
      assertEquals(reference, EffectiveSampleSize.of(scaled), 1e-9 * reference, "scale " + scale);
    }
    Draws shifted = Draws.of(raw).map(x -> x + 1e8);
    assertEquals(reference, EffectiveSampleSize.of(shifted), 1e-6 * reference);
    // Near the top of the double range (draws about 2^1023, their spread 2^1019 times the unit
    // draws'): the sum of a draw and the centre would overflow, their difference does not.
    Draws top = Draws.of(raw).map(x -> 0x1p1023 + 0x1p1019 * x);
    assertEquals(reference, EffectiveSampleSize.of(top), 1e-9 * reference);
  }

  @Test
  void bulkEffectiveSampleSizeIsInvariantToMonotoneTransforms() {
    // Rank normalisation depends on ranks only (Vehtari et al. 2021, section 4.1).
    Draws draws = Draws.of(SimulatedChains.ar1(3, 4, 500, 0.5));
    double reference = EffectiveSampleSize.bulk(draws);
    assertEquals(reference, EffectiveSampleSize.bulk(draws.map(Math::exp)), 1e-9 * reference);
    assertEquals(reference, EffectiveSampleSize.bulk(draws.map(x -> x * x * x)), 1e-9 * reference);
  }

  @Test
  void constantDrawsHaveUndefinedEffectiveSampleSize() {
    double[][] constant = new double[3][10];
    for (double[] chain : constant) {
      Arrays.fill(chain, 2.5);
    }
    Draws draws = Draws.of(constant);
    assertTrue(Double.isNaN(EffectiveSampleSize.of(draws)));
    assertTrue(Double.isNaN(EffectiveSampleSize.bulk(draws)));
    assertTrue(Double.isNaN(EffectiveSampleSize.tail(draws)));
    assertTrue(Double.isNaN(EffectiveSampleSize.mean(draws)));
  }

  @Test
  void chainsStuckAtDifferentValuesAreWorthFewDraws() {
    // W = 0 < B: every combined autocorrelation is 1, so tau is about 2N and ESS about M/2.
    double[][] stuck = new double[4][100];
    for (int c = 0; c < 4; c++) {
      Arrays.fill(stuck[c], c);
    }
    double ess = EffectiveSampleSize.of(Draws.of(stuck));
    assertTrue(ess > 0 && ess < 4, "ess " + ess);
  }

  @Test
  void tailIsUndefinedWhenAQuantileSitsInTiesAtAnEnd() {
    // All draws but two are 0 and those two lie below: the 5% and 95% quantiles are 0, the
    // maximum, so the indicator x <= q is 1 for every draw and has no variance.
    double[][] draws = new double[2][100];
    draws[0][50] = -1;
    draws[1][10] = -2;
    assertTrue(Double.isNaN(EffectiveSampleSize.quantile(Draws.of(draws), 0.05)));
    assertTrue(Double.isNaN(EffectiveSampleSize.tail(Draws.of(draws))));
  }

  @Test
  void rejectsTooShortChainsProbabilitiesOutsideTheUnitIntervalAndNonFiniteDraws() {
    assertThrows(
        IllegalArgumentException.class,
        () -> EffectiveSampleSize.of(Draws.of(new double[][] {{1}, {2}})));
    String message =
        assertThrows(
                IllegalArgumentException.class,
                () -> EffectiveSampleSize.bulk(Draws.of(new double[][] {{1, 2, 3}})))
            .getMessage();
    assertTrue(message.contains("at least 4"), message);
    // Every split-chain variant names the same minimum (Vehtari et al. 2021, section 4.1: two
    // halves of at least two draws).
    Draws three = Draws.of(new double[][] {{1, 2, 3}, {3, 1, 2}});
    for (Executable call :
        new Executable[] {
          () -> EffectiveSampleSize.mean(three),
          () -> EffectiveSampleSize.quantile(three, 0.5),
          () -> EffectiveSampleSize.tail(three),
          () -> MonteCarloStandardError.mean(three)
        }) {
      String m = assertThrows(IllegalArgumentException.class, call).getMessage();
      assertTrue(m.contains("at least 4"), m);
    }
    Draws ok = Draws.of(SimulatedChains.normal(1, 2, 10, 0, 1));
    assertThrows(IllegalArgumentException.class, () -> EffectiveSampleSize.quantile(ok, 0));
    assertThrows(IllegalArgumentException.class, () -> EffectiveSampleSize.quantile(ok, 1));
    assertThrows(
        NonFiniteDrawException.class,
        () -> EffectiveSampleSize.of(Draws.of(new double[][] {{1, 2, Double.NaN}})));
  }
}

package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGenerator;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

class AutocorrelationTest {

  /** The textbook O(N^2) definition, divisor N at every lag (Geyer 1992, section 3.1). */
  private static double[] directAutocovariance(double[] x) {
    int n = x.length;
    double mean = 0;
    for (double v : x) {
      mean += v / n;
    }
    double[] gamma = new double[n];
    for (int t = 0; t < n; t++) {
      double sum = 0;
      for (int i = 0; i + t < n; i++) {
        sum += (x[i] - mean) * (x[i + t] - mean);
      }
      gamma[t] = sum / n;
    }
    return gamma;
  }

  @ParameterizedTest
  @ValueSource(ints = {1, 2, 3, 7, 64, 100, 1000, 1025})
  void fftAutocovarianceEqualsTheDirectSumAtEveryLag(int n) {
    RandomGenerator random = SimulatedChains.random(20_260_001L + n);
    double[] x = new double[n];
    for (int i = 0; i < n; i++) {
      x[i] = 3 + 2 * random.nextGaussian() + (i % 5 == 0 ? 1 : 0);
    }
    double[] direct = directAutocovariance(x);
    double[] fft = Autocorrelation.autocovariance(x);
    assertEquals(n, fft.length);
    for (int t = 0; t < n; t++) {
      // Rounding of an FFT of size 2^k grows like log2(size) ulps of gamma(0).
      assertEquals(direct[t], fft[t], 1e-12 * direct[0], "lag " + t);
    }
  }

  @ParameterizedTest
  @ValueSource(ints = {1, 2, 3, 4, 5})
  void meanAutocovarianceOverChainsEqualsTheMeanOfDirectSums(int chains) {
    // The two-chains-per-transform path must agree with chain-by-chain direct sums, for odd and
    // even chain counts (an odd count leaves one chain alone in its transform).
    double[][] draws = SimulatedChains.ar1(900 + chains, chains, 37, 0.5);
    double[] expected = new double[37];
    for (double[] chain : draws) {
      double[] direct = directAutocovariance(chain);
      for (int t = 0; t < expected.length; t++) {
        expected[t] += direct[t] / chains;
      }
    }
    assertArrayEquals(expected, Autocorrelation.meanAutocovariance(draws), 1e-12 * expected[0]);
  }

  @Test
  void handExampleOneTwoThreeFour() {
    // Worked by hand: mean 2.5, deviations -1.5 -0.5 0.5 1.5;
    // gamma = (5, 1.25, -1.5, -2.25) / 4, so rho = 1, 0.25, -0.3, -0.45.
    double[] x = {1, 2, 3, 4};
    assertArrayEquals(
        new double[] {1.25, 0.3125, -0.375, -0.5625}, Autocorrelation.autocovariance(x), 1e-15);
    assertArrayEquals(new double[] {1, 0.25, -0.3, -0.45}, Autocorrelation.of(x), 1e-15);
    assertArrayEquals(new double[] {1, 0.25}, Autocorrelation.of(x, 1), 1e-15);
  }

  @Test
  void ar1AutocorrelationDecaysGeometrically() {
    // Stationary AR(1) has rho_t = rho^t (any time-series text, e.g. Box and Jenkins).
    // 200000 draws: the standard error of rho_hat(t) is about sqrt((1+rho^2)/(1-rho^2)/N) < 0.006
    // (Bartlett's formula), so 0.03 is a 5-sigma band.
    double[] x = SimulatedChains.ar1(7, 1, 200_000, 0.6)[0];
    double[] rho = Autocorrelation.of(x, 5);
    for (int t = 0; t <= 5; t++) {
      assertEquals(Math.pow(0.6, t), rho[t], 0.03, "lag " + t);
    }
  }

  @Test
  void hugeAndTinyScalesGiveTheSameAutocorrelation() {
    double[] x = SimulatedChains.normal(11, 1, 500, 0, 1)[0];
    double[] reference = Autocorrelation.of(x);
    for (double scale : new double[] {1e300, 1e-300}) {
      double[] scaled = java.util.Arrays.stream(x).map(v -> v * scale).toArray();
      assertArrayEquals(reference, Autocorrelation.of(scaled), 1e-12, "scale " + scale);
    }
  }

  @Test
  void constantChainHasUndefinedAutocorrelationAndZeroAutocovariance() {
    double[] rho = Autocorrelation.of(new double[] {4, 4, 4});
    for (double r : rho) {
      assertTrue(Double.isNaN(r));
    }
    assertArrayEquals(new double[] {0, 0, 0}, Autocorrelation.autocovariance(new double[] {4, 4, 4}));
  }

  @Test
  void averagedLeavesConstantChainsOut() {
    Draws draws = Draws.of(new double[][] {{1, 2, 3, 4}, {5, 5, 5, 5}, {4, 3, 2, 1}});
    double[][] perChain = Autocorrelation.perChain(draws, 3);
    assertTrue(Double.isNaN(perChain[1][0]));
    // Chains 0 and 2 are reversals of each other, so both have rho = 1, 0.25, -0.3, -0.45.
    assertArrayEquals(new double[] {1, 0.25, -0.3, -0.45}, Autocorrelation.averaged(draws, 3), 1e-15);
  }

  @Test
  void aConstantChainAtTheTopOfTheDoubleRangeHasZeroAutocovariance() {
    // A constant chain has zero autocovariance at every lag (Geyer 1992, section 3.1), also where
    // the draw plus its mean would overflow.
    double top = 0x1.8p1023;
    assertArrayEquals(new double[] {0, 0, 0}, Autocorrelation.autocovariance(new double[] {top, top, top}));
  }

  @Test
  void lagZeroAloneIsOne() {
    // rho(0) = 1 by definition; maxLag 0 is inside [0, N - 1].
    assertArrayEquals(new double[] {1}, Autocorrelation.of(new double[] {1, 3, 2}, 0));
    assertArrayEquals(
        new double[][] {{1}}, Autocorrelation.perChain(Draws.of(new double[][] {{1, 3, 2}}), 0));
  }

  @Test
  void rejectsBadArguments() {
    assertThrows(IllegalArgumentException.class, () -> Autocorrelation.of(null));
    assertThrows(IllegalArgumentException.class, () -> Autocorrelation.of(null, 0));
    assertThrows(IllegalArgumentException.class, () -> Autocorrelation.autocovariance(null));
    assertThrows(IllegalArgumentException.class, () -> Autocorrelation.of(new double[0]));
    assertThrows(IllegalArgumentException.class, () -> Autocorrelation.autocovariance(new double[0]));
    String message =
        assertThrows(IllegalArgumentException.class, () -> Autocorrelation.of(new double[] {1, 2}, 2))
            .getMessage();
    assertTrue(message.contains("[0, 1]"), message);
    assertThrows(IllegalArgumentException.class, () -> Autocorrelation.of(new double[] {1, 2}, -1));
    NonFiniteDrawException e =
        assertThrows(
            NonFiniteDrawException.class,
            () -> Autocorrelation.of(new double[] {1, Double.NaN, 2, 3, Double.POSITIVE_INFINITY}));
    assertEquals(1, e.iteration());
    assertTrue(e.getMessage().contains("(0-based; 2 non-finite draws in all)"), e.getMessage());
    NonFiniteDrawException covariance =
        assertThrows(
            NonFiniteDrawException.class,
            () -> Autocorrelation.autocovariance(new double[] {1, 2, Double.NEGATIVE_INFINITY}));
    assertEquals(2, covariance.iteration());
  }
}

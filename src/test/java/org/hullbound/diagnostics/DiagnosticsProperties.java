package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.IntRange;

/**
 * Invariances that hold for any draws: order of chains, monotone transforms, rank sums, ranges.
 * Draws are AR(1) chains from a jqwik-chosen seed, optionally rounded to force ties.
 */
class DiagnosticsProperties {

  private static Draws draws(long seed, int chains, int length, double rho, boolean ties) {
    double[][] raw = SimulatedChains.ar1(seed, chains, length, rho);
    if (ties) {
      for (double[] chain : raw) {
        for (int i = 0; i < chain.length; i++) {
          chain[i] = Math.rint(chain[i]);
        }
      }
    }
    return Draws.of(raw);
  }

  private static Draws reversedChains(Draws draws) {
    double[][] raw = new double[draws.chainCount()][];
    for (int c = 0; c < raw.length; c++) {
      raw[c] = draws.chain(raw.length - 1 - c);
    }
    return Draws.of(raw);
  }

  private static void assertSameOrBothNaN(double expected, double actual, String what) {
    if (Double.isNaN(expected) || Double.isInfinite(expected)) {
      assertEquals(expected, actual, what);
    } else {
      assertEquals(expected, actual, 1e-9 * Math.max(1, Math.abs(expected)), what);
    }
  }

  @Property(tries = 200, seed = "20261201")
  void diagnosticsDoNotDependOnTheOrderOfChains(
      @ForAll long seed,
      @ForAll @IntRange(min = 1, max = 5) int chains,
      @ForAll @IntRange(min = 4, max = 80) int length,
      @ForAll @DoubleRange(min = -0.9, max = 0.95) double rho,
      @ForAll boolean ties) {
    Draws draws = draws(seed, chains, length, rho, ties);
    Draws reversed = reversedChains(draws);
    VariableSummary a = PosteriorSummary.of("x", draws);
    VariableSummary b = PosteriorSummary.of("x", reversed);
    assertSameOrBothNaN(a.rhat(), b.rhat(), "rhat");
    assertSameOrBothNaN(a.essBulk(), b.essBulk(), "ess bulk");
    assertSameOrBothNaN(a.essTail(), b.essTail(), "ess tail");
    assertSameOrBothNaN(a.mcseMean(), b.mcseMean(), "mcse");
  }

  @Property(tries = 200, seed = "20261201")
  void rankBasedDiagnosticsAreInvariantToIncreasingTransforms(
      @ForAll long seed,
      @ForAll @IntRange(min = 1, max = 4) int chains,
      @ForAll @IntRange(min = 4, max = 80) int length,
      @ForAll @DoubleRange(min = -0.9, max = 0.95) double rho) {
    // Vehtari et al. (2021), section 4.1: rank normalisation depends on ranks only. The cube
    // plus a shift is strictly increasing, so ranks and ties are unchanged.
    Draws draws = draws(seed, chains, length, rho, false);
    Draws transformed = draws.map(x -> x * x * x + 7);
    RankNormalizedRhat a = Rhat.rankNormalized(draws);
    RankNormalizedRhat b = Rhat.rankNormalized(transformed);
    assertSameOrBothNaN(a.bulk(), b.bulk(), "bulk rhat");
    assertSameOrBothNaN(
        EffectiveSampleSize.bulk(draws), EffectiveSampleSize.bulk(transformed), "bulk ess");
    assertSameOrBothNaN(
        EffectiveSampleSize.tail(draws), EffectiveSampleSize.tail(transformed), "tail ess");
  }

  @Property(tries = 300, seed = "20261201")
  void fractionalRanksSumToTheTriangularNumberAndKeepOrder(
      @ForAll long seed,
      @ForAll @IntRange(min = 1, max = 200) int length,
      @ForAll boolean ties) {
    double[] x = draws(seed, 1, length, 0.3, ties).chain(0);
    double[] ranks = RankNormalization.fractionalRanks(x);
    double sum = Arrays.stream(ranks).sum();
    assertEquals(length * (length + 1) / 2.0, sum, 1e-9 * length * length);
    for (int i = 0; i < length; i++) {
      assertTrue(ranks[i] >= 1 && ranks[i] <= length);
      for (int j = 0; j < length; j++) {
        if (x[i] < x[j]) {
          assertTrue(ranks[i] < ranks[j]);
        } else if (x[i] == x[j]) {
          assertEquals(ranks[i], ranks[j]);
        }
      }
    }
  }

  @Property(tries = 200, seed = "20261201")
  void quantilesAreMonotoneAndWithinTheDraws(
      @ForAll long seed,
      @ForAll @IntRange(min = 1, max = 100) int length,
      @ForAll @DoubleRange(min = 0, max = 1) double p,
      @ForAll @DoubleRange(min = 0, max = 1) double r) {
    double[] sorted = draws(seed, 1, length, 0.5, false).sorted();
    double low = Math.min(p, r);
    double high = Math.max(p, r);
    double qLow = Quantiles.of(sorted, low);
    double qHigh = Quantiles.of(sorted, high);
    assertTrue(qLow <= qHigh, qLow + " > " + qHigh);
    assertTrue(qLow >= sorted[0] && qHigh <= sorted[length - 1]);
  }

  @Property(tries = 200, seed = "20261201")
  void effectiveSampleSizeIsPositiveAndBounded(
      @ForAll long seed,
      @ForAll @IntRange(min = 1, max = 4) int chains,
      @ForAll @IntRange(min = 4, max = 80) int length,
      @ForAll @DoubleRange(min = -0.95, max = 0.95) double rho) {
    Draws draws = draws(seed, chains, length, rho, false);
    double s = draws.totalCount();
    double ess = EffectiveSampleSize.of(draws);
    assertTrue(ess > 0 && ess <= s * Math.max(1, Math.log10(s)) * (1 + 1e-12), "ess " + ess);
  }
}

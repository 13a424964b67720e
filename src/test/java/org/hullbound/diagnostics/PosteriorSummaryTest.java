package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

class PosteriorSummaryTest {

  @Test
  void summarisesIidNormalDraws() {
    // 4 x 2500 draws from N(1, 2^2). Reference quantiles from commons-math3 NormalDistribution;
    // the sample 2.5% quantile has sd about sqrt(0.025 0.975 / 10000) / (0.0584 / 2) = 0.053,
    // so 0.2 is a 4-sd band; the mean has sd 0.02.
    VariableSummary s = PosteriorSummary.of("mu", SimulatedChains.normal(21, 4, 2500, 1, 2));
    NormalDistribution reference = new NormalDistribution(null, 1, 2);
    assertEquals("mu", s.name());
    assertEquals(4, s.chains());
    assertEquals(2500, s.drawsPerChain());
    assertEquals(VariableSummary.State.COMPLETE, s.state());
    assertTrue(s.notes().isEmpty(), s.notes().toString());
    assertEquals(1, s.mean(), 0.08);
    assertEquals(2, s.sd(), 0.06);
    assertEquals(reference.inverseCumulativeProbability(0.025), s.q025(), 0.2);
    assertEquals(1, s.q50(), 0.1);
    assertEquals(reference.inverseCumulativeProbability(0.975), s.q975(), 0.2);
    assertTrue(s.rhat() < 1.01 && s.rhat() == Math.max(s.rhatBulk(), s.rhatTail()));
    assertEquals(1, s.essBulk() / 10_000, 0.1);
    assertEquals(1, s.essTail() / 10_000, 0.15);
    assertEquals(s.sd() / Math.sqrt(s.essMean()), s.mcseMean(), 1e-15);
    assertTrue(s.mcseQ025() > s.mcseQ50() && s.mcseQ975() > s.mcseQ50());
  }

  @Test
  void matchesTheLowLevelFunctions() {
    double[][] raw = SimulatedChains.ar1(22, 3, 301, 0.4);
    Draws draws = Draws.of(raw);
    VariableSummary s = PosteriorSummary.of("theta", raw);
    RankNormalizedRhat rhat = Rhat.rankNormalized(draws);
    assertEquals(rhat.bulk(), s.rhatBulk());
    assertEquals(rhat.tail(), s.rhatTail());
    assertEquals(EffectiveSampleSize.bulk(draws), s.essBulk());
    assertEquals(EffectiveSampleSize.tail(draws), s.essTail());
    assertEquals(Quantiles.of(draws, 0.975), s.q975());
    assertEquals(MonteCarloStandardError.quantile(draws, 0.025), s.mcseQ025());
    assertEquals(MonteCarloStandardError.quantile(draws, 0.5), s.mcseQ50());
    assertEquals(EffectiveSampleSize.mean(draws), s.essMean());
    // Same formula, but the sd is summed in sorted rather than chain order: equal to rounding.
    assertEquals(MonteCarloStandardError.mean(draws), s.mcseMean(), 1e-14 * s.mcseMean());
    assertEquals(1, s.notes().size());
    assertTrue(s.notes().get(0).contains("odd length 301"), s.notes().get(0));
    assertTrue(s.notes().get(0).contains("iteration 150"), s.notes().get(0));
  }

  @Test
  void nonFiniteDrawsGiveANaNSummarySayingWhere() {
    double[][] raw = SimulatedChains.normal(23, 2, 50, 0, 1);
    raw[1][17] = Double.NaN;
    raw[1][30] = Double.POSITIVE_INFINITY;
    VariableSummary s = PosteriorSummary.of("sigma", raw);
    assertEquals(VariableSummary.State.NON_FINITE, s.state());
    assertTrue(Double.isNaN(s.mean()) && Double.isNaN(s.rhat()) && Double.isNaN(s.essBulk()));
    String note = s.notes().get(0);
    assertTrue(note.contains("draw 17 of chain 1") && note.contains(" 2 non-finite"), note);
  }

  @Test
  void constantDrawsKeepTheirValueAndExplainTheUndefinedDiagnostics() {
    double[][] raw = new double[2][20];
    for (double[] chain : raw) {
      Arrays.fill(chain, 3.5);
    }
    VariableSummary s = PosteriorSummary.of("fixed", raw);
    assertEquals(VariableSummary.State.CONSTANT, s.state());
    assertEquals(3.5, s.mean());
    assertEquals(0, s.sd());
    assertEquals(3.5, s.q025());
    assertEquals(3.5, s.q975());
    assertTrue(Double.isNaN(s.rhat()) && Double.isNaN(s.essTail()) && Double.isNaN(s.mcseMean()));
    assertTrue(s.notes().get(0).contains("all 40 draws equal 3.5"), s.notes().get(0));
  }

  @Test
  void tooShortChainsGiveMomentsButNoDiagnostics() {
    VariableSummary s = PosteriorSummary.of("x", new double[][] {{1, 2, 3}, {4, 5, 6}});
    assertEquals(VariableSummary.State.TOO_SHORT, s.state());
    assertEquals(3.5, s.mean());
    assertEquals(3.5, s.q50());
    assertTrue(Double.isNaN(s.rhat()) && Double.isNaN(s.essBulk()));
    assertTrue(s.notes().get(0).contains("3 draws per chain"), s.notes().get(0));
  }

  @Test
  void fourDrawsPerChainAreEnoughForTheDiagnostics() {
    // Two halves of two draws each: the smallest split chains (Vehtari et al. 2021, section 4.1).
    VariableSummary s = PosteriorSummary.of("x", new double[][] {{1, 4, 2, 3}, {2, 3, 1, 4}});
    assertEquals(VariableSummary.State.COMPLETE, s.state(), s.notes().toString());
    assertTrue(Double.isFinite(s.rhatBulk()), "rhat " + s.rhatBulk());
  }

  @Test
  void meanAndSdAreExactWhereTheirSumsWouldOverflowOrCancel() {
    // Two draws a and b: mean (a + b) / 2 and sd |b - a| / sqrt(2) (the sample variance with
    // divisor n - 1). At 2^1023 the plain sum a + b overflows.
    VariableSummary top = PosteriorSummary.of("x", new double[][] {{0x1p1023, 0x1.8p1023}});
    assertEquals(0x1.4p1023, top.mean());
    double twoDrawSd = 0x1p1022 / Math.sqrt(2);
    assertEquals(twoDrawSd, top.sd(), 1e-15 * twoDrawSd);
    // Around 1e9 with unit steps the sum of squares cancels unless the draws are centred first:
    // the sd of 1, 2, 3, 4 is sqrt(5/3) wherever they sit.
    VariableSummary offset =
        PosteriorSummary.of("x", new double[][] {{1e9 + 1, 1e9 + 2, 1e9 + 3, 1e9 + 4}});
    assertEquals(Math.sqrt(5.0 / 3), offset.sd(), 1e-15);
    // A spread beyond the double range: the sample sd of -1.5, 1.5, 1.5 (times 2^1023) is
    // sqrt(3) 2^1023, about 1.56e308; reported as that or as +infinity, never as small.
    VariableSummary wide =
        PosteriorSummary.of("x", new double[][] {{-0x1.8p1023, 0x1.8p1023, 0x1.8p1023}});
    assertTrue(wide.sd() >= Math.sqrt(3) * 0x1p1023 * (1 - 1e-15), "sd " + wide.sd());
  }

  @Test
  void stuckChainsGiveInfiniteRhatAndSaySo() {
    double[][] raw = new double[3][10];
    for (int c = 0; c < 3; c++) {
      Arrays.fill(raw[c], c);
    }
    VariableSummary s = PosteriorSummary.of("tau", raw);
    assertEquals(VariableSummary.State.COMPLETE, s.state());
    assertEquals(Double.POSITIVE_INFINITY, s.rhat());
    assertTrue(s.notes().stream().anyMatch(n -> n.contains("stuck apart")), s.notes().toString());
  }

  @Test
  void rejectsABlankNameAndRaggedDraws() {
    assertThrows(
        IllegalArgumentException.class, () -> PosteriorSummary.of(" ", new double[][] {{1}}));
    assertThrows(
        IllegalArgumentException.class,
        () -> PosteriorSummary.of("x", new double[][] {{1, 2, 3, 4}, {1, 2, 3}}));
  }
  @Test
  void drawsNearTheLargestDoubleAreFoldedWithoutOverflow() {
    // Two clusters, around +2.5 and -2.5 (the second holding about a sixth of the draws), at
    // scale 2^1022: every draw is finite, but a draw of the lower cluster minus the median
    // (about 5.6 * 2^1022) is beyond Double.MAX_VALUE. The rank-based R-hat must still come out,
    // equal to that of the same draws at scale 2^-2. Both scales are powers of two, so every
    // rounding scales exactly and near-ties keep their order.
    double[][] raw = SimulatedChains.normal(24, 4, 200, 0, 1);
    double[][] huge = new double[raw.length][];
    double[][] small = new double[raw.length][];
    for (int c = 0; c < raw.length; c++) {
      double[] clustered = Arrays.stream(raw[c]).map(z -> (z > -1 ? 2.5 : -2.5) + 0.2 * z).toArray();
      huge[c] = Arrays.stream(clustered).map(x -> x * 0x1p1022).toArray();
      small[c] = Arrays.stream(clustered).map(x -> x * 0x1p-2).toArray();
    }
    VariableSummary atScale = PosteriorSummary.of("x", huge);
    VariableSummary reference = PosteriorSummary.of("x", small);
    assertEquals(VariableSummary.State.COMPLETE, atScale.state(), atScale.notes().toString());
    assertEquals(reference.rhatBulk(), atScale.rhatBulk(), 1e-12, "bulk");
    assertEquals(reference.rhatTail(), atScale.rhatTail(), 1e-12, "tail");
    assertEquals(reference.essTail(), atScale.essTail(), 1e-9 * reference.essTail());
  }

  @Test
  void aSingleDrawIsDescribedInTheSingular() {
    VariableSummary s = PosteriorSummary.of("x", new double[][] {{0.7}});
    assertTrue(s.notes().get(0).startsWith("the only draw is 0.7"), s.notes().toString());
  }

  /**
   * Draws of two values (a bernoulli): tail-ESS is not defined and the state says so; bulk-ESS
   * is the effective sample size of the share at the upper value. ESS is invariant under an
   * affine map of the draws (common practice: autocorrelations are), and rank normalisation maps
   * two values to two scores, so bulk-ESS equals the plain split-chain ESS of the draws (the ESS
   * of the mean) up to rounding. Independent draws with P(1) = 0.3 on a fixed seed.
   */
  @Test
  void twoValuedDrawsHaveNoTailEssAndAreJudgedOnTheShare() {
    java.util.random.RandomGenerator rng = SimulatedChains.random(5);
    double[][] draws = new double[4][1000];
    for (double[] chain : draws) {
      for (int i = 0; i < chain.length; i++) {
        chain[i] = rng.nextDouble() < 0.3 ? 1 : 0;
      }
    }
    VariableSummary s = PosteriorSummary.of("flag", draws);
    assertEquals(VariableSummary.State.TWO_VALUED, s.state(), s.notes().toString());
    assertTrue(Double.isNaN(s.essTail()));
    assertEquals(s.essMean(), s.essBulk(), 1e-9 * s.essMean());
    assertTrue(s.essBulk() > 3000, "nearly independent draws: " + s.essBulk());
    assertEquals(s.rhatBulk(), s.rhat());
    assertTrue(s.notes().get(0).startsWith("the draws take two values only (0 and 1)"), s.notes().toString());
  }

  /**
   * Two values split exactly in half: the median falls between them and the draws folded around
   * it are constant, so the tail R-hat is undefined; R-hat is then the bulk R-hat, which compares
   * the chains' shares (it was NaN, and the unknown flagged as undefined).
   */
  @Test
  void twoValuesSplitInHalfStillHaveAnRhat() {
    double[][] draws = {{0, 1, 0, 1, 0, 1, 0, 1}, {1, 0, 1, 0, 1, 0, 1, 0}};
    VariableSummary s = PosteriorSummary.of("flag", draws);
    assertEquals(VariableSummary.State.TWO_VALUED, s.state());
    assertTrue(Double.isNaN(s.rhatTail()));
    assertTrue(Double.isFinite(s.rhat()) && s.rhat() == s.rhatBulk(), "rhat " + s.rhat());
  }

  @Test
  void threeValuesAreNotTwoValued() {
    double[][] draws = {{0, 1, 2, 1, 0, 1, 2, 1}, {1, 0, 1, 2, 1, 0, 1, 2}};
    assertEquals(VariableSummary.State.COMPLETE, PosteriorSummary.of("k", draws).state());
  }
}

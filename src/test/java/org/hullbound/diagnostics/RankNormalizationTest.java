package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

class RankNormalizationTest {
  private static final NormalDistribution STANDARD_NORMAL = new NormalDistribution(null, 0, 1);

  @Test
  void tiesShareTheAverageOfTheirRanks() {
    assertArrayEquals(
        new double[] {1, 2.5, 2.5, 4}, RankNormalization.fractionalRanks(new double[] {5, 7, 7, 9}));
    assertArrayEquals(
        new double[] {4, 2, 2, 2}, RankNormalization.fractionalRanks(new double[] {3, 1, 1, 1}));
    assertArrayEquals(
        new double[] {1.5, 1.5}, RankNormalization.fractionalRanks(new double[] {0.0, -0.0}));
  }

  @Test
  void blomScoresOfAHandExample() {
    // Vehtari et al. (2021), equation 14: z = Phi^-1((r - 3/8) / (S + 1/4)).
    // Draws {5, 7, 7, 9} in two chains: S = 4, ranks 1, 2.5, 2.5, 4.
    // Rank 1:   p = 0.625 / 4.25 = 0.1470588; rank 4: p = 3.625 / 4.25 = 0.8529412;
    // rank 2.5: p = 2.125 / 4.25 = 0.5 exactly, so z = 0.
    Draws z = RankNormalization.normalScores(Draws.of(new double[][] {{5, 7}, {7, 9}}));
    double low = STANDARD_NORMAL.inverseCumulativeProbability(0.625 / 4.25);
    assertArrayEquals(new double[] {low, 0}, z.chain(0), 1e-12);
    assertArrayEquals(new double[] {0, -low}, z.chain(1), 1e-12);
    // Normal table (recalled from memory): Phi(-1.05) = 0.1469, Phi(-1.04) = 0.1492,
    // so Phi^-1(0.1471) is about -1.049.
    assertEquals(-1.049, low, 1e-3);
  }

  @Test
  void normalScoreAgreesWithCommonsMathInverseCdfOverTheRange() {
    long s = 1_000_000;
    for (double rank : new double[] {1, 2, 10.5, 1000, 500_000, 999_999, 1_000_000}) {
      double p = (rank - 0.375) / (s + 0.25);
      assertEquals(
          STANDARD_NORMAL.inverseCumulativeProbability(p),
          RankNormalization.normalScore(rank, s),
          1e-9,
          "rank " + rank);
    }
  }

  @Test
  void foldedDrawsAreDistancesFromThePooledMedian() {
    // Median of {1, 2, 3, 10} (Hyndman and Fan definition 7) is 2.5.
    Draws folded = RankNormalization.folded(Draws.of(new double[][] {{1, 2}, {3, 10}}));
    assertArrayEquals(new double[] {1.5, 0.5}, folded.chain(0));
    assertArrayEquals(new double[] {0.5, 7.5}, folded.chain(1));
  }

  @Test
  void rejectsNaNAndRanksOutOfRange() {
    assertThrows(
        IllegalArgumentException.class,
        () -> RankNormalization.fractionalRanks(new double[] {1, Double.NaN}));
    assertThrows(IllegalArgumentException.class, () -> RankNormalization.normalScore(0, 4));
    assertThrows(IllegalArgumentException.class, () -> RankNormalization.normalScore(5, 4));
    assertThrows(
        NonFiniteDrawException.class,
        () ->
            RankNormalization.normalScores(
                Draws.of(new double[][] {{1, Double.POSITIVE_INFINITY}})));
  }
}

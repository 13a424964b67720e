package org.hullbound.validation;

import org.apache.commons.math3.distribution.ChiSquaredDistribution;

/**
 * The chi-square test of uniformity of one unknown's ranks, over B equal bins of the ranks 0 .. L
 * (B divides L + 1, so every bin holds the same number of rank values and expects N / B ranks;
 * Talts et al. 2018, section 4).
 *
 * @param label the unknown
 * @param counts ranks per bin
 * @param chiSquare Pearson's statistic, sum (observed - expected)^2 / expected
 * @param degreesOfFreedom B - 1
 * @param pValue P(chi-square(B - 1) >= statistic)
 */
public record RankUniformity(String label, int[] counts, double chiSquare, int degreesOfFreedom, double pValue) {
  public RankUniformity {
    counts = counts.clone();
  }

  @Override
  public int[] counts() {
    return counts.clone();
  }

  /** The test of {@code ranks} (each in 0 .. draws) over {@code bins} bins. */
  static RankUniformity of(String label, int[] ranks, int draws, int bins) {
    int width = (draws + 1) / bins;
    int[] counts = new int[bins];
    for (int rank : ranks) {
      if (rank < 0 || rank > draws) {
        throw new IllegalArgumentException("rank must be in 0 .. " + draws + ", got " + rank);
      }
      counts[rank / width]++;
    }
    double expected = ranks.length / (double) bins;
    double statistic = 0;
    for (int count : counts) {
      statistic += (count - expected) * (count - expected) / expected;
    }
    double p = new ChiSquaredDistribution(null, bins - 1).cumulativeProbability(statistic);
    return new RankUniformity(label, counts, statistic, bins - 1, 1 - p);
  }
}

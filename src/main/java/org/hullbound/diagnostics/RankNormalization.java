package org.hullbound.diagnostics;

import java.util.Arrays;
import org.apache.commons.math3.special.Erf;

/**
 * Rank normalisation and folding of draws, the transforms behind the bulk and tail diagnostics.
 *
 * <p>Replacing draws by normal scores of their pooled ranks makes R-hat and the effective sample
 * size defined for heavy tails and invariant to monotone transforms; folding around the median
 * turns a difference in scale between chains into a difference in location. Both are from
 * Vehtari, Gelman, Simpson, Carpenter and Buerkner (2021), Bayesian Analysis 16(2), section 4.
 */
public final class RankNormalization {
  private RankNormalization() {}

  /**
   * Fractional ranks, 1-based, ties given the average of the ranks they span (so {@code {5, 7,
   * 7, 9}} ranks {@code {1, 2.5, 2.5, 4}}).
   *
   * @throws IllegalArgumentException if {@code values} is null or holds NaN
   */
  public static double[] fractionalRanks(double[] values) {
    if (values == null) {
      throw new IllegalArgumentException("values must not be null");
    }
    for (int i = 0; i < values.length; i++) {
      if (Double.isNaN(values[i])) {
        throw new IllegalArgumentException("values must not hold NaN, got NaN at index " + i);
      }
    }
    double[] sorted = values.clone();
    Arrays.sort(sorted);
    double[] ranks = new double[values.length];
    for (int i = 0; i < values.length; i++) {
      // Equal values occupy 0-based positions [first, last) of the sorted copy, that is 1-based
      // ranks first+1 .. last, whose average is (first + 1 + last) / 2. Comparisons use < and >,
      // so -0.0 and 0.0 are tied draws.
      int first = firstNotBelow(sorted, values[i]);
      int last = firstAbove(sorted, values[i]);
      ranks[i] = (first + 1 + last) / 2.0;
    }
    return ranks;
  }

  private static int firstNotBelow(double[] sorted, double x) {
    int low = 0;
    int high = sorted.length;
    while (low < high) {
      int middle = (low + high) >>> 1;
      if (sorted[middle] < x) {
        low = middle + 1;
      } else {
        high = middle;
      }
    }
    return low;
  }

  private static int firstAbove(double[] sorted, double x) {
    int low = 0;
    int high = sorted.length;
    while (low < high) {
      int middle = (low + high) >>> 1;
      if (sorted[middle] > x) {
        high = middle;
      } else {
        low = middle + 1;
      }
    }
    return low;
  }

  /**
   * The normal score of rank {@code r} among {@code s} values with Blom's offset 3/8: {@code
   * Phi^-1((r - 3/8) / (s + 1/4))} (Vehtari et al. 2021, equation 14; Blom 1958).
   */
  public static double normalScore(double rank, long s) {
    if (!(rank >= 1 && rank <= s)) {
      throw new IllegalArgumentException("rank must be in [1, " + s + "], got " + rank);
    }
    double p = (rank - 0.375) / (s + 0.25);
    return Math.sqrt(2) * Erf.erfInv(2 * p - 1);
  }

  /**
   * Rank-normalised draws: every draw replaced by the normal score of its fractional rank among
   * all draws of all chains (Vehtari et al. 2021, section 4.1). The shape is kept.
   *
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static Draws normalScores(Draws draws) {
    draws.requireFinite();
    double[] ranks = fractionalRanks(draws.pooled());
    long s = ranks.length;
    int n = draws.length();
    double[][] z = new double[draws.chainCount()][n];
    for (int c = 0; c < z.length; c++) {
      for (int i = 0; i < n; i++) {
        z[c][i] = normalScore(ranks[c * n + i], s);
      }
    }
    return Draws.wrap(z);
  }

  /**
   * Folded draws {@code |x - median|}, median of all draws pooled (Vehtari et al. 2021, section
   * 4.2), so that chains differing in scale differ in location.
   *
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static Draws folded(Draws draws) {
    draws.requireFinite();
    double median = Quantiles.of(draws.sorted(), 0.5);
    return draws.map(x -> Math.abs(x - median));
  }
}

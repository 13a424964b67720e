package org.hullbound.diagnostics;

/**
 * The potential scale reduction factor R-hat: how much the spread of the pooled draws would
 * shrink if the chains ran forever, near 1 when chains agree.
 *
 * <p>Why: chains started apart that have not yet forgotten their starts disagree, and R-hat
 * measures that disagreement against the spread within chains. {@link #basic} is the estimate
 * {@code sqrt(var+ / W)} with {@code var+ = (N - 1)/N W + B/N} from the within-chain variance W
 * and the between-chain variance B (Gelman and Rubin 1992; Vehtari, Gelman, Simpson, Carpenter
 * and Buerkner 2021, Bayesian Analysis 16(2), equations 3 and 4). {@link #rankNormalized} is the
 * 2021 paper's recommended form: split chains, rank-normalised, in bulk and folded versions.
 *
 * <p>Undefined cases: when every draw is equal R-hat is NaN; when every chain is constant but
 * the chains differ (W = 0 &lt; B) it is +Infinity, the chains being stuck apart.
 */
public final class Rhat {
  private Rhat() {}

  /**
   * R-hat of the chains as given (not split, not rank-normalised).
   *
   * @throws IllegalArgumentException if the chains hold fewer than 2 draws each
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static double basic(Draws draws) {
    draws.requireFinite();
    int m = draws.chainCount();
    int n = draws.length();
    if (n < 2) {
      throw new IllegalArgumentException("R-hat needs at least 2 draws per chain, got " + n);
    }
    double[] centreAndScale = Moments.centreAndScale(draws);
    if (centreAndScale[1] == 0) {
      return Double.NaN;
    }
    double[] chainMeans = new double[m];
    double within = 0;
    double[] standard = new double[n];
    for (int c = 0; c < m; c++) {
      double[] chain = draws.values()[c];
      for (int i = 0; i < n; i++) {
        standard[i] = (chain[i] - centreAndScale[0]) / centreAndScale[1];
      }
      chainMeans[c] = Moments.mean(standard);
      within += Moments.variance(standard) / m;
    }
    double betweenOverN = m > 1 ? Moments.variance(chainMeans) : 0;
    if (within == 0) {
      return betweenOverN > 0 ? Double.POSITIVE_INFINITY : Double.NaN;
    }
    double varPlus = (n - 1.0) / n * within + betweenOverN;
    return Math.sqrt(varPlus / within);
  }

  /**
   * Split R-hat: {@link #basic} of the chains cut in halves (Vehtari et al. 2021, section 4.1),
   * which also catches a trend within a chain.
   *
   * @throws IllegalArgumentException if the chains hold fewer than 4 draws each
   */
  public static double split(Draws draws) {
    EffectiveSampleSize.requireSplittable(draws);
    return basic(draws.requireFinite().split());
  }

  /**
   * Rank-normalised split R-hat, bulk and tail (Vehtari et al. 2021, section 4.2): the split
   * chains are replaced by normal scores of their pooled ranks, and for the tail version first
   * folded around their median. Report {@link RankNormalizedRhat#max()}.
   *
   * @throws IllegalArgumentException if the chains hold fewer than 4 draws each
   * @throws NonFiniteDrawException if a draw is NaN or infinite
   */
  public static RankNormalizedRhat rankNormalized(Draws draws) {
    EffectiveSampleSize.requireSplittable(draws);
    Draws split = draws.requireFinite().split();
    if (split.isConstant()) {
      return new RankNormalizedRhat(Double.NaN, Double.NaN);
    }
    return ofNormalScores(RankNormalization.normalScores(split), foldedNormalScores(split));
  }

  /** Normal scores of the folded split draws, or null when the folded draws are all equal. */
  static Draws foldedNormalScores(Draws split) {
    Draws folded = RankNormalization.folded(split);
    return folded.isConstant() ? null : RankNormalization.normalScores(folded);
  }

  /** Bulk and tail R-hat from the normal scores of split draws and of folded split draws. */
  static RankNormalizedRhat ofNormalScores(Draws scores, Draws foldedScores) {
    double bulk = basic(scores);
    double tail = foldedScores == null ? Double.NaN : basic(foldedScores);
    return new RankNormalizedRhat(bulk, tail);
  }
}

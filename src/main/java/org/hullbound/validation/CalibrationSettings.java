package org.hullbound.validation;

/**
 * The size of a simulation-based calibration run.
 *
 * @param replicates N, prior draws each followed by a simulated data set and a fit, at least 2
 * @param draws L, posterior draws kept per fit, at least 1; a rank lies in 0 .. L
 * @param thin K, sweeps per kept draw (thin so that the L draws are nearly independent)
 * @param burnIn sweeps discarded before the first kept draw of each fit
 * @param bins B, the chi-square bins, a divisor of L + 1 of at least 2; 0 picks the largest
 *     divisor of L + 1 that leaves at least 5 expected ranks per bin, capped at 50
 * @param seed the seed from which every replicate's generator is split
 */
public record CalibrationSettings(int replicates, int draws, int thin, int burnIn, int bins, long seed)
    implements java.io.Serializable {
  public static final int DEFAULT_DRAWS = 99;
  public static final int DEFAULT_THIN = 2;
  public static final int DEFAULT_BURN_IN = 200;

  public CalibrationSettings {
    if (replicates < 2) {
      throw new IllegalArgumentException("replicates must be >= 2, got " + replicates);
    }
    if (draws < 1) {
      throw new IllegalArgumentException("draws must be >= 1, got " + draws);
    }
    if (thin < 1) {
      throw new IllegalArgumentException("thin must be >= 1, got " + thin);
    }
    if (burnIn < 0) {
      throw new IllegalArgumentException("burnIn must be >= 0, got " + burnIn);
    }
    if (bins != 0 && (bins < 2 || (draws + 1) % bins != 0)) {
      throw new IllegalArgumentException(
          "bins must divide draws + 1 = " + (draws + 1) + " and be >= 2, got " + bins);
    }
    if ((long) burnIn + (long) draws * thin > Integer.MAX_VALUE) {
      throw new IllegalArgumentException("burnIn + draws * thin must fit in an int");
    }
  }

  /** The bins used: {@link #bins()} or, when 0, the automatic choice. */
  public int binCount() {
    if (bins != 0) {
      return bins;
    }
    int best = 0;
    int cap = Math.min(50, replicates / 5);
    for (int b = 2; b <= Math.min(cap, draws + 1); b++) {
      if ((draws + 1) % b == 0) {
        best = b;
      }
    }
    if (best == 0) {
      int fewestBins = 2;
      while ((draws + 1) % fewestBins != 0) {
        fewestBins++;
      }
      throw new IllegalArgumentException(
          "replicates must be at least " + 5L * fewestBins + " for draws = " + draws + ", got "
              + replicates + ": the rank test needs " + fewestBins + " or more bins (dividing"
              + " draws + 1 = " + (draws + 1) + ") with at least 5 replicates expected in each"
              + (fewestBins > 2 ? "; draws such as 99, 199 or 999 need only 10" : ""));
    }
    return best;
  }
}

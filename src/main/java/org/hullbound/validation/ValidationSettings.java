package org.hullbound.validation;

/**
 * How every validation case is fitted and judged.
 *
 * <p>A quantity passes when {@code |estimate - reference| <= k * mcse + floor}: with an honest
 * MCSE the error is roughly normal, so {@code k = 4} makes a false failure of one quantity about
 * 6e-5 likely (two-sided normal tail), about 2e-3 over the suite's ~30 quantities.
 *
 * @param chains chains per case, at least 2 (R-hat and the MCSE need several)
 * @param burnIn sweeps discarded per chain
 * @param draws kept draws per chain, at least 100
 * @param seed the seed every case's run starts from
 * @param k the multiple of the MCSE allowed, > 0
 */
public record ValidationSettings(int chains, int burnIn, int draws, long seed, double k) {
  public static final int DEFAULT_CHAINS = 4;
  public static final int DEFAULT_BURN_IN = 1000;
  public static final int DEFAULT_DRAWS = 5000;
  public static final long DEFAULT_SEED = 20240601L;
  public static final double DEFAULT_K = 4;

  public ValidationSettings {
    if (chains < 2) {
      throw new IllegalArgumentException("chains must be >= 2, got " + chains);
    }
    if (burnIn < 0) {
      throw new IllegalArgumentException("burnIn must be >= 0, got " + burnIn);
    }
    if (draws < 100) {
      throw new IllegalArgumentException("draws must be >= 100, got " + draws);
    }
    if (!(k > 0) || Double.isInfinite(k)) {
      throw new IllegalArgumentException("k must be finite and > 0, got " + k);
    }
  }

  /** The defaults of {@code hullbound validate}. */
  public static ValidationSettings defaults() {
    return new ValidationSettings(DEFAULT_CHAINS, DEFAULT_BURN_IN, DEFAULT_DRAWS, DEFAULT_SEED, DEFAULT_K);
  }

  public ValidationSettings withDraws(int newDraws) {
    return new ValidationSettings(chains, burnIn, newDraws, seed, k);
  }

  public ValidationSettings withSeed(long newSeed) {
    return new ValidationSettings(chains, burnIn, draws, newSeed, k);
  }

  public ValidationSettings withBurnIn(int newBurnIn) {
    return new ValidationSettings(chains, newBurnIn, draws, seed, k);
  }
}

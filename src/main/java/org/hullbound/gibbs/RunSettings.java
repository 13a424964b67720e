package org.hullbound.gibbs;

/**
 * How long and how many chains to run: chains, burn-in sweeps, kept draws, thinning, seed and
 * worker threads.
 *
 * <p>The seed and the chain count alone fix the draws; the thread count only changes how fast they
 * come (each chain has its own generator split from the seed in chain order).
 *
 * @param chains number of chains, at least 1
 * @param burnIn sweeps discarded before the first kept draw, at least 0
 * @param draws kept draws per chain, at least 1
 * @param thin sweeps per kept draw after burn-in, at least 1
 * @param seed seed of the generator from which every chain's generator is split
 * @param threads worker threads running chains, at least 1 (more than {@code chains} is useless)
 */
public record RunSettings(int chains, int burnIn, int draws, int thin, long seed, int threads) {

  /** The defaults of {@code hullbound fit}: 4 chains, 1000 burn-in sweeps, 1000 draws, no thinning. */
  public static final int DEFAULT_CHAINS = 4;

  public static final int DEFAULT_BURN_IN = 1000;
  public static final int DEFAULT_DRAWS = 1000;

  public RunSettings {
    if (chains < 1) {
      throw new IllegalArgumentException("chains must be >= 1, got " + chains);
    }
    if (burnIn < 0) {
      throw new IllegalArgumentException("burnIn must be >= 0, got " + burnIn);
    }
    if (draws < 1) {
      throw new IllegalArgumentException("draws must be >= 1, got " + draws);
    }
    if (thin < 1) {
      throw new IllegalArgumentException("thin must be >= 1, got " + thin);
    }
    if (threads < 1) {
      throw new IllegalArgumentException("threads must be >= 1, got " + threads);
    }
    if ((long) burnIn + (long) draws * thin > Integer.MAX_VALUE) {
      throw new IllegalArgumentException(
          "burnIn + draws * thin must fit in an int, got " + burnIn + " + " + draws + " * " + thin);
    }
  }

  /** Settings with one thread per chain, capped at the processors available. */
  public static RunSettings of(int chains, int burnIn, int draws, int thin, long seed) {
    int processors = Runtime.getRuntime().availableProcessors();
    return new RunSettings(chains, burnIn, draws, thin, seed, Math.max(1, Math.min(chains, processors)));
  }

  /** The same settings run on {@code threads} worker threads. */
  public RunSettings withThreads(int threads) {
    return new RunSettings(chains, burnIn, draws, thin, seed, threads);
  }

  /** Sweeps each chain makes in all: burn-in plus draws times thinning. */
  public int totalSweeps() {
    return burnIn + draws * thin;
  }
}

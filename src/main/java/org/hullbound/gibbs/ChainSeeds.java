package org.hullbound.gibbs;


/**
 * The chains' generators: an LXM generator (L64X128MixRandom) seeded once, then split once per
 * chain in chain order.
 *
 * <p>Splitting gives statistically independent streams (Steele, Lea and Flood 2014, the LXM family
 * of Steele and Vigna 2021), and doing it in chain order before any thread starts makes a seed and
 * a chain count reproduce every draw however the threads are scheduled.
 */
public final class ChainSeeds {
  /** The JDK algorithm whose numbers every chain's {@link ChainRandom} reproduces bit for bit. */
  public static final String ALGORITHM = "L64X128MixRandom";

  private ChainSeeds() {}

  /** The generators of chains 0 .. {@code chains - 1} for {@code seed}. */
  public static ChainRandom[] split(long seed, int chains) {
    if (chains < 1) {
      throw new IllegalArgumentException("chains must be >= 1, got " + chains);
    }
    // Our own LXM rather than the JDK's: a checkpoint needs the generator's state (ChainRandom).
    ChainRandom root = ChainRandom.seeded(seed);
    ChainRandom[] generators = new ChainRandom[chains];
    for (int chain = 0; chain < chains; chain++) {
      generators[chain] = root.split();
    }
    return generators;
  }
}

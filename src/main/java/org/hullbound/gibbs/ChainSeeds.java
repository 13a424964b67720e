package org.hullbound.gibbs;

import java.util.random.RandomGenerator;
import java.util.random.RandomGenerator.SplittableGenerator;
import java.util.random.RandomGeneratorFactory;

/**
 * The chains' generators: an LXM generator (L64X128MixRandom) seeded once, then split once per
 * chain in chain order.
 *
 * <p>Splitting gives statistically independent streams (Steele, Lea and Flood 2014, the LXM family
 * of Steele and Vigna 2021), and doing it in chain order before any thread starts makes a seed and
 * a chain count reproduce every draw however the threads are scheduled.
 */
public final class ChainSeeds {
  /** The JDK algorithm used for every chain. */
  public static final String ALGORITHM = "L64X128MixRandom";

  private ChainSeeds() {}

  /** The generators of chains 0 .. {@code chains - 1} for {@code seed}. */
  public static RandomGenerator[] split(long seed, int chains) {
    if (chains < 1) {
      throw new IllegalArgumentException("chains must be >= 1, got " + chains);
    }
    SplittableGenerator root =
        (SplittableGenerator) RandomGeneratorFactory.of(ALGORITHM).create(seed);
    RandomGenerator[] generators = new RandomGenerator[chains];
    for (int chain = 0; chain < chains; chain++) {
      generators[chain] = root.split();
    }
    return generators;
  }
}

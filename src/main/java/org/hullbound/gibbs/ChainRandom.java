package org.hullbound.gibbs;

import java.util.random.RandomGenerator;

/**
 * The LXM generator L64X128MixRandom (Steele and Vigna 2021, "LXM: better splittable pseudorandom
 * number generators (and almost as fast)"), written out so that its state can be saved and
 * restored: a checkpoint must hold every chain's generator state, which the JDK's own
 * {@code L64X128MixRandom} does not expose.
 *
 * <p>Same algorithm, seeding and {@code split()} as the JDK's (the {@code java.util.random} package
 * specification; seeding and splitting as in {@code jdk.internal.util.random.RandomSupport}), so
 * that draws are bit-identical to {@code RandomGeneratorFactory.of("L64X128MixRandom").create(seed)}
 * and its splits; {@code ChainRandomTest} checks this against the JDK. Only {@link #nextLong} is
 * implemented here: every other method is the {@link RandomGenerator} default, as in the JDK class.
 * Not thread-safe: one chain, one thread at a time.
 */
public final class ChainRandom implements RandomGenerator {
  /** The LCG multiplier of the L64 family (Steele and Vigna 2021, table of multipliers). */
  private static final long M = 0xd1342543de82ef95L;

  private static final long GOLDEN_RATIO_64 = 0x9e3779b97f4a7c15L;
  private static final long SILVER_RATIO_64 = 0x6A09E667F3BCC909L;

  /** Number of longs in {@link #state()}. */
  public static final int STATE_LENGTH = 4;

  private final long a;
  private long s;
  private long x0;
  private long x1;

  private ChainRandom(long a, long s, long x0, long x1) {
    this.a = a | 1;
    this.s = s;
    if ((x0 | x1) == 0) {
      long v = s;
      x0 = mixStafford13(v += GOLDEN_RATIO_64);
      x1 = mixStafford13(v + GOLDEN_RATIO_64);
    }
    this.x0 = x0;
    this.x1 = x1;
  }

  /** The generator the JDK makes for {@code RandomGeneratorFactory.of("L64X128MixRandom").create(seed)}. */
  public static ChainRandom seeded(long seed) {
    seed ^= SILVER_RATIO_64;
    long a = mixMurmur64(seed);
    long x0 = mixStafford13(seed);
    long x1 = mixStafford13(seed + GOLDEN_RATIO_64);
    return new ChainRandom(a, 1, x0, x1);
  }

  /**
   * A generator continuing exactly where the one that gave {@code state} (from {@link #state()})
   * was.
   */
  public static ChainRandom restore(long[] state) {
    if (state == null || state.length != STATE_LENGTH) {
      throw new IllegalArgumentException(
          "a generator state must have " + STATE_LENGTH + " numbers, got "
              + (state == null ? "null" : state.length));
    }
    if ((state[0] & 1) == 0 || (state[2] | state[3]) == 0) {
      throw new IllegalArgumentException(
          "not a generator state: the additive constant must be odd and the xoroshiro part not all 0");
    }
    return new ChainRandom(state[0], state[1], state[2], state[3]);
  }

  /** The whole state: additive constant, LCG state, the two xoroshiro words. */
  public long[] state() {
    return new long[] {a, s, x0, x1};
  }

  /**
   * A new generator split off this one, as the JDK's {@code split()}: a random "brine" for the
   * additive constant, then three longs for the state (one step of this generator each).
   */
  public ChainRandom split() {
    long brine = nextLong();
    long s = nextLong();
    long x0 = nextLong();
    long x1 = nextLong();
    return new ChainRandom(brine << 1, s, x0, x1);
  }

  @Override
  public long nextLong() {
    // Steele and Vigna 2021: 1. mix the sum of the LCG and xoroshiro parts (lea64),
    // 2. advance the LCG, 3. advance xoroshiro128 (version 1.0, shifts 24, 16, 37).
    long result = mixLea64(s + x0);
    s = M * s + a;
    long q0 = x0;
    long q1 = x1;
    q1 ^= q0;
    q0 = Long.rotateLeft(q0, 24);
    q0 = q0 ^ q1 ^ (q1 << 16);
    q1 = Long.rotateLeft(q1, 37);
    x0 = q0;
    x1 = q1;
    return result;
  }

  private static long mixLea64(long z) {
    z = (z ^ (z >>> 32)) * 0xdaba0b6eb09322e3L;
    z = (z ^ (z >>> 32)) * 0xdaba0b6eb09322e3L;
    return z ^ (z >>> 32);
  }

  private static long mixMurmur64(long z) {
    z = (z ^ (z >>> 33)) * 0xff51afd7ed558ccdL;
    z = (z ^ (z >>> 33)) * 0xc4ceb9fe1a85ec53L;
    return z ^ (z >>> 33);
  }

  private static long mixStafford13(long z) {
    z = (z ^ (z >>> 30)) * 0xbf58476d1ce4e5b9L;
    z = (z ^ (z >>> 27)) * 0x94d049bb133111ebL;
    return z ^ (z >>> 31);
  }
}

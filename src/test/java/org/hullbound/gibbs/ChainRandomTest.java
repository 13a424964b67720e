package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.random.RandomGenerator;
import java.util.random.RandomGenerator.SplittableGenerator;
import java.util.random.RandomGeneratorFactory;
import org.junit.jupiter.api.Test;

/**
 * {@link ChainRandom} against the JDK's own L64X128MixRandom (the reference implementation of
 * Steele and Vigna 2021 in {@code java.util.random}): same seeding, same splits, same numbers bit
 * for bit, through every method the samplers use.
 */
class ChainRandomTest {

  private static SplittableGenerator jdk(long seed) {
    return (SplittableGenerator) RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  /** Compares many calls of each kind; any difference in state shows within a few numbers. */
  private static void assertSameStream(RandomGenerator expected, RandomGenerator actual) {
    for (int k = 0; k < 2000; k++) {
      assertEquals(expected.nextLong(), actual.nextLong(), "nextLong " + k);
      assertEquals(expected.nextInt(), actual.nextInt(), "nextInt " + k);
      assertEquals(
          Double.doubleToRawLongBits(expected.nextDouble()),
          Double.doubleToRawLongBits(actual.nextDouble()), "nextDouble " + k);
      assertEquals(expected.nextBoolean(), actual.nextBoolean(), "nextBoolean " + k);
      assertEquals(
          Double.doubleToRawLongBits(expected.nextGaussian()),
          Double.doubleToRawLongBits(actual.nextGaussian()), "nextGaussian " + k);
      assertEquals(
          Double.doubleToRawLongBits(expected.nextExponential()),
          Double.doubleToRawLongBits(actual.nextExponential()), "nextExponential " + k);
      assertEquals(expected.nextInt(17), actual.nextInt(17), "nextInt(17) " + k);
      assertEquals(expected.nextLong(5, 1L << 40), actual.nextLong(5, 1L << 40), "bounded " + k);
      assertEquals(
          Double.doubleToRawLongBits(expected.nextDouble(-3, 7)),
          Double.doubleToRawLongBits(actual.nextDouble(-3, 7)), "nextDouble(-3, 7) " + k);
    }
  }

  @Test
  void seedingMatchesTheJdkGenerator() {
    for (long seed : new long[] {0, 1, -1, 42, Long.MIN_VALUE, 20261201L}) {
      assertSameStream(jdk(seed), ChainRandom.seeded(seed));
    }
  }

  @Test
  void splitsMatchTheJdkGeneratorInChainOrder() {
    for (long seed : new long[] {1, 7, -12345}) {
      SplittableGenerator root = jdk(seed);
      ChainRandom ours = ChainRandom.seeded(seed);
      for (int chain = 0; chain < 5; chain++) {
        assertSameStream(root.split(), ours.split());
      }
      assertSameStream(root, ours);
    }
  }

  @Test
  void chainSeedsGiveTheSameGeneratorsAsSplittingTheJdkGenerator() {
    RandomGenerator[] chains = ChainSeeds.split(99, 3);
    SplittableGenerator root = jdk(99);
    for (RandomGenerator chain : chains) {
      assertSameStream(root.split(), chain);
    }
  }

  @Test
  void aRestoredGeneratorContinuesTheSameStream() {
    ChainRandom original = ChainRandom.seeded(5).split();
    for (int k = 0; k < 1234; k++) {
      original.nextGaussian();
    }
    ChainRandom copy = ChainRandom.restore(original.state());
    assertSameStream(original, copy);
  }

  @Test
  void aMalformedStateIsRefusedWithAMessage() {
    assertThrows(IllegalArgumentException.class, () -> ChainRandom.restore(new long[3]));
    assertThrows(IllegalArgumentException.class, () -> ChainRandom.restore(new long[] {2, 0, 1, 1}));
    assertThrows(IllegalArgumentException.class, () -> ChainRandom.restore(new long[] {1, 0, 0, 0}));
  }
}

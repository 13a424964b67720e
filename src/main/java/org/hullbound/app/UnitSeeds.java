package org.hullbound.app;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;

/**
 * The seed of one unit of a batch, derived from the run's seed and the unit's name alone: the
 * first 8 bytes (big-endian) of SHA-256 over a fixed tag, the run's seed (8 bytes, big-endian) and
 * the name in UTF-8.
 *
 * <p>Why a hash of the name and not a split per position: a unit refitted alone, in another
 * batch, in another order, on another worker or after a lost task attempt gets the same seed, so
 * the same draws. SHA-256 (FIPS 180-4) is in every JDK and gives unrelated seeds to similar names.
 */
public final class UnitSeeds {
  private static final byte[] TAG = "hullbound unit seed\0".getBytes(StandardCharsets.UTF_8);

  private UnitSeeds() {}

  /** The seed of unit {@code unit} in a run seeded with {@code runSeed}. */
  public static long of(long runSeed, String unit) {
    if (unit == null) {
      throw new IllegalArgumentException("unit must not be null");
    }
    MessageDigest sha;
    try {
      sha = MessageDigest.getInstance("SHA-256");
    } catch (NoSuchAlgorithmException e) {
      throw new IllegalStateException("the JDK lacks SHA-256, which every JDK must have", e);
    }
    sha.update(TAG);
    sha.update(ByteBuffer.allocate(Long.BYTES).putLong(runSeed).array());
    sha.update(unit.getBytes(StandardCharsets.UTF_8));
    return ByteBuffer.wrap(sha.digest()).getLong();
  }
}

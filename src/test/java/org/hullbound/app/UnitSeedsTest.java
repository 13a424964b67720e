package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

import org.junit.jupiter.api.Test;

/** A unit's seed is a function of the run's seed and the unit's name alone, fixed for good. */
class UnitSeedsTest {

  /**
   * The reference values were computed outside the project with Python's hashlib: the first 8
   * bytes, big-endian signed, of sha256(b"hullbound unit seed\0" + struct.pack(">q", seed) +
   * name.encode("utf-8")). A change of them would change every batch's draws.
   */
  @Test
  void seedsAreTheFirstEightBytesOfSha256OverTheTagTheRunSeedAndTheName() {
    assertEquals(-863690336012248139L, UnitSeeds.of(7, "north"));
    assertEquals(3852695115877252412L, UnitSeeds.of(7, "south"));
    assertEquals(4285166396015763921L, UnitSeeds.of(7, "east"));
    assertEquals(-7672663003053816914L, UnitSeeds.of(-1, "Zürich"));
    assertEquals(-4578386636925427580L, UnitSeeds.of(0, ""));
  }

  @Test
  void anotherRunSeedGivesTheSameUnitAnotherSeed() {
    assertNotEquals(UnitSeeds.of(7, "north"), UnitSeeds.of(8, "north"));
  }
}

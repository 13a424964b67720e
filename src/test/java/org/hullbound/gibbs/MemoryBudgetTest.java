package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

/** What a run holds in memory, and the shares of the heap at which fit notes or refuses it. */
class MemoryBudgetTest {

  @Test
  void oneCopyIsChainsTimesDrawsTimesUnknownsDoublesAndTheRunHoldsThree() {
    MemoryBudget budget = MemoryBudget.of(4, 1000, 10);
    assertEquals(4L * 1000 * 10 * 8, budget.drawBytes());
    assertEquals(3L * 4 * 1000 * 10 * 8, budget.bytes());
  }

  @Test
  void productsBeyondALongSaturateInsteadOfWrappingToSmallOrNegativeFigures() {
    MemoryBudget huge = MemoryBudget.of(Integer.MAX_VALUE, Integer.MAX_VALUE, Integer.MAX_VALUE);
    assertEquals(Long.MAX_VALUE, huge.drawBytes());
    assertEquals(Long.MAX_VALUE, huge.bytes());
    assertEquals(MemoryBudget.Decision.REFUSE, huge.against(Long.MAX_VALUE));
    // 2^31 x 2^31 x 2^3 = 2^65 would wrap to 0 in plain long arithmetic.
    assertEquals(Long.MAX_VALUE, MemoryBudget.of(1L << 31, 1L << 31, 1).drawBytes());
  }

  @Test
  void refusesAboveSixtyPercentOfTheHeapNotesAboveAQuarterAndOtherwiseFits() {
    long heap = 1000L * 24; // 1000 doubles held three times = 24 000 bytes at share 1
    assertEquals(MemoryBudget.Decision.FITS, MemoryBudget.of(1, 250, 1).against(heap)); // 25%
    assertEquals(MemoryBudget.Decision.NOTE, MemoryBudget.of(1, 251, 1).against(heap));
    assertEquals(MemoryBudget.Decision.NOTE, MemoryBudget.of(1, 600, 1).against(heap)); // 60%
    assertEquals(MemoryBudget.Decision.REFUSE, MemoryBudget.of(1, 601, 1).against(heap));
    assertEquals(MemoryBudget.Decision.FITS, MemoryBudget.of(0, 601, 1).against(heap));
  }

  @Test
  void describesBytesInBinaryUnits() {
    assertEquals("0 bytes", MemoryBudget.describe(0));
    assertEquals("1023 bytes", MemoryBudget.describe(1023));
    assertEquals("1.0 KiB", MemoryBudget.describe(1024));
    assertEquals("1.5 MiB", MemoryBudget.describe(3L << 19));
    assertEquals("8.0 EiB", MemoryBudget.describe(Long.MAX_VALUE));
  }

  @Test
  void refusesNegativeCountsAndHeaps() {
    assertThrows(IllegalArgumentException.class, () -> MemoryBudget.of(-1, 1, 1));
    assertThrows(IllegalArgumentException.class, () -> MemoryBudget.of(1, -1, 1));
    assertThrows(IllegalArgumentException.class, () -> MemoryBudget.of(1, 1, -1));
    assertThrows(IllegalArgumentException.class, () -> MemoryBudget.of(1, 1, 1).against(0));
    assertThrows(IllegalArgumentException.class, () -> MemoryBudget.describe(-1));
  }
}

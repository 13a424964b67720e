package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class SupportTest {

  @Test
  void factoriesGiveTheFourKinds() {
    assertFalse(Support.real().isBoundedBelow());
    assertFalse(Support.real().isBoundedAbove());
    assertTrue(Support.above(2).isBoundedBelow());
    assertFalse(Support.above(2).isBoundedAbove());
    assertTrue(Support.below(2).isBoundedAbove());
    assertEquals(new Support(-1, 3), Support.between(-1, 3));
    assertTrue(Support.between(-1, 3).containsInInterior(0));
    assertFalse(Support.between(-1, 3).containsInInterior(3));
    assertTrue(Support.between(-1, 3).contains(3));
  }

  @Test
  void containsIncludesTheEndsAndNothingBeyond() {
    Support interval = Support.between(-1, 3);
    assertTrue(interval.contains(-1) && interval.contains(3) && interval.contains(0));
    assertFalse(interval.contains(Math.nextDown(-1.0)) || interval.contains(Math.nextUp(3.0)));
    assertFalse(Support.above(2).contains(1) || Support.below(2).contains(3));
  }

  @Test
  void theTextFormBracketsFiniteEndsAndOpensInfiniteOnes() {
    // interval notation (common practice): a finite end is included, an infinite one is not
    assertEquals("[-1.0, 3.0]", Support.between(-1, 3).toString());
    assertEquals("(-inf, +inf)", Support.real().toString());
    assertEquals("[2.0, +inf)", Support.above(2).toString());
    assertEquals("(-inf, 2.0]", Support.below(2).toString());
  }

  @Test
  void invertedBoundsAreRefusedWithBothValuesNamed() {
    IllegalArgumentException e =
        assertThrows(IllegalArgumentException.class, () -> Support.between(2, 1));
    assertTrue(e.getMessage().contains("lower = 2.0") && e.getMessage().contains("upper = 1.0"));
    assertThrows(IllegalArgumentException.class, () -> Support.between(1, 1));
  }

  @Test
  void nanAndMisplacedInfinitiesAreRefused() {
    assertThrows(IllegalArgumentException.class, () -> Support.between(Double.NaN, 1));
    assertThrows(IllegalArgumentException.class, () -> Support.above(Double.NaN));
    assertThrows(IllegalArgumentException.class, () -> Support.below(Double.POSITIVE_INFINITY));
    assertThrows(IllegalArgumentException.class, () -> Support.above(Double.NEGATIVE_INFINITY));
    assertThrows(
        IllegalArgumentException.class,
        () -> new Support(Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY));
    assertThrows(
        IllegalArgumentException.class, () -> Support.between(0, Double.POSITIVE_INFINITY));
    IllegalArgumentException lower = assertThrows(
        IllegalArgumentException.class, () -> Support.between(Double.NEGATIVE_INFINITY, 0));
    assertTrue(lower.getMessage().contains("lower bound must be finite"), lower.getMessage());
  }
}

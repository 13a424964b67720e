package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class HullOptionsTest {

  @Test
  void defaultsAreAnAutomaticStartWithCapSixtyFour() {
    HullOptions options = HullOptions.defaults();
    assertFalse(options.hasStartingAbscissae());
    assertEquals(0.0, options.guess());
    assertEquals(1.0, options.spread());
    assertEquals(64, options.maximumHullSize());
    assertEquals(1e-8, options.logConcavityTolerance());
  }

  @Test
  void theTextFormNamesTheStartAndEveryLimit() {
    assertEquals("HullOptions[automatic start, guess 0.0, spread 1.0, maximumHullSize 64,"
        + " logConcavityTolerance 1.0E-8, maximumSearchSteps 64, maximumProposals 100000]",
        HullOptions.defaults().toString());
    assertTrue(HullOptions.defaults().withStartingAbscissae(0, 1).toString()
        .startsWith("HullOptions[starting abscissae [0.0, 1.0], maximumHullSize 64"));
  }

  @Test
  void withMethodsReturnNewValuesAndLeaveTheOriginal() {
    HullOptions base = HullOptions.defaults();
    HullOptions changed = base.withMaximumHullSize(10).withAutomaticStart(3, 0.5);
    assertEquals(64, base.maximumHullSize());
    assertEquals(10, changed.maximumHullSize());
    assertEquals(3.0, changed.guess());
    assertEquals(0.5, changed.spread());
  }

  @Test
  void startingAbscissaeAreSortedDistinctAndCopied() {
    double[] given = {3, 1, 2, 1};
    HullOptions options = HullOptions.defaults().withStartingAbscissae(given);
    given[0] = 99;
    assertTrue(options.hasStartingAbscissae());
    assertArrayEquals(new double[] {1, 2, 3}, options.startingAbscissae());
  }

  @Test
  void badValuesAreRefusedNamingTheArgument() {
    HullOptions d = HullOptions.defaults();
    assertMessage(() -> d.withAutomaticStart(0, 0), "spread");
    assertMessage(() -> d.withAutomaticStart(0, Double.NaN), "spread");
    assertMessage(() -> d.withAutomaticStart(Double.NaN, 1), "guess");
    assertMessage(() -> d.withMaximumHullSize(2), "maximumHullSize");
    assertMessage(() -> d.withLogConcavityTolerance(-1), "logConcavityTolerance");
    assertMessage(() -> d.withLogConcavityTolerance(Double.NaN), "logConcavityTolerance");
    assertMessage(() -> d.withMaximumSearchSteps(0), "maximumSearchSteps");
    assertMessage(() -> d.withStartingAbscissae(), "empty");
    assertMessage(() -> d.withStartingAbscissae(1, Double.NaN), "finite");
  }

  private static void assertMessage(Runnable action, String word) {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, action::run);
    assertTrue(e.getMessage().contains(word), e.getMessage());
  }
}

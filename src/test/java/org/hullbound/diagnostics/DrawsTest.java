package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class DrawsTest {

  @Test
  void rejectsNullEmptyAndRaggedInputNamingTheFault() {
    assertTrue(
        assertThrows(IllegalArgumentException.class, () -> Draws.of(null))
            .getMessage()
            .contains("null"));
    assertTrue(
        assertThrows(IllegalArgumentException.class, () -> Draws.of(new double[0][]))
            .getMessage()
            .contains("at least one chain"));
    assertTrue(
        assertThrows(IllegalArgumentException.class, () -> Draws.of(new double[][] {{1}, null}))
            .getMessage()
            .contains("chain 1"));
    assertTrue(
        assertThrows(IllegalArgumentException.class, () -> Draws.of(new double[][] {{}}))
            .getMessage()
            .contains("at least one draw"));
    String ragged =
        assertThrows(
                IllegalArgumentException.class, () -> Draws.of(new double[][] {{1, 2}, {1, 2, 3}}))
            .getMessage();
    assertTrue(ragged.contains("chain 0 has 2") && ragged.contains("chain 1 has 3"), ragged);
  }

  @Test
  void copiesTheCallersArray() {
    double[][] raw = {{1, 2, 3, 4}};
    Draws draws = Draws.of(raw);
    raw[0][0] = 99;
    assertEquals(1, draws.chain(0)[0]);
    draws.chain(0)[1] = 99;
    assertEquals(2, draws.chain(0)[1]);
  }

  @Test
  void splitOfAnEvenChainGivesItsTwoHalves() {
    Draws split = Draws.of(new double[][] {{1, 2, 3, 4}, {5, 6, 7, 8}}).split();
    assertEquals(4, split.chainCount());
    assertEquals(2, split.length());
    assertArrayEquals(new double[] {1, 2}, split.chain(0));
    assertArrayEquals(new double[] {3, 4}, split.chain(1));
    assertArrayEquals(new double[] {5, 6}, split.chain(2));
    assertArrayEquals(new double[] {7, 8}, split.chain(3));
  }

  @Test
  void splitOfAnOddChainDropsTheMiddleDraw() {
    Draws draws = Draws.of(new double[][] {{1, 2, 3, 4, 5}});
    assertTrue(draws.splitDropsMiddle());
    Draws split = draws.split();
    assertArrayEquals(new double[] {1, 2}, split.chain(0));
    assertArrayEquals(new double[] {4, 5}, split.chain(1));
    assertFalse(split.splitDropsMiddle());
  }

  @Test
  void finiteDrawsAreFiniteAndChainsAreNamedByIndexInRange() {
    Draws draws = Draws.of(new double[][] {{1, 2}, {3, -Double.MAX_VALUE}});
    assertTrue(draws.isFinite());
    assertSame(draws, draws.requireFinite());
    assertThrows(IllegalArgumentException.class, () -> draws.chain(2));
    assertThrows(IllegalArgumentException.class, () -> draws.chain(-1));
  }

  @Test
  void splitOfTwoDrawsGivesTwoChainsOfOne() {
    // The smallest chain split() accepts (its documented minimum is 2 draws).
    Draws split = Draws.of(new double[][] {{1, 2}}).split();
    assertArrayEquals(new double[] {1}, split.chain(0));
    assertArrayEquals(new double[] {2}, split.chain(1));
  }

  @Test
  void requireFiniteNamesTheFirstNonFiniteDrawAndCountsThemAll() {
    Draws draws = Draws.of(new double[][] {{1, 2, 3}, {4, Double.NaN, Double.NEGATIVE_INFINITY}});
    assertFalse(draws.isFinite());
    NonFiniteDrawException e = assertThrows(NonFiniteDrawException.class, draws::requireFinite);
    assertEquals(1, e.chain());
    assertEquals(1, e.iteration());
    assertTrue(Double.isNaN(e.value()));
    assertTrue(e.getMessage().contains("2 non-finite draws"), e.getMessage());
  }

  @Test
  void constantMeansEveryDrawOfEveryChainEqual() {
    assertTrue(Draws.of(new double[][] {{2, 2}, {2, 2}}).isConstant());
    assertTrue(Draws.of(new double[][] {{0.0, -0.0}}).isConstant());
    assertFalse(Draws.of(new double[][] {{2, 2}, {2, 3}}).isConstant());
  }
}

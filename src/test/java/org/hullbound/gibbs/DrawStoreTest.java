package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

class DrawStoreTest {

  @Test
  void drawsAreCutToTheLengthEveryChainReached() {
    DrawStore store = DrawStore.create(2, 4, 1);
    for (int draw = 1; draw <= 3; draw++) {
      store.accept(0, draw, new double[] {10 + draw});
    }
    store.accept(1, 1, new double[] {21});
    store.accept(1, 2, new double[] {22});
    assertEquals(2, store.commonDraws());
    double[][] draws = store.draws(0);
    assertArrayEquals(new double[] {11, 12}, draws[0]);
    assertArrayEquals(new double[] {21, 22}, draws[1]);
  }

  @Test
  void chainsThatNeverStartedAreLeftOutInsteadOfEmptyingTheRest() {
    // Four chains on two threads, stopped while the first two ran: chains 3 and 4 kept nothing.
    DrawStore store = DrawStore.create(4, 100, 2);
    for (int draw = 1; draw <= 50; draw++) {
      store.accept(0, draw, new double[] {draw, -draw});
      store.accept(1, draw, new double[] {draw + 0.5, -draw});
    }
    store.accept(0, 51, new double[] {51, -51});
    assertArrayEquals(new int[] {0, 1}, store.chainsWithDraws());
    assertEquals(50, store.commonDraws());
    double[][] draws = store.draws(1);
    assertEquals(2, draws.length);
    assertEquals(50, draws[0].length);
    assertEquals(-50, draws[1][49]);
  }

  @Test
  void aStoreWithNoDrawsHasNoChainsAndNoCommonLength() {
    DrawStore store = DrawStore.create(3, 10, 1);
    assertEquals(0, store.commonDraws());
    assertEquals(0, store.chainsWithDraws().length);
    assertEquals(0, store.draws(0).length);
  }
}

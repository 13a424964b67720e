package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;

/**
 * Each unknown's dependents, as binding gathers them term by term: the increasing indexes of the
 * terms that read it but its own (issue 14: the unknowns every row reads are gathered as a range
 * and share one array). The reference is the definition, worked out here by a plain filter.
 */
class DependentsTest {
  private static final int TERMS = 3000;

  /** Term {@code t} of the test: reads slots 0 and 1; 2 on even t; 3 below 1500 and last. */
  private static List<Integer> reads(int t) {
    List<Integer> slots = new ArrayList<>(List.of(0, 1));
    if (t % 2 == 0) {
      slots.add(2);
    }
    if (t < TERMS / 2 || t == TERMS - 1) {
      slots.add(3);
    }
    return slots;
  }

  private static Term term(List<Integer> slots, int owner) {
    Formula sum = Formula.constant(0);
    List<Formula> arguments = new ArrayList<>();
    for (int s : slots) {
      arguments.add(new Formula.Slot(s));
    }
    return new Term(null, 0, null, null, sum, arguments, null, owner, null);
  }

  @Test
  void listsAreTheTermsReadingEachSlotAndEqualLongListsAreOneArray() {
    Dependents dependents = new Dependents(5);
    for (int t = 0; t < TERMS; t++) {
      dependents.add(t, term(reads(t), -1));
    }
    // slot 4's own term reads it: not a dependent of its own slot
    dependents.add(TERMS, term(List.of(4, 0), 4));
    int[][] lists = dependents.lists();
    for (int s = 0; s < 5; s++) {
      int slot = s;
      int[] expected = IntStream.rangeClosed(0, TERMS)
          .filter(t -> t < TERMS ? reads(t).contains(slot) : slot == 0)
          .toArray();
      assertArrayEquals(expected, lists[s], "slot " + s);
    }
    assertEquals(TERMS + 1, lists[0].length);
    assertEquals(0, lists[4].length);
    // slot 0 and 1 differ in the last term only above; two slots every row reads share one array
    Dependents same = new Dependents(2);
    for (int t = 0; t < TERMS; t++) {
      same.add(t, term(List.of(0, 1), -1));
    }
    int[][] shared = same.lists();
    assertArrayEquals(IntStream.range(0, TERMS).toArray(), shared[0]);
    assertTrue(shared[0] == shared[1], "equal lists of every row are one array");
  }
}

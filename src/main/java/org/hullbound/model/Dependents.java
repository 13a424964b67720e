package org.hullbound.model;

import java.util.Arrays;
import java.util.LinkedHashSet;
import java.util.Set;

/**
 * Gathers, while binding makes each term once, which terms read each unknown other than as its
 * own term: an unknown's dependents, the rest of its Markov blanket.
 *
 * <p>Terms are added in order and each adds itself once per slot it reads, so each slot's list
 * is increasing without repeats; plain {@code int} arrays, as a set of boxed indexes per slot
 * cost about 60 bytes per term and slot on a model of millions of rows.
 */
final class Dependents {
  private final int[][] lists;
  private final int[] sizes;
  private final Set<Integer> read = new LinkedHashSet<>();

  Dependents(int slots) {
    lists = new int[slots][];
    sizes = new int[slots];
    Arrays.fill(lists, new int[0]);
  }

  /** Adds term {@code index} to the list of every slot it reads but its owner. */
  void add(int index, Term term) {
    read.clear();
    term.value().collectSlots(read);
    for (Formula a : term.arguments()) {
      a.collectSlots(read);
    }
    for (int s : read) {
      if (s != term.owner()) {
        if (sizes[s] == lists[s].length) {
          lists[s] = Arrays.copyOf(lists[s], Math.max(4, 2 * lists[s].length));
        }
        lists[s][sizes[s]++] = index;
      }
    }
  }

  /** Each slot's dependent terms, in increasing order, trimmed to size; call once. */
  int[][] lists() {
    int[][] trimmed = new int[lists.length][];
    for (int s = 0; s < lists.length; s++) {
      trimmed[s] = Arrays.copyOf(lists[s], sizes[s]);
      lists[s] = null;
    }
    return trimmed;
  }
}

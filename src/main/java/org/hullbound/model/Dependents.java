package org.hullbound.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Gathers, while binding makes each term once, which terms read each unknown other than as its
 * own term: an unknown's dependents, the rest of its Markov blanket.
 *
 * <p>Terms are added in order and each adds itself once per slot it reads, so each slot's list
 * is increasing without repeats; plain {@code int} arrays, as a set of boxed indexes per slot
 * cost about 60 bytes per term and slot on a model of millions of rows.
 *
 * <p>A slot read by consecutive terms only (clinics' intercept and slope: every row of the
 * outcome's statement) is held as its first term and count while it is gathered, and slots whose
 * lists come out equal share one array (issue 14: the unknowns every row reads would otherwise
 * hold 4 bytes a row each, twice over while their arrays grow).
 */
final class Dependents {
  /** Lists shorter than this are not compared with others: they cost little anyway. */
  private static final int SHARED_FROM = 1024;
  /** Per slot its list, or {@code null} while it is {@code sizes[s]} terms from {@code first[s]}. */
  private final int[][] lists;
  private final int[] first;
  private final int[] sizes;
  private final Set<Integer> read = new LinkedHashSet<>();
  /** Per slot, 1 + the last term added to its list by {@link #add(int, int[], int, int)}. */
  private final int[] lastAdded;

  Dependents(int slots) {
    lists = new int[slots][];
    first = new int[slots];
    sizes = new int[slots];
    lastAdded = new int[slots];
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
        append(s, index);
      }
    }
  }

  /**
   * Adds term {@code index}, whose arguments read {@code slots[0 .. count)} (with repeats) and
   * whose value is its owner's slot or data, to the list of every slot it reads but {@code
   * owner}: the same lists as {@link #add(int, Term)} makes of its term, with no term made.
   */
  void add(int index, int[] slots, int count, int owner) {
    for (int i = 0; i < count; i++) {
      int s = slots[i];
      // a slot read twice is listed once
      if (s != owner && lastAdded[s] != index + 1) {
        lastAdded[s] = index + 1;
        append(s, index);
      }
    }
  }

  private void append(int s, int index) {
    if (lists[s] == null) {
      if (sizes[s] == 0 || first[s] + sizes[s] == index) {
        first[s] = sizes[s] == 0 ? index : first[s];
        sizes[s]++;
        return;
      }
      lists[s] = range(first[s], sizes[s], Math.max(4, 2 * sizes[s]));
    }
    if (sizes[s] == lists[s].length) {
      lists[s] = Arrays.copyOf(lists[s], Math.max(4, 2 * lists[s].length));
    }
    lists[s][sizes[s]++] = index;
  }

  private static int[] range(int from, int count, int capacity) {
    int[] list = new int[capacity];
    for (int k = 0; k < count; k++) {
      list[k] = from + k;
    }
    return list;
  }

  /**
   * Each slot's dependent terms, in increasing order, trimmed to size; call once. Long lists equal
   * to an earlier slot's are that array (read only).
   */
  int[][] lists() {
    int[][] trimmed = new int[lists.length][];
    Map<Long, List<int[]>> byHash = new HashMap<>();
    for (int s = 0; s < lists.length; s++) {
      int[] list;
      if (lists[s] == null) {
        // a range: the same range made before is found without making this one
        list = sizes[s] >= SHARED_FROM ? sharedRange(byHash, first[s], sizes[s]) : null;
        list = list != null ? list : range(first[s], sizes[s], sizes[s]);
      } else {
        list = Arrays.copyOf(lists[s], sizes[s]);
      }
      lists[s] = null;
      trimmed[s] = list.length >= SHARED_FROM ? shared(byHash, list) : list;
    }
    return trimmed;
  }

  /** {@code list}, or an equal list met before ({@code byHash} by length and hash). */
  private static int[] shared(Map<Long, List<int[]>> byHash, int[] list) {
    List<int[]> same =
        byHash.computeIfAbsent(31L * Arrays.hashCode(list) + list.length, h -> new ArrayList<>());
    for (int[] other : same) {
      if (Arrays.equals(other, list)) {
        return other;
      }
    }
    same.add(list);
    return list;
  }

  /** A list met before that holds {@code count} terms from {@code from}, or {@code null}. */
  private static int[] sharedRange(Map<Long, List<int[]>> byHash, int from, int count) {
    for (List<int[]> lists : byHash.values()) {
      for (int[] other : lists) {
        if (other.length == count && other[0] == from && other[count - 1] == from + count - 1) {
          return other;
        }
      }
    }
    return null;
  }
}

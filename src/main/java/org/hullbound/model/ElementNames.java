package org.hullbound.model;

import java.util.List;

/**
 * The elements of one declared name and their labels: {@code name[i, j]} from an element's
 * row-major offset, or the bare name for a scalar.
 *
 * <p>One per name, shared by every term and constant about its elements, so that a label is made
 * only when a message shows it.
 */
record ElementNames(String name, List<IndexSet> indexSets) {
  ElementNames {
    indexSets = List.copyOf(indexSets);
  }

  /** The index values of element {@code offset}. */
  int[] index(int offset) {
    return index(indexSets, offset);
  }

  /** {@code name[i, j]}, or the bare name for a scalar. */
  String label(int offset) {
    return label(name, indexSets, offset);
  }

  /** The index values of element {@code offset} of a name indexed by {@code indexSets}. */
  static int[] index(List<IndexSet> indexSets, int offset) {
    int[] index = new int[indexSets.size()];
    for (int i = index.length - 1; i >= 0; i--) {
      IndexSet set = indexSets.get(i);
      index[i] = set.lower() + offset % set.size();
      offset /= set.size();
    }
    return index;
  }

  /** {@code name[i, j]} for element {@code offset}, or the bare name for a scalar. */
  static String label(String name, List<IndexSet> indexSets, int offset) {
    if (indexSets.isEmpty()) {
      return name;
    }
    StringBuilder text = new StringBuilder(name).append('[');
    int[] index = index(indexSets, offset);
    for (int i = 0; i < index.length; i++) {
      text.append(i == 0 ? "" : ", ").append(index[i]);
    }
    return text.append(']').toString();
  }
}

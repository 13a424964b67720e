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

  /**
   * Each of {@code indexSets} bound by name to its value in {@code index}, as lowering reads an
   * element's environment. One set, the common case of a term per data row, makes a one-entry map
   * and no hash table (lowering makes an environment per row, again whenever a row's term is made
   * again); more keep a {@link java.util.HashMap}, whose order messages list.
   */
  static java.util.Map<String, Integer> environment(List<IndexSet> indexSets, int[] index) {
    if (index.length == 0) {
      return java.util.Map.of();
    }
    if (index.length == 1) {
      return java.util.Map.of(indexSets.get(0).name(), index[0]);
    }
    java.util.Map<String, Integer> env = new java.util.HashMap<>();
    for (int i = 0; i < index.length; i++) {
      env.put(indexSets.get(i).name(), index[i]);
    }
    return env;
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

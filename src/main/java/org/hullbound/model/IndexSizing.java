package org.hullbound.model;

import static org.hullbound.model.BindingScope.setList;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.hullbound.lang.Expression;
import org.hullbound.lang.Identifier;
import org.hullbound.lang.Statement;

/**
 * The index-set phase of binding: sets with written bounds (which may read scalar data, so they
 * come after the scalars), sets sized by inline vectors, and then every node's sets and size,
 * refused above 2^31 - 1 elements. Sets sized by the rows of a data file are sized by
 * {@link DataBinding#readTableHeaders}.
 */
final class IndexSizing {
  private final BindingScope scope;
  private final ModelLowering lowering;

  IndexSizing(BindingScope scope, ModelLowering lowering) {
    this.scope = scope;
    this.lowering = lowering;
  }

  /** Sizes the index sets declared with bounds ({@code index t = 1 .. n}). */
  void sizeDeclaredSets() {
    for (Statement.Index index : scope.indexStatements.values()) {
      if (index.sizedFromData()) {
        continue;
      }
      int lower = wholeBound(index.lower(), "lower");
      int upper = wholeBound(index.upper(), "upper");
      if (upper < lower) {
        throw scope.error(
            index.upper().position(),
            "index set '" + index.name().text() + "' is empty: " + lower + " .. " + upper,
            "the upper bound must be at least the lower bound");
      }
      scope.sets.put(
          index.name().text(), new IndexSet(index.name().text(), lower, upper, "declared"));
    }
  }

  private int wholeBound(Expression e, String which) {
    Formula f = lowering.resolve(e, Map.of());
    if (!(f instanceof Formula.Constant c)) {
      throw scope.error(
          e.position(), "the " + which + " bound of an index set must be a known number", null);
    }
    double v = c.value();
    if (!(v == Math.rint(v)) || Math.abs(v) > 1e9) {
      throw scope.error(
          e.position(),
          "the " + which + " bound of an index set must be a whole number, got " + v,
          null);
    }
    return (int) v;
  }

  /** Sizes a set that only inline vector data runs over from that vector's length. */
  void sizeSetsFromInlineVectors() {
    for (Node node : scope.nodes.values()) {
      if (node.kind != Node.Kind.DATA || node.inline == null) {
        continue;
      }
      List<Identifier> nodeSets = node.target.indexSets();
      if (nodeSets.size() == 1 && !scope.sets.containsKey(nodeSets.get(0).text())) {
        String set = nodeSets.get(0).text();
        scope.sets.put(
            set, new IndexSet(set, 1, node.inline.size(), "inline data of " + node.name()));
      }
    }
  }

  /** Refuses a set still unsized, then gives every node its index sets and element count. */
  void sizeNodes() {
    for (Map.Entry<String, Statement.Index> entry : scope.indexStatements.entrySet()) {
      if (!scope.sets.containsKey(entry.getKey())) {
        throw scope.error(
            entry.getValue().name().position(),
            "index set '" + entry.getKey() + "' has no bounds and no data runs over it",
            "write index " + entry.getKey() + " = 1 .. N, or give data declared over it");
      }
    }
    for (Node node : scope.nodes.values()) {
      node.indexSets = new ArrayList<>();
      long size = 1;
      List<String> factors = new ArrayList<>();
      for (Identifier set : node.target.indexSets()) {
        IndexSet bound = scope.sets.get(set.text());
        node.indexSets.add(bound);
        factors.add(Integer.toString(bound.size()));
        // Both factors are below 2^31, so the product of the running size (capped at 2^31 below)
        // and the next one fits in a long.
        size = Math.min(size * bound.size(), Integer.MAX_VALUE + 1L);
      }
      if (size > Integer.MAX_VALUE) {
        throw scope.error(
            node.target.position(),
            "'" + node.name() + "' runs over " + setList(node.target.indexSets())
                + " with " + String.join(" x ", factors) + " elements, more than the "
                + Integer.MAX_VALUE + " one quantity can hold",
            "use smaller index sets");
      }
      node.size = (int) size;
    }
  }

  /** The index sets in declaration order. */
  List<IndexSet> ordered() {
    List<IndexSet> orderedSets = new ArrayList<>();
    for (String set : scope.indexStatements.keySet()) {
      orderedSets.add(scope.sets.get(set));
    }
    return orderedSets;
  }
}

package org.hullbound.lang;

import java.util.List;

/**
 * The left-hand side of a declaration: a name and the index sets it runs over, as in
 * {@code effect[bench]} or {@code X[obs, coef]}; a scalar has no index sets.
 */
public record Declarator(Identifier name, List<Identifier> indexSets) {
  public Declarator {
    indexSets = List.copyOf(indexSets);
  }

  public SourcePosition position() {
    return name.position();
  }
}

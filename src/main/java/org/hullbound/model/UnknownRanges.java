package org.hullbound.model;

/**
 * The whole numbers each param element can take, for an index that reads it ({@link
 * UnknownIndex}): its own term's support when that is a finite set of whole numbers fixed by the
 * data (bernoulli, binomial with known trials, categorical, whole-uniform with known bounds, or a
 * discrete family cut by {@code within lo .. hi}). Asked for after the slots are numbered, while
 * terms and lets are lowered.
 */
final class UnknownRanges {
  private final BindingScope scope;
  private final TermBinding terms;

  UnknownRanges(BindingScope scope, TermBinding terms) {
    this.scope = scope;
    this.terms = terms;
  }

  /**
   * The range of the unknown in slot {@code slot}, or {@code null} (a continuous param, a missing
   * observation, an unbounded count, bounds that read unknowns).
   */
  UnknownIndex.Range of(int slot) {
    Element element = find(slot);
    if (element == null || element.node().kind != Node.Kind.PARAM
        || !element.node().parametrisation.support().discrete()) {
      return null;
    }
    Formula[] support = BoundModel.support(terms.term(element.node(), element.element()));
    if (support[0] instanceof Formula.Constant lo && support[1] instanceof Formula.Constant hi
        && Double.isFinite(lo.value()) && Double.isFinite(hi.value())) {
      return new UnknownIndex.Range((long) Math.ceil(lo.value()), (long) Math.floor(hi.value()));
    }
    return null;
  }

  /** The label of the unknown in slot {@code slot}, for a message. */
  String label(int slot) {
    Element element = find(slot);
    return element == null ? "slot " + slot : element.node().label(element.element());
  }

  private record Element(Node node, int element) {}

  /** The node and element of the unknown in slot {@code slot}, or {@code null}. */
  private Element find(int slot) {
    for (Node node : scope.nodes.values()) {
      if (node.slots == null) {
        continue;
      }
      for (int e = 0; e < node.size; e++) {
        if (node.slots[e] == slot) {
          return new Element(node, e);
        }
      }
    }
    return null;
  }
}

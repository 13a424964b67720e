package org.hullbound.model;

import java.util.List;
import org.hullbound.lang.Declarator;
import org.hullbound.lang.Distribution;
import org.hullbound.lang.Expression;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.Statement;
import org.hullbound.model.family.Parametrisation;

/**
 * One declared name of the model while it is being bound: a {@code data}, {@code param} or
 * {@code let} node, its index sets, and (for data) its values element by element.
 *
 * <p>Mutable only inside the binder's phases ({@link Binder}); nothing outside them sees it.
 */
final class Node {
  enum Kind {
    DATA,
    PARAM,
    LET
  }

  final Kind kind;
  final Declarator target;
  final Statement statement;
  /** The prior of a param or the likelihood of modelled data; {@code null} otherwise. */
  final Distribution distribution;
  /** The value of a let; {@code null} otherwise. */
  final Expression letValue;
  /** Inline data values; {@code null} when read from a file. */
  final List<Statement.InlineValue> inline;

  Parametrisation parametrisation;
  /** Argument expressions in the parametrisation's order. */
  Expression[] argumentExpressions;
  List<IndexSet> indexSets;
  int size;
  double[] values;
  boolean[] present;
  boolean[] missing;
  /** Positions of inline values; {@code null} for data read from files (see DataBinding.cellOf). */
  SourcePosition[] cells;
  int[] slots;
  String source;
  private ElementNames names;

  Node(
      Kind kind,
      Declarator target,
      Statement statement,
      Distribution distribution,
      Expression letValue,
      List<Statement.InlineValue> inline) {
    this.kind = kind;
    this.target = target;
    this.statement = statement;
    this.distribution = distribution;
    this.letValue = letValue;
    this.inline = inline;
  }

  String name() {
    return target.name().text();
  }

  boolean modelled() {
    return kind == Kind.DATA && distribution != null;
  }

  /** The element's offset from its index values (row-major). */
  int offset(int[] index) {
    int offset = 0;
    for (int i = 0; i < index.length; i++) {
      IndexSet set = indexSets.get(i);
      offset = offset * set.size() + (index[i] - set.lower());
    }
    return offset;
  }

  /** The index values of element {@code offset}. */
  int[] index(int offset) {
    return ElementNames.index(indexSets, offset);
  }

  /** {@code name[i, j]}, or the bare name for a scalar. */
  String label(int offset) {
    return ElementNames.label(name(), indexSets, offset);
  }

  /** The names of this node's elements, made once its index sets are final (at the terms). */
  ElementNames names() {
    if (names == null) {
      names = new ElementNames(name(), indexSets);
    }
    return names;
  }

  String kindWord() {
    return kind.name().toLowerCase(java.util.Locale.ROOT);
  }

  SourcePosition position() {
    return target.position();
  }
}

package org.hullbound.model;

import static org.hullbound.model.BindingScope.setList;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import org.hullbound.lang.Expression;
import org.hullbound.lang.NameSuggestion;
import org.hullbound.lang.SourcePosition;

/**
 * The names and sums of a model file lowered to formulas of one element: an index set's bound
 * value, a data element's constant (which finds its cell for messages), an unknown's slot, a
 * let's formula (cached per element) and a sum expanded over its set. Numbers, operators and
 * functions are {@link ExpressionLowering}'s, shared with {@link UnivariateExpression}.
 *
 * <p>While a {@code check} is bound ({@link #replicating}), the checked data name's elements are
 * slots after every unknown, so that one formula serves the observed and the replicated data.
 */
final class ModelLowering implements ExpressionLowering.Leaves {
  private final BindingScope scope;
  private final DataBinding data;
  private final ExpressionLowering lowering;
  private final Map<Node, Formula[]> letCache = new HashMap<>();
  private Formula.Slot[] slotFormulas = new Formula.Slot[16];
  /** While a check is resolved: its data name, whose elements are slots from replicatedBase. */
  private Node replicated;
  private int replicatedBase;
  /** The ranges of whole-valued unknowns, once slots are numbered: indexes may then read them. */
  private UnknownRanges unknownRanges;
  /** Lets with more elements than this are not cached once binding is over ({@link #bound}). */
  private int largestCachedLet = Integer.MAX_VALUE;
  /** How many let elements were lowered from the let's syntax ({@link #letLowerings}). */
  private long letLowerings;

  /** A let of more elements than this is one per data row, whose formulas are not held. */
  static final int LARGEST_HELD_LET = 4096;

  ModelLowering(BindingScope scope, DataBinding data) {
    this.scope = scope;
    this.data = data;
    this.lowering = new ExpressionLowering(this, scope::error);
  }

  /**
   * From now on an index may read whole-valued unknowns with a finite support ({@link
   * UnknownIndex}), their ranges taken from {@code ranges}.
   */
  void readUnknownIndexes(UnknownRanges ranges) {
    this.unknownRanges = ranges;
  }

  /**
   * Binding is over: terms are made again from here on ({@link TermTable}), so the formulas of
   * lets with more than {@link #LARGEST_HELD_LET} elements (a let per data row) are dropped and
   * no longer cached, as holding them would hold a formula tree per row.
   */
  void bound() {
    largestCachedLet = LARGEST_HELD_LET;
    letCache.keySet().removeIf(node -> node.size > largestCachedLet);
  }

  /** Resolves {@code e} with the index sets in {@code env} bound to the given elements. */
  Formula resolve(Expression e, Map<String, Integer> env) {
    return lowering.lower(e, env);
  }

  /**
   * Resolves {@code e} with the elements of data {@code checked} as slots from {@code base}, not
   * its values (lets are then not cached).
   */
  Formula replicating(Node checked, int base, Expression e) {
    replicated = checked;
    replicatedBase = base;
    try {
      return resolve(e, Map.of());
    } finally {
      replicated = null;
    }
  }

  @Override
  public boolean sums() {
    return true;
  }

  @Override
  public Formula sum(Expression.Sum sum, Map<String, Integer> env) {
    String setName = sum.indexSet().text();
    IndexSet set = scope.sets.get(setName);
    if (set == null) {
      throw scope.error(
          sum.indexSet().position(),
          "unknown index set '" + setName + "' in " + sum.reduction().word(),
          NameSuggestion.hint(setName, scope.indexStatements.keySet()));
    }
    if (env.containsKey(setName)) {
      throw scope.error(
          sum.indexSet().position(),
          sum.reduction().word() + " over '" + setName + "' inside an expression that already runs over '" + setName
              + "'",
          null);
    }
    List<Formula> terms = new ArrayList<>();
    Map<String, Integer> inner = new HashMap<>(env);
    for (int v = set.lower(); v <= set.upper(); v++) {
      inner.put(setName, v);
      terms.add(lowering.lower(sum.body(), inner));
    }
    if (terms.isEmpty() && sum.reduction() != Expression.Reduction.SUM) {
      throw scope.error(
          sum.position(),
          "the index set '" + setName + "' is empty, so " + sum.reduction().word() + "("
              + setName + ": ...) has no value",
          null);
    }
    return switch (sum.reduction()) {
      case SUM -> Formulas.apply(Op.ADD, terms);
      case MAX -> pairwise(Op.MAX, terms, 0, terms.size());
      case MIN -> pairwise(Op.MIN, terms, 0, terms.size());
    };
  }

  /**
   * {@code op} folded over {@code terms[from, to)} as a balanced tree: a chain over 100,000 rows
   * would be 100,000 evaluators deep, a balanced tree is 17.
   */
  static Formula pairwise(Op op, List<Formula> terms, int from, int to) {
    if (to - from == 1) {
      return terms.get(from);
    }
    int middle = (from + to) >>> 1;
    return Formulas.apply(
        op, List.of(pairwise(op, terms, from, middle), pairwise(op, terms, middle, to)));
  }

  @Override
  public Formula name(Expression.Name reference, Map<String, Integer> env) {
    String name = reference.name().text();
    if (scope.indexStatements.containsKey(name)) {
      if (!reference.indexes().isEmpty()) {
        throw scope.error(reference.position(), "index set '" + name + "' cannot be indexed", null);
      }
      Integer value = env.get(name);
      if (value == null) {
        throw scope.error(
            reference.position(),
            "index set '" + name + "' is not bound here; only "
                + (env.isEmpty() ? "the sets of the statement" : env.keySet().toString())
                + " can be used as values",
            null);
      }
      return Formula.constant(value);
    }
    Node node = scope.nodes.get(name);
    if (node == null) {
      Set<String> valid = new TreeSet<>(scope.nodes.keySet());
      valid.addAll(env.keySet());
      throw scope.error(
          reference.position(),
          "unknown name '" + name + "'",
          NameSuggestion.hint(name, valid));
    }
    List<IndexSet> nodeSets = node.indexSets;
    if (nodeSets == null && node.kind == Node.Kind.DATA && node.target.indexSets().isEmpty()) {
      throw data.noScalarValue(node);
    }
    if (nodeSets == null) {
      // Only inline scalars are bound while index bounds are evaluated.
      throw scope.error(
          reference.position(),
          "'" + name + "' cannot be used here: index bounds may use numbers and scalar data"
              + " only",
          null);
    }
    if (reference.indexes().size() != nodeSets.size()) {
      throw scope.error(
          reference.position(),
          "'" + name + "' runs over " + setList(node.target.indexSets()) + " and needs "
              + nodeSets.size() + " index" + (nodeSets.size() == 1 ? "" : "es") + ", got "
              + reference.indexes().size(),
          nodeSets.isEmpty() ? "write " + name + " without brackets"
              : "write " + name + setList(node.target.indexSets()));
    }
    int[] index = new int[nodeSets.size()];
    List<Integer> unknownAt = new ArrayList<>();
    List<Formula> unknownIndex = new ArrayList<>();
    List<UnknownIndex.Range> unknownRange = new ArrayList<>();
    for (int i = 0; i < index.length; i++) {
      Expression indexExpression = reference.indexes().get(i);
      IndexSet expected = nodeSets.get(i);
      if (indexExpression instanceof Expression.Name bare
          && bare.indexes().isEmpty()
          && scope.indexStatements.containsKey(bare.name().text())
          && !bare.name().text().equals(expected.name())) {
        throw scope.error(
            bare.position(),
            "'" + name + "' is indexed by '" + expected.name() + "' here, got index set '"
                + bare.name().text() + "'",
            "map one set to the other with integer data, as in " + name + "["
                + expected.name() + "_of[" + bare.name().text() + "]]");
      }
      Formula resolved = resolve(indexExpression, env);
      if (!(resolved instanceof Formula.Constant c)) {
        if (unknownRanges == null) {
          throw scope.error(
              indexExpression.position(),
              "the index of '" + name + "' depends on an unknown; indexes must be known data",
              null);
        }
        unknownAt.add(i);
        unknownIndex.add(resolved);
        unknownRange.add(unknownIndexRange(resolved, indexExpression, expected, name));
        index[i] = expected.lower();
        continue;
      }
      double v = c.value();
      if (v != Math.rint(v)) {
        throw scope.error(
            blame(c, indexExpression),
            "index " + v + " of '" + name + "' is not a whole number",
            "'" + name + "' is indexed by '" + expected.name() + "' (" + expected.range() + ")");
      }
      if (!expected.contains(v)) {
        throw scope.error(
            blame(c, indexExpression),
            "index value " + (long) v + " is outside index set '" + expected.name() + "' ("
                + expected.range() + "), which indexes '" + name + "'",
            null);
      }
      index[i] = (int) v;
    }
    if (!unknownAt.isEmpty()) {
      UnknownIndex.Combined combined = UnknownIndex.combine(unknownIndex, unknownRange);
      if (combined == null) {
        throw scope.error(
            reference.indexes().get(unknownAt.get(0)).position(),
            "the indexes of '" + name + "' that read unknowns can take too many combinations"
                + " together",
            "work the element out in fewer indexes that read unknowns");
      }
      return UnknownIndex.lower(combined.index(), combined.range(), code -> {
        int[] element = index.clone();
        long[] values = combined.decode(code);
        for (int j = 0; j < values.length; j++) {
          element[unknownAt.get(j)] = (int) values[j];
        }
        return element(node, element, reference);
      });
    }
    return element(node, index, reference);
  }

  /**
   * The range an index that reads unknowns can take ({@link UnknownIndex}), proved inside the
   * indexed set, or a positioned error at the index.
   */
  private UnknownIndex.Range unknownIndexRange(
      Formula index, Expression indexExpression, IndexSet expected, String name) {
    UnknownIndex.Proof proof =
        UnknownIndex.range(index, unknownRanges::of, unknownRanges::label);
    if (proof.problem() != null) {
      throw scope.error(
          indexExpression.position(),
          "the index of '" + name + "' reads an unknown, but " + proof.problem(),
          "an unknown index must be a whole-valued param with a finite support, as in "
              + name + "[group_of[i]] with param group_of[i] ~ categorical(p = w)");
    }
    UnknownIndex.Range range = proof.range();
    if (range.lower() < expected.lower() || range.upper() > expected.upper()) {
      throw scope.error(
          indexExpression.position(),
          "the index of '" + name + "' reads an unknown and can take " + range.lower() + " .. "
              + range.upper() + ", outside index set '" + expected.name() + "' ("
              + expected.range() + ")",
          "give the unknown a support inside " + expected.range()
              + ", as in categorical(p = w) with one weight per element");
    }
    return range;
  }

  /** The formula of element {@code index} of {@code node}, as {@code reference} reads it. */
  private Formula element(Node node, int[] index, Expression.Name reference) {
    String name = node.name();
    List<IndexSet> nodeSets = node.indexSets;
    int offset = node.offset(index);
    switch (node.kind) {
      case DATA:
        if (node == replicated) {
          return slot(replicatedBase + offset);
        }
        if (node.missing[offset] && node.slots == null) {
          throw scope.error(reference.position(), "'" + name + "' is missing and cannot be used"
              + " here", null);
        }
        if (node.missing[offset]) {
          return slot(node.slots[offset]);
        }
        return new Formula.Constant(node.values[offset], data.cells(node), offset);
      case PARAM:
        return slot(node.slots[offset]);
      default:
        return letElement(node, index);
    }
  }

  /** The formula of element {@code index} of let {@code node}, cached where it is cached. */
  Formula letElement(Node node, int[] index) {
    Map<String, Integer> letEnv = ElementNames.environment(node.indexSets, index);
    if (!cachesLet(node)) {
      // Not cached: inside a check the checked name's elements are slots, not its data; a
      // let per data row once binding is over.
      letLowerings++;
      return resolve(node.letValue, letEnv);
    }
    int offset = node.offset(index);
    Formula[] cache = letCache.computeIfAbsent(node, k -> new Formula[k.size]);
    if (cache[offset] == null) {
      letLowerings++;
      cache[offset] = resolve(node.letValue, letEnv);
    }
    return cache[offset];
  }

  /** How many let elements were lowered from the let's syntax (a regression count). */
  long letLowerings() {
    return letLowerings;
  }

  /** Whether the elements of let {@code node} are cached now (see {@link #bound}). */
  boolean cachesLet(Node node) {
    return replicated == null && node.size <= largestCachedLet;
  }

  /** True while a check is resolved, when a data name's elements may be slots ({@link #replicating}). */
  boolean replicating() {
    return replicated != null;
  }

  /**
   * The data cell an index value came from, or the index expression: worked out only for a
   * message, as finding a cell's line costs more than resolving the index (once per row).
   */
  private static SourcePosition blame(Formula.Constant index, Expression indexExpression) {
    SourcePosition origin = index.origin();
    return origin != null ? origin : indexExpression.position();
  }

  /**
   * The one {@link Formula.Slot} of unknown {@code index}: a term per data row refers to the same
   * few unknowns, and a copy per reference would cost 16 bytes each.
   */
  Formula.Slot slot(int index) {
    if (index >= slotFormulas.length) {
      slotFormulas = Arrays.copyOf(slotFormulas, Math.max(index + 1, 2 * slotFormulas.length));
    }
    if (slotFormulas[index] == null) {
      slotFormulas[index] = new Formula.Slot(index);
    }
    return slotFormulas[index];
  }
}

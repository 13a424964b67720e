package org.hullbound.model;

import static org.hullbound.model.BindingScope.columnBase;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.function.Predicate;
import org.hullbound.lang.Declarator;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.Statement;

/**
 * Turns a parsed model file and its data tables into element-level {@link Term}s over numbered
 * unknowns, checking every semantic rule of the model language on the way.
 *
 * <p>Binding runs in phases, each a type of its own over the shared {@link BindingScope}:
 * {@link Declarations} (names, families, cycles), {@link DataBinding} (scalars, file headers,
 * values, cells) and {@link IndexSizing} (index sets and node sizes), then the unknowns' slots
 * here, {@link LetBinding} (derived quantities), {@link TermBinding} (one term per element of a
 * line with a distribution) and {@link CheckBinding}. Every expression is lowered by
 * {@link ModelLowering}.
 *
 * <p>Each check throws its own {@link ModelException} naming the file, line and column (for data
 * files: the file, the line of the row and the number of the cell) and what was expected.
 */
final class Binder {

  /** What binding produces, consumed by {@link BoundModel}. */
  record Result(
      String name,
      String fileName,
      List<IndexSet> indexSets,
      List<Term> terms,
      int[][] dependents,
      List<String> labels,
      List<String> nodeOfSlot,
      List<Boolean> imputed,
      int[] ownTerm,
      List<DataSummary> data,
      Map<String, Integer> nodeCounts,
      List<CheckFormula> checks,
      DerivedQuantities derived) {}

  /**
   * A {@code check} statement bound: the modelled data name it reads and its value, in which that
   * name's element {@code e} is slot {@code base + e} (after every unknown), so that one compiled
   * value serves the observed and the replicated data alike.
   */
  record CheckFormula(String name, String node, int base, Formula value, SourcePosition position) {}

  private Binder() {}

  static Result bind(ModelFile model, List<DataTable> tables, EmptyCells emptyCells) {
    BindingScope scope = Declarations.read(model);
    DataBinding data = new DataBinding(scope, tables, emptyCells);
    ModelLowering lowering = new ModelLowering(scope, data);
    IndexSizing sizing = new IndexSizing(scope, lowering);
    data.bindInlineScalars();
    data.bindFileScalars();
    sizing.sizeDeclaredSets();
    data.readTableHeaders();
    sizing.sizeSetsFromInlineVectors();
    sizing.sizeNodes();
    data.bindDataValues();
    TermBinding terms = new TermBinding(scope, data, lowering);
    Slots slots = allocateSlots(scope, terms);
    lowering.readUnknownIndexes(new UnknownRanges(scope, terms));
    // Lets are checked even when nothing uses them, so a fault in one never hides.
    DerivedQuantities derived = new LetBinding(scope, data, lowering).bind();
    List<Node> withTerms = new ArrayList<>();
    Dependents dependents = new Dependents(slots.labels().size());
    StatementFormula.RowCheck rowCheck = new StatementFormula.RowCheck();
    int termCount = 0;
    int[] ownTerm = new int[slots.labels().size()];
    Arrays.fill(ownTerm, -1);
    Map<String, Integer> counts = new LinkedHashMap<>();
    for (Node.Kind kind : Node.Kind.values()) {
      counts.put(kind.name().toLowerCase(Locale.ROOT), 0);
    }
    for (Node node : scope.nodes.values()) {
      counts.merge(node.kindWord(), 1, Integer::sum);
      if (node.distribution == null) {
        continue;
      }
      withTerms.add(node);
      // Every row is checked here once, from its statement's formula in numbers where it has
      // one (no term made; a row with a fault is lowered, which names it), else by making its
      // term and dropping it: the model makes a data row's term again when asked (TermTable),
      // as holding one per row would not scale.
      StatementFormula statement = terms.checkingStatement(node);
      for (int e = 0; e < node.size; e++) {
        if (terms.checkedFromStatement(node, statement, e, rowCheck)) {
          int owner = node.slots[e];
          if (owner >= 0) {
            ownTerm[owner] = termCount;
          }
          dependents.add(termCount, rowCheck.slots(), rowCheck.slotCount(), owner);
        } else {
          Term term = terms.term(node, e);
          if (term.owner() >= 0) {
            ownTerm[term.owner()] = termCount;
          }
          dependents.add(termCount, term);
        }
        termCount++;
      }
    }
    // Checks are bound while lets per row are still cached: a check may read every row's let.
    List<CheckFormula> checks = new CheckBinding(scope, lowering).bind(slots.labels().size());
    lowering.bound();
    data.bound();
    return new Result(
        scope.modelName,
        scope.source.fileName(),
        sizing.ordered(),
        TermTable.of(withTerms, terms),
        dependents.lists(),
        slots.labels(),
        slots.nodeOfSlot(),
        slots.imputed(),
        ownTerm,
        data.summaries(),
        counts,
        checks,
        derived);
  }

  /** The unknowns in slot order: a label, its node's name and whether it is an imputed cell. */
  private record Slots(List<String> labels, List<String> nodeOfSlot, List<Boolean> imputed) {}

  /** Numbers the unknowns: params first, then missing observations, each in statement order. */
  private static Slots allocateSlots(BindingScope scope, TermBinding terms) {
    List<String> labels = new ArrayList<>();
    List<String> nodeOfSlot = new ArrayList<>();
    List<Boolean> imputed = new ArrayList<>();
    for (Node.Kind kind : List.of(Node.Kind.PARAM, Node.Kind.DATA)) {
      for (Node node : scope.nodes.values()) {
        if (node.kind == kind && (kind == Node.Kind.PARAM || node.modelled())) {
          node.slots = new int[node.size];
          for (int e = 0; e < node.size; e++) {
            boolean unknown =
                kind == Node.Kind.PARAM || node.missing[e] && !terms.censoredRow(node, e);
            node.slots[e] = unknown ? labels.size() : -1;
            if (unknown) {
              labels.add(node.label(e));
              nodeOfSlot.add(node.name());
              imputed.add(kind == Node.Kind.DATA);
            }
          }
        }
      }
    }
    return new Slots(labels, nodeOfSlot, imputed);
  }

  /** Which header cells of a data file the model reads: data declared without inline values. */
  static Predicate<String> readsColumn(ModelFile model) {
    Set<String> names = new HashSet<>();
    for (Statement statement : model.statements()) {
      if (statement instanceof Statement.Data data && data.inlineValues() == null) {
        for (Declarator target : data.targets()) {
          names.add(target.name().text());
        }
      }
    }
    return header -> names.contains(columnBase(header.trim()));
  }

  /** {@code v} written in the model language's number syntax, for messages. */
  static String number(double v) {
    return NumberSyntax.written(v);
  }
}

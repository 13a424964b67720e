package org.hullbound.model;

import static org.hullbound.model.BindingScope.setList;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.hullbound.lang.Expression;
import org.hullbound.lang.Statement;

/**
 * The let phase of binding: every element of every {@code let} resolved (so that a fault in one
 * is reported even when nothing reads it) and the choice of which go with the draws as derived
 * quantities ({@link DerivedQuantities}). A let per data row is checked from its body lowered
 * once, element by element in numbers, and only an element with a fault is lowered, for its
 * message: resolving each element made a formula tree per row (issue 14).
 */
final class LetBinding {
  private final BindingScope scope;
  private final DataBinding data;
  private final ModelLowering lowering;

  LetBinding(BindingScope scope, DataBinding data, ModelLowering lowering) {
    this.scope = scope;
    this.data = data;
    this.lowering = lowering;
  }

  /** Resolves every let and chooses the ones kept with the draws. */
  DerivedQuantities bind() {
    DerivedQuantities.Builder derived = new DerivedQuantities.Builder();
    StatementFormula.RowCheck check = new StatementFormula.RowCheck();
    for (Node node : scope.nodes.values()) {
      if (node.kind != Node.Kind.LET) {
        continue;
      }
      StatementFormula.RowFormula rows = perRow(node);
      if (rows != null) {
        // checked from its body lowered once; an element with a fault is lowered, naming it
        for (int e = 0; e < node.size; e++) {
          if (!StatementFormula.letRowFine(node, rows, e, check)) {
            lowering.name(referenceTo(node, e), Map.of());
          }
        }
        chooseKept(node, null, derived);
        continue;
      }
      List<Formula> values = new ArrayList<>(node.size);
      for (int e = 0; e < node.size; e++) {
        values.add(lowering.name(referenceTo(node, e), Map.of()));
      }
      chooseKept(node, values, derived);
    }
    return derived.build();
  }

  /**
   * The body of a let per data row lowered once over its rows, or {@code null} where its elements
   * are resolved one by one: a let of few elements (lowering caches them, and other formulas
   * share them), one marked {@code keep} (its elements' formulas go with the draws), one whose
   * body {@link StatementFormula#letRows} does not cover. The choice of derived quantities reads
   * no element's formula for the others: they are hidden, or vectors not kept by default.
   */
  private StatementFormula.RowFormula perRow(Node node) {
    if (node.size <= ModelLowering.LARGEST_HELD_LET
        || ((Statement.Let) node.statement).keeping() == Statement.Keeping.KEEP
        || node.target.indexSets().isEmpty()) {
      return null;
    }
    return StatementFormula.letRows(node, scope, data, lowering);
  }

  /** Whether let {@code node}'s values go with the draws (see {@link DerivedQuantities}). */
  private void chooseKept(Node node, List<Formula> values, DerivedQuantities.Builder derived) {
    Statement.Let let = (Statement.Let) node.statement;
    boolean scalar = node.target.indexSets().isEmpty();
    String declared = scalar ? node.name() : node.name() + setList(node.target.indexSets());
    if (let.keeping() == Statement.Keeping.HIDE) {
      derived.leaveOut(declared, node.size, "marked hide");
      return;
    }
    if (let.keeping() == Statement.Keeping.DEFAULT && !scalar) {
      derived.leaveOut(declared, node.size, "a vector: write 'keep let' to keep it");
      return;
    }
    if (values.stream().allMatch(Formula::known)) {
      if (let.keeping() == Statement.Keeping.KEEP) {
        throw scope.error(
            let.marker(),
            "'" + node.name() + "' is fixed by the data (it depends on no param and no missing"
                + " observation), so every draw would hold the same value",
            "remove 'keep': a quantity of the data alone is not a result of the fit");
      }
      derived.leaveOut(declared, node.size, "fixed by the data, the same in every draw");
      return;
    }
    List<String> labels = new ArrayList<>(node.size);
    for (int e = 0; e < node.size; e++) {
      labels.add(node.label(e));
    }
    derived.keep(declared, labels, values,
        let.keeping() == Statement.Keeping.KEEP ? "marked keep" : "a scalar: kept by default");
  }

  private static Expression.Name referenceTo(Node node, int e) {
    int[] index = node.index(e);
    List<Expression> indexes = new ArrayList<>();
    for (int i : index) {
      indexes.add(new Expression.Number(i, node.position()));
    }
    return new Expression.Name(node.target.name(), indexes, node.position());
  }
}

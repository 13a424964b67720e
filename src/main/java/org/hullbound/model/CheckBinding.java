package org.hullbound.model;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import org.hullbound.lang.Expression;
import org.hullbound.lang.Statement;

/**
 * The check phase of binding: each {@code check} statement must read exactly one modelled data
 * name (through lets too), not a censored one; its value is bound with that name's elements as
 * slots after every unknown ({@link Binder.CheckFormula}).
 */
final class CheckBinding {
  private final BindingScope scope;
  private final ModelLowering lowering;

  CheckBinding(BindingScope scope, ModelLowering lowering) {
    this.scope = scope;
    this.lowering = lowering;
  }

  /**
   * Binds every {@code check}: the one modelled data name it reads becomes slots from {@code
   * base}.
   */
  List<Binder.CheckFormula> bind(int base) {
    List<Binder.CheckFormula> bound = new ArrayList<>();
    for (Statement.Check check : scope.checkStatements) {
      Set<Node> read = new LinkedHashSet<>();
      readThroughLets(check.value(), read, new HashSet<>());
      List<Node> modelled =
          read.stream().filter(n -> n.kind == Node.Kind.DATA && n.modelled()).toList();
      String name = check.name().text();
      if (modelled.size() != 1) {
        throw scope.error(
            check.name().position(),
            "check '" + name + "' must read exactly one modelled data name (data with '~'), "
                + (modelled.isEmpty() ? "it reads none"
                    : "it reads " + modelled.stream().map(n -> "'" + n.name() + "'")
                        .collect(java.util.stream.Collectors.joining(" and "))),
            modelled.isEmpty()
                ? "a check compares the observed data with replicated data, as in check " + name
                    + " = sum(obs: y[obs] ^ 2) where y is declared data y[obs] ~ ..."
                : "write one check per data name");
      }
      if (modelled.get(0).statement instanceof Statement.Data data && data.censoring() != null) {
        throw scope.error(
            check.name().position(),
            "check '" + name + "' reads '" + modelled.get(0).name()
                + "', whose line is censored: a censored row has no observed value to compare",
            "check a data name without a 'censored' clause");
      }
      Node checked = modelled.get(0);
      bound.add(new Binder.CheckFormula(
          name, checked.name(), base, lowering.replicating(checked, base, check.value()),
          check.position()));
    }
    return bound;
  }

  /** The nodes {@code e} names, and those named by the lets it reads, transitively. */
  private void readThroughLets(Expression e, Set<Node> into, Set<Node> visitedLets) {
    Set<Node> direct = new LinkedHashSet<>();
    scope.collectNames(e, direct);
    for (Node node : direct) {
      into.add(node);
      if (node.kind == Node.Kind.LET && visitedLets.add(node)) {
        readThroughLets(node.letValue, into, visitedLets);
      }
    }
  }
}

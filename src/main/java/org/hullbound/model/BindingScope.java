package org.hullbound.model;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.hullbound.lang.Expression;
import org.hullbound.lang.Identifier;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.SourceText;
import org.hullbound.lang.Statement;

/**
 * What the phases of binding share: the names the model declares ({@link Declarations} makes
 * them), the index sets sized so far, and the positioned errors of the model and data files.
 *
 * <p>The nodes are filled in phase by phase (sizes, data values, slots); nothing outside the
 * binder's phases sees them.
 */
final class BindingScope {
  final SourceText source;
  final String modelName;
  final Map<String, Statement.Index> indexStatements;
  final Map<String, Node> nodes;
  final List<Statement.Check> checkStatements;
  /** The index sets sized so far, by name. */
  final Map<String, IndexSet> sets = new LinkedHashMap<>();

  BindingScope(
      SourceText source,
      String modelName,
      Map<String, Statement.Index> indexStatements,
      Map<String, Node> nodes,
      List<Statement.Check> checkStatements) {
    this.source = source;
    this.modelName = modelName;
    this.indexStatements = indexStatements;
    this.nodes = nodes;
    this.checkStatements = checkStatements;
  }

  /** The error at {@code position}, quoting the model's line when it is in the model file. */
  ModelException error(SourcePosition position, String problem, String hint) {
    return error(source, position, problem, hint);
  }

  /** The error at {@code position}, quoting {@code source}'s line when it is in that file. */
  static ModelException error(
      SourceText source, SourcePosition position, String problem, String hint) {
    if (position.file().equals(source.fileName())) {
      return ModelException.at(source, position, problem, hint);
    }
    return new ModelException(position, null, problem, hint);
  }

  /** The nodes {@code e} names directly, in the order written. */
  void collectNames(Expression e, Set<Node> into) {
    if (e instanceof Expression.Name name) {
      Node node = nodes.get(name.name().text());
      if (node != null) {
        into.add(node);
      }
      for (Expression index : name.indexes()) {
        collectNames(index, into);
      }
    } else if (e instanceof Expression.Negation n) {
      collectNames(n.operand(), into);
    } else if (e instanceof Expression.Binary b) {
      collectNames(b.left(), into);
      collectNames(b.right(), into);
    } else if (e instanceof Expression.Call c) {
      for (Expression a : c.arguments()) {
        collectNames(a, into);
      }
    } else if (e instanceof Expression.Sum s) {
      collectNames(s.body(), into);
    }
  }

  /** {@code [a, b]}: the index sets of a declaration, for messages. */
  static String setList(List<Identifier> identifiers) {
    List<String> names = new ArrayList<>();
    for (Identifier i : identifiers) {
      names.add(i.text());
    }
    return "[" + String.join(", ", names) + "]";
  }

  /** The data name a column's header cell refers to: the text before any {@code [}. */
  static String columnBase(String header) {
    int bracket = header.indexOf('[');
    return bracket < 0 ? header : header.substring(0, bracket).trim();
  }
}

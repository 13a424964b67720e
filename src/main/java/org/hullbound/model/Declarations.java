package org.hullbound.model;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.TreeSet;
import org.hullbound.lang.Argument;
import org.hullbound.lang.Declarator;
import org.hullbound.lang.Distribution;
import org.hullbound.lang.Expression;
import org.hullbound.lang.Identifier;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.NameSuggestion;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.SourceText;
import org.hullbound.lang.Statement;
import org.hullbound.model.family.Families;
import org.hullbound.model.family.Family;
import org.hullbound.model.family.Parametrisation;

/**
 * The first phase of binding: the names a model file declares, each once, their index sets
 * declared, each family and parametrisation matched to its arguments, and the graph of data,
 * param and let checked for cycles. Reads no data.
 */
final class Declarations {

  private final ModelFile model;
  private final SourceText source;
  private final Map<String, Statement.Index> indexStatements = new LinkedHashMap<>();
  private final Map<String, Node> nodes = new LinkedHashMap<>();
  private final List<Statement.Check> checkStatements = new ArrayList<>();
  private String modelName;
  private BindingScope scope;

  private Declarations(ModelFile model) {
    this.model = model;
    this.source = model.source();
  }

  /** The declared names of {@code model}, checked. */
  static BindingScope read(ModelFile model) {
    Declarations declarations = new Declarations(model);
    declarations.declare();
    BindingScope scope = new BindingScope(
        declarations.source, declarations.modelName, declarations.indexStatements,
        declarations.nodes, declarations.checkStatements);
    declarations.scope = scope;
    declarations.checkDeclarators();
    for (Node node : declarations.nodes.values()) {
      if (node.distribution != null) {
        declarations.matchFamily(node);
      }
    }
    declarations.checkCycles();
    return scope;
  }

  private void declare() {
    Map<String, SourcePosition> declaredAt = new HashMap<>();
    for (Statement statement : model.statements()) {
      if (statement instanceof Statement.ModelName named) {
        if (modelName != null) {
          throw error(named.name().position(), "the model is named twice", null);
        }
        modelName = named.name().text();
      } else if (statement instanceof Statement.Index index) {
        claim(index.name(), declaredAt);
        indexStatements.put(index.name().text(), index);
      } else if (statement instanceof Statement.Data data) {
        for (Declarator target : data.targets()) {
          claim(target.name(), declaredAt);
          nodes.put(
              target.name().text(),
              new Node(
                  Node.Kind.DATA, target, data, data.likelihood(), null, data.inlineValues()));
        }
      } else if (statement instanceof Statement.Param param) {
        claim(param.target().name(), declaredAt);
        if (param.prior() == null) {
          throw error(
              param.target().position(),
              "param '" + param.target().name().text() + "' has no prior",
              "write param " + param.target().name().text() + " ~ family(...)");
        }
        nodes.put(
            param.target().name().text(),
            new Node(Node.Kind.PARAM, param.target(), param, param.prior(), null, null));
      } else if (statement instanceof Statement.Let let) {
        claim(let.target().name(), declaredAt);
        nodes.put(
            let.target().name().text(),
            new Node(Node.Kind.LET, let.target(), let, null, let.value(), null));
      } else if (statement instanceof Statement.Check check) {
        claim(check.name(), declaredAt);
        checkStatements.add(check);
      }
    }
    if (modelName == null) {
      String file = source.fileName().replace('\\', '/');
      file = file.substring(file.lastIndexOf('/') + 1);
      modelName = file.endsWith(".hbm") ? file.substring(0, file.length() - 4) : file;
    }
  }

  private void claim(Identifier name, Map<String, SourcePosition> declaredAt) {
    SourcePosition earlier = declaredAt.putIfAbsent(name.text(), name.position());
    if (earlier != null) {
      throw error(
          name.position(),
          "'" + name.text() + "' is already declared at line " + earlier.line(),
          "every name is declared once; rename one of them");
    }
  }

  private void checkDeclarators() {
    for (Node node : nodes.values()) {
      Set<String> seen = new HashSet<>();
      for (Identifier set : node.target.indexSets()) {
        if (!indexStatements.containsKey(set.text())) {
          throw error(
              set.position(),
              "unknown index set '" + set.text() + "'",
              NameSuggestion.hint(set.text(), indexStatements.keySet()));
        }
        if (!seen.add(set.text())) {
          throw error(
              set.position(),
              "index set '" + set.text() + "' appears twice in the declaration of '"
                  + node.name() + "'",
              null);
        }
      }
    }
  }

  private void matchFamily(Node node) {
    Distribution d = node.distribution;
    String familyName = d.family().text();
    Optional<Family> found = Families.lookup(familyName);
    if (found.isEmpty()) {
      throw error(
          d.family().position(),
          "unknown family '" + familyName + "'; the families are " + String.join(", ",
              Families.names()),
          Families.hint(familyName));
    }
    Family family = found.get();
    Set<String> allNames = new TreeSet<>();
    for (Parametrisation p : family.parametrisations()) {
      allNames.addAll(p.argumentNames());
    }
    Map<String, Argument> given = new LinkedHashMap<>();
    for (Argument argument : d.arguments()) {
      String name = argument.name().text();
      if (!allNames.contains(name)) {
        throw error(
            argument.name().position(),
            familyName + " has no argument '" + name + "'; its arguments are "
                + describeParametrisations(family),
            NameSuggestion.hint(name, allNames));
      }
      if (given.put(name, argument) != null) {
        throw error(
            argument.name().position(),
            "argument '" + name + "' of " + familyName + " is given twice",
            null);
      }
    }
    Optional<Parametrisation> match = family.match(given.keySet());
    if (match.isEmpty()) {
      List<String> completions = new ArrayList<>();
      for (Parametrisation p : family.parametrisations()) {
        if (p.argumentNames().containsAll(given.keySet())) {
          List<String> missing = new ArrayList<>(p.argumentNames());
          missing.removeAll(given.keySet());
          completions.add(String.join(" and ", missing));
        }
      }
      if (!completions.isEmpty()) {
        throw error(
            d.family().position(),
            familyName + " is missing "
                + (completions.size() == 1 && !completions.get(0).contains(" and ")
                    ? "argument '" + completions.get(0) + "'"
                    : "arguments: give " + String.join(", or ", completions)),
            "its arguments are " + describeParametrisations(family));
      }
      throw error(
          d.family().position(),
          "the arguments " + given.keySet() + " of " + familyName
              + " do not form one parametrisation; its arguments are "
              + describeParametrisations(family),
          null);
    }
    Parametrisation p = match.get();
    node.parametrisation = p;
    node.argumentExpressions = new Expression[p.argumentNames().size()];
    for (int k = 0; k < node.argumentExpressions.length; k++) {
      node.argumentExpressions[k] = given.get(p.argumentNames().get(k)).value();
    }
  }

  private static String describeParametrisations(Family family) {
    List<String> forms = new ArrayList<>();
    for (Parametrisation p : family.parametrisations()) {
      forms.add("(" + String.join(", ", p.argumentNames()) + ")");
    }
    return String.join(" or ", forms);
  }

  // ---- cycles ----

  private void checkCycles() {
    Map<Node, List<Node>> uses = new LinkedHashMap<>();
    for (Node node : nodes.values()) {
      Set<Node> used = new LinkedHashSet<>();
      for (Expression e : expressionsOf(node)) {
        scope.collectNames(e, used);
      }
      uses.put(node, new ArrayList<>(used));
    }
    Map<Node, Integer> state = new HashMap<>();
    for (Node start : nodes.values()) {
      List<Node> path = new ArrayList<>();
      List<Node> cycle = findCycle(start, uses, state, path);
      if (cycle != null) {
        StringBuilder names = new StringBuilder();
        for (Node n : cycle) {
          names.append(n.name()).append(" -> ");
        }
        names.append(cycle.get(0).name());
        throw error(
            cycle.get(0).position(),
            "the model has a cycle: " + names + "; the graph of data, param and let must be"
                + " acyclic",
            "break the cycle by making one of " + cycleNames(cycle) + " not depend on the next");
      }
    }
  }

  private static String cycleNames(List<Node> cycle) {
    List<String> names = new ArrayList<>();
    for (Node n : cycle) {
      names.add("'" + n.name() + "'");
    }
    return String.join(", ", names);
  }

  private static List<Node> findCycle(
      Node node, Map<Node, List<Node>> uses, Map<Node, Integer> state, List<Node> path) {
    Integer mark = state.get(node);
    if (mark != null && mark == 2) {
      return null;
    }
    if (mark != null && mark == 1) {
      return new ArrayList<>(path.subList(path.indexOf(node), path.size()));
    }
    state.put(node, 1);
    path.add(node);
    for (Node next : uses.get(node)) {
      List<Node> cycle = findCycle(next, uses, state, path);
      if (cycle != null) {
        return cycle;
      }
    }
    path.remove(path.size() - 1);
    state.put(node, 2);
    return null;
  }

  private static List<Expression> expressionsOf(Node node) {
    List<Expression> expressions = new ArrayList<>();
    if (node.letValue != null) {
      expressions.add(node.letValue);
    }
    if (node.distribution != null) {
      for (Argument a : node.distribution.arguments()) {
        expressions.add(a.value());
      }
      if (node.distribution.truncation() != null) {
        expressions.add(node.distribution.truncation().lower());
        expressions.add(node.distribution.truncation().upper());
      }
    }
    return expressions;
  }

  private ModelException error(SourcePosition position, String problem, String hint) {
    return BindingScope.error(source, position, problem, hint);
  }
}

package org.hullbound.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.TreeSet;
import java.util.function.IntUnaryOperator;
import java.util.function.Predicate;
import org.hullbound.lang.Argument;
import org.hullbound.lang.Declarator;
import org.hullbound.lang.Distribution;
import org.hullbound.lang.Expression;
import org.hullbound.lang.Functions;
import org.hullbound.lang.Identifier;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.NameSuggestion;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.SourceText;
import org.hullbound.lang.Statement;
import org.hullbound.model.family.Categorical;
import org.hullbound.model.family.Families;
import org.hullbound.model.family.Family;
import org.hullbound.model.family.Parametrisation;
import org.hullbound.model.family.SupportKind;

/**
 * Turns a parsed model file and its data tables into element-level {@link Term}s over numbered
 * unknowns, checking every semantic rule of the model language on the way.
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

  private final ModelFile model;
  private final SourceText source;
  private final List<DataTable> tables;
  private final Map<String, Statement.Index> indexStatements = new LinkedHashMap<>();
  private final Map<String, IndexSet> sets = new LinkedHashMap<>();
  private final Map<String, Node> nodes = new LinkedHashMap<>();
  private final Map<Node, Formula[]> letCache = new HashMap<>();
  private final List<DataSummary> summaries = new ArrayList<>();
  private final Map<Node, List<ColumnBinding>> fileColumns = new HashMap<>();
  private final Map<Node, Formula.Cells> cellsOf = new HashMap<>();
  private Formula.Slot[] slotFormulas = new Formula.Slot[16];
  private final Map<Node, CensoredRows> censoredRows = new HashMap<>();
  private final List<Statement.Check> checkStatements = new ArrayList<>();
  /** While a check is resolved: its data name, whose elements become slots from {@code replicatedBase}. */
  private Node replicated;
  private int replicatedBase;
  private final EmptyCells emptyCells;
  private String modelName;

  private Binder(ModelFile model, List<DataTable> tables, EmptyCells emptyCells) {
    this.model = model;
    this.source = model.source();
    this.tables = List.copyOf(tables);
    this.emptyCells = emptyCells;
  }

  static Result bind(ModelFile model, List<DataTable> tables, EmptyCells emptyCells) {
    return new Binder(model, tables, emptyCells).run();
  }

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

  /** The data name a column's header cell refers to: the text before any {@code [}. */
  private static String columnBase(String header) {
    int bracket = header.indexOf('[');
    return bracket < 0 ? header : header.substring(0, bracket).trim();
  }

  private Result run() {
    declare();
    checkDeclarators();
    for (Node node : nodes.values()) {
      if (node.distribution != null) {
        matchFamily(node);
      }
    }
    checkCycles();
    bindInlineScalars();
    bindFileScalars();
    sizeDeclaredSets();
    Map<Node, List<ColumnBinding>> columns = readTableHeaders();
    fileColumns.putAll(columns);
    sizeSetsFromInlineVectors();
    for (Map.Entry<String, Statement.Index> entry : indexStatements.entrySet()) {
      if (!sets.containsKey(entry.getKey())) {
        throw error(
            entry.getValue().name().position(),
            "index set '" + entry.getKey() + "' has no bounds and no data runs over it",
            "write index " + entry.getKey() + " = 1 .. N, or give data declared over it");
      }
    }
    for (Node node : nodes.values()) {
      node.indexSets = new ArrayList<>();
      long size = 1;
      List<String> factors = new ArrayList<>();
      for (Identifier set : node.target.indexSets()) {
        IndexSet bound = sets.get(set.text());
        node.indexSets.add(bound);
        factors.add(Integer.toString(bound.size()));
        // Both factors are below 2^31, so the product of the running size (capped at 2^31 below)
        // and the next one fits in a long.
        size = Math.min(size * bound.size(), Integer.MAX_VALUE + 1L);
      }
      if (size > Integer.MAX_VALUE) {
        throw error(
            node.target.position(),
            "'" + node.name() + "' runs over " + setList(node.target.indexSets()) + " with "
                + String.join(" x ", factors) + " elements, more than the " + Integer.MAX_VALUE
                + " one quantity can hold",
            "use smaller index sets");
      }
      node.size = (int) size;
    }
    bindDataValues(columns);
    return build();
  }

  // ---- declarations ----

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
        collectNames(e, used);
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

  private List<Expression> expressionsOf(Node node) {
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

  private void collectNames(Expression e, Set<Node> into) {
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

  // ---- sizes and data ----

  private void bindInlineScalars() {
    for (Node node : nodes.values()) {
      if (node.kind == Node.Kind.DATA && node.inline != null && node.target.indexSets().isEmpty()) {
        if (node.inline.size() != 1) {
          throw error(
              node.position(),
              "'" + node.name() + "' is a scalar but " + node.inline.size() + " values are given",
              "declare it over an index set, as in " + node.name() + "[set]");
        }
        node.indexSets = List.of();
        node.size = 1;
        allocate(node, "inline");
        Statement.InlineValue v = node.inline.get(0);
        if (v.missing()) {
          if (!node.modelled()) {
            throw error(
                v.position(),
                "'" + node.name() + "' is a covariate (it has no ~ line), so it cannot be NA",
                null);
          }
          node.missing[0] = true;
        } else {
          node.values[0] = v.value();
        }
        node.present[0] = true;
        node.cells[0] = v.position();
        summaries.add(new DataSummary("inline", "(scalar)", 1, List.of(node.name()), 0));
      }
    }
  }

  private void allocate(Node node, String from) {
    node.values = new double[node.size];
    node.present = new boolean[node.size];
    node.missing = new boolean[node.size];
    // Cells read from files find their position through the table's row lines instead (cellOf).
    node.cells = from != null ? new SourcePosition[node.size] : null;
    node.source = from;
  }

  /**
   * Binds scalar data read from a file of scalars: a header of scalar names and one data row.
   * Before the index sets are sized, so that {@code index t = 1 .. n} may use such an {@code n}.
   */
  private void bindFileScalars() {
    for (DataTable table : tables) {
      for (int j = 0; j < table.header().size(); j++) {
        String header = table.header().get(j).trim();
        Node node = nodes.get(header);
        if (node == null || node.kind != Node.Kind.DATA || node.inline != null
            || !node.target.indexSets().isEmpty()) {
          continue;
        }
        SourcePosition at = new SourcePosition(table.fileName(), 1, j + 1);
        if (node.values != null) {
          throw error(
              at,
              "column '" + header + "' is in both " + node.source + " and " + table.fileName(),
              "give each column in one data file only");
        }
        for (String other : table.header()) {
          Node vector = nodes.get(columnBase(other.trim()));
          if (vector != null && vector.kind == Node.Kind.DATA
              && !vector.target.indexSets().isEmpty()) {
            throw mixedScalarFile(
                at, header, other.trim(), vector.target.indexSets().get(0).text());
          }
        }
        if (table.rowCount() != 1) {
          throw error(
              at,
              "'" + header + "' is a scalar, so the file that gives it has one data row; "
                  + table.fileName() + " has " + table.rowCount(),
              "give scalars in a file of their own, their names in the header and their values"
                  + " in one row, or inline: data " + header + " = 5");
        }
        node.indexSets = List.of();
        node.size = 1;
        allocate(node, null);
        node.source = table.fileName();
        SourcePosition cell = new SourcePosition(table.fileName(), table.line(0), j + 1);
        node.cells = new SourcePosition[] {cell};
        DataColumn column = table.column(j);
        if (column.invalid(0)) {
          throw notANumber(column, header, cell);
        }
        if (emptyCells == EmptyCells.REFUSED && column.empty(0) && node.modelled()) {
          throw emptyCell(node, 0, cell, header);
        }
        store(node, 0, column.missing(0), column.value(0), cell, column.shown(0));
      }
    }
  }

  private ModelException mixedScalarFile(
      SourcePosition at, String scalar, String vectorColumn, String set) {
    return error(
        at,
        "'" + scalar + "' is a scalar but column '" + vectorColumn + "' of the same file runs"
            + " over '" + set + "'",
        "give scalars in a file of their own, their names in the header and their values in one"
            + " row, or inline: data " + scalar + " = 5");
  }

  private ModelException notANumber(DataColumn column, String header, SourcePosition at) {
    String cell = column.firstInvalidText();
    String reason = "is not a finite number";
    try {
      NumberSyntax.parse(cell);
    } catch (NumberSyntax.InvalidNumberException ex) {
      reason = ex.reason();
    }
    String separator = cell.contains(";") ? "';'" : cell.contains("\t") ? "a tab" : null;
    return error(
        at,
        "'" + NumberSyntax.shortened(cell) + "' in column '" + header + "' " + reason,
        separator != null
            ? "the cell holds " + separator + ": hullbound reads comma-separated files; separate"
                + " the cells with commas"
            : "write a finite number (" + NumberSyntax.FORMS + "), or NA (or leave the cell"
                + " empty) for a missing observation");
  }

  private void sizeDeclaredSets() {
    for (Statement.Index index : indexStatements.values()) {
      if (index.sizedFromData()) {
        continue;
      }
      int lower = wholeBound(index.lower(), "lower");
      int upper = wholeBound(index.upper(), "upper");
      if (upper < lower) {
        throw error(
            index.upper().position(),
            "index set '" + index.name().text() + "' is empty: " + lower + " .. " + upper,
            "the upper bound must be at least the lower bound");
      }
      sets.put(index.name().text(), new IndexSet(index.name().text(), lower, upper, "declared"));
    }
  }

  private int wholeBound(Expression e, String which) {
    Formula f = resolve(e, Map.of());
    if (!(f instanceof Formula.Constant c)) {
      throw error(e.position(), "the " + which + " bound of an index set must be a known number",
          null);
    }
    double v = c.value();
    if (!(v == Math.rint(v)) || Math.abs(v) > 1e9) {
      throw error(
          e.position(),
          "the " + which + " bound of an index set must be a whole number, got " + v,
          null);
    }
    return (int) v;
  }

  /** Where one column of a data file goes: its node and the trailing index values. */
  private record ColumnBinding(DataTable table, int column, Node node, int[] trailing) {}

  private Map<Node, List<ColumnBinding>> readTableHeaders() {
    Map<Node, List<ColumnBinding>> columns = new LinkedHashMap<>();
    Map<String, String> setRowsFrom = new HashMap<>();
    Map<String, Integer> setRows = new HashMap<>();
    Map<String, Integer> trailingMax = new HashMap<>();
    Map<String, String> fileOfColumn = new HashMap<>();
    Set<String> dataNames = new TreeSet<>();
    for (Node n : nodes.values()) {
      if (n.kind == Node.Kind.DATA) {
        dataNames.add(n.name());
      }
    }
    for (DataTable table : tables) {
      String fileSet = null;
      String fileSetColumn = null;
      boolean scalarFile = false;
      Set<String> seen = new HashSet<>();
      List<String> columnNames = new ArrayList<>();
      for (int j = 0; j < table.header().size(); j++) {
        String header = table.header().get(j).trim();
        SourcePosition at = new SourcePosition(table.fileName(), 1, j + 1);
        if (!seen.add(header)) {
          throw error(at, "column '" + header + "' appears twice in the header", null);
        }
        String base = columnBase(header);
        int[] trailing = new int[0];
        int bracket = header.indexOf('[');
        if (bracket >= 0) {
          trailing = parseColumnIndexes(header, bracket, at);
        }
        Node node = nodes.get(base);
        if (node == null || node.kind != Node.Kind.DATA) {
          String what =
              node == null
                  ? "is not a data name of the model"
                  : "names a " + node.kindWord() + ", and only data is read from files";
          String separator =
              header.contains(";") ? "';'" : header.contains("\t") ? "a tab" : null;
          throw error(
              at,
              "column '" + header + "' " + what + "; the data names are " + dataNames,
              separator != null
                  ? "the header cell holds " + separator + ": hullbound reads comma-separated"
                      + " files; separate the cells with commas"
                  : node == null ? NameSuggestion.hint(base, dataNames) : null);
        }
        if (node.inline != null) {
          throw error(
              at,
              "'" + base + "' is given inline at line " + node.position().line()
                  + " and again as a column of " + table.fileName(),
              null);
        }
        List<Identifier> nodeSets = node.target.indexSets();
        if (nodeSets.isEmpty()) {
          // Bound already, in a file of scalars only (bindFileScalars).
          if (trailing.length != 0) {
            throw error(at, "'" + base + "' is a scalar, so its column is named '" + base
                + "'; got '" + header + "'", null);
          }
          scalarFile = true;
          columnNames.add(header);
          continue;
        }
        if (trailing.length != nodeSets.size() - 1) {
          throw error(
              at,
              "'" + base + "' runs over " + setList(nodeSets) + ", so its columns are named "
                  + exampleColumns(base, nodeSets.size()) + "; got '" + header + "'",
              null);
        }
        String set = nodeSets.get(0).text();
        if (fileSet == null) {
          fileSet = set;
          fileSetColumn = header;
        } else if (!fileSet.equals(set)) {
          throw error(
              at,
              "column '" + header + "' runs over '" + set + "' but column '" + fileSetColumn
                  + "' of this file runs over '" + fileSet + "'",
              "give one file per index set");
        }
        for (int t = 0; t < trailing.length; t++) {
          String trailingSet = nodeSets.get(t + 1).text();
          IndexSet bound = sets.get(trailingSet);
          if (bound != null && !bound.contains(trailing[t])) {
            throw error(
                at,
                "column '" + header + "': " + trailing[t] + " is outside index set '"
                    + trailingSet + "' (" + bound.range() + ")",
                null);
          }
          if (bound == null) {
            if (trailing[t] < 1) {
              throw error(at, "column '" + header + "': index values of '" + trailingSet
                  + "' start at 1", null);
            }
            trailingMax.merge(trailingSet, trailing[t], Math::max);
          }
        }
        String earlierFile =
            fileOfColumn.putIfAbsent(base + Arrays.toString(trailing), table.fileName());
        if (earlierFile != null && !earlierFile.equals(table.fileName())) {
          // Reading both would let the order of the --data options decide which values count.
          throw error(
              at,
              "column '" + header + "' is in both " + earlierFile + " and " + table.fileName(),
              "give each column in one data file only");
        }
        columns.computeIfAbsent(node, k -> new ArrayList<>())
            .add(new ColumnBinding(table, j, node, trailing));
        columnNames.add(header);
      }
      if (fileSet == null) {
        if (scalarFile) {
          summaries.add(new DataSummary(table.fileName(), DataSummary.SCALARS, 1, columnNames, 0));
        }
        continue;
      }
      int rows = table.rowCount();
      IndexSet bound = sets.get(fileSet);
      SourcePosition fileStart = new SourcePosition(table.fileName(), 1, 1);
      if (bound != null) {
        if (bound.size() != rows) {
          throw error(
              fileStart,
              table.fileName() + " has " + rows + " data rows but index set '" + fileSet + "' is "
                  + bound.range() + " (" + bound.size() + " elements)",
              "one row per element of '" + fileSet + "'");
        }
      } else {
        Integer earlier = setRows.putIfAbsent(fileSet, rows);
        if (earlier != null && earlier != rows) {
          throw error(
              fileStart,
              "column lengths disagree: " + table.fileName() + " has " + rows + " rows over '"
                  + fileSet + "' but " + setRowsFrom.get(fileSet) + " has " + earlier,
              null);
        }
        setRowsFrom.putIfAbsent(fileSet, table.fileName());
      }
      summaries.add(new DataSummary(table.fileName(), fileSet, rows, columnNames, 0));
    }
    for (Map.Entry<String, Integer> entry : setRows.entrySet()) {
      if (entry.getValue() == 0) {
        throw error(
            new SourcePosition(setRowsFrom.get(entry.getKey()), 1, 1),
            setRowsFrom.get(entry.getKey()) + " has no data rows, so index set '"
                + entry.getKey() + "' would be empty",
            null);
      }
      sets.put(
          entry.getKey(),
          new IndexSet(entry.getKey(), 1, entry.getValue(), setRowsFrom.get(entry.getKey())));
    }
    for (Map.Entry<String, Integer> entry : trailingMax.entrySet()) {
      if (!sets.containsKey(entry.getKey())) {
        sets.put(entry.getKey(), new IndexSet(entry.getKey(), 1, entry.getValue(), "columns"));
      }
    }
    return columns;
  }

  private int[] parseColumnIndexes(String header, int bracket, SourcePosition at) {
    if (!header.endsWith("]")) {
      throw error(at, "column '" + header + "' has an unclosed '['", "write columns as X[1], X[2]");
    }
    String[] pieces = header.substring(bracket + 1, header.length() - 1).split(",");
    int[] indexes = new int[pieces.length];
    for (int i = 0; i < pieces.length; i++) {
      try {
        indexes[i] = Integer.parseInt(pieces[i].trim());
      } catch (NumberFormatException e) {
        throw error(
            at,
            "column '" + header + "': '" + pieces[i].trim() + "' is not a whole number",
            "write columns as X[1], X[2]");
      }
    }
    return indexes;
  }

  private static String setList(List<Identifier> identifiers) {
    List<String> names = new ArrayList<>();
    for (Identifier i : identifiers) {
      names.add(i.text());
    }
    return "[" + String.join(", ", names) + "]";
  }

  private static String exampleColumns(String base, int dims) {
    if (dims == 1) {
      return "'" + base + "'";
    }
    String tail = dims == 2 ? "" : ", 1".repeat(dims - 2);
    return "'" + base + "[1" + tail + "]', '" + base + "[2" + tail + "]', ...";
  }

  private void sizeSetsFromInlineVectors() {
    for (Node node : nodes.values()) {
      if (node.kind != Node.Kind.DATA || node.inline == null) {
        continue;
      }
      List<Identifier> nodeSets = node.target.indexSets();
      if (nodeSets.size() == 1 && !sets.containsKey(nodeSets.get(0).text())) {
        String set = nodeSets.get(0).text();
        sets.put(set, new IndexSet(set, 1, node.inline.size(), "inline data of " + node.name()));
      }
    }
  }

  private void bindDataValues(Map<Node, List<ColumnBinding>> columns) {
    for (Node node : nodes.values()) {
      if (node.kind == Node.Kind.DATA && node.target.indexSets().isEmpty() && node.values == null) {
        throw noScalarValue(node);
      }
      if (node.kind != Node.Kind.DATA || node.target.indexSets().isEmpty()) {
        continue;
      }
      allocate(node, node.inline != null ? "inline" : null);
      if (node.inline != null) {
        if (node.inline.size() != node.size) {
          throw error(
              node.position(),
              "'" + node.name() + "' runs over " + setList(node.target.indexSets()) + " with "
                  + node.size + " elements but " + node.inline.size() + " values are given",
              null);
        }
        for (int e = 0; e < node.size; e++) {
          Statement.InlineValue v = node.inline.get(e);
          store(node, e, v.missing(), v.value(), v.position(), "NA");
        }
        summaries.add(
            new DataSummary(
                "inline", setList(node.target.indexSets()), node.size, List.of(node.name()), 0));
        continue;
      }
      List<ColumnBinding> bindings = columns.getOrDefault(node, List.of());
      if (bindings.isEmpty()) {
        throw error(
            node.position(),
            "no data for '" + node.name() + "': "
                + (tables.isEmpty()
                    ? "no data file was given"
                    : "no data file has a column '" + exampleColumn(node) + "'"),
            tables.isEmpty() ? "give the data file that has a column '" + node.name() + "'"
                : "the data files read are " + tableNames());
      }
      int[] index = new int[node.indexSets.size()];
      for (ColumnBinding binding : bindings) {
        DataTable table = binding.table();
        node.source = table.fileName();
        DataColumn column = table.column(binding.column());
        for (int r = 0; r < table.rowCount(); r++) {
          index[0] = node.indexSets.get(0).lower() + r;
          System.arraycopy(binding.trailing(), 0, index, 1, binding.trailing().length);
          int e = node.offset(index);
          boolean missing = column.missing(r);
          double value = column.value(r);
          if (column.invalid(r)) {
            throw notANumber(column, table.header().get(binding.column()), cellAt(binding, r));
          }
          if (missing && !node.modelled()) {
            throw missingCovariate(node, e, cellAt(binding, r), column.shown(r));
          }
          if (emptyCells == EmptyCells.REFUSED && column.empty(r)) {
            throw emptyCell(node, e, cellAt(binding, r), table.header().get(binding.column()));
          }
          node.present[e] = true;
          node.missing[e] = missing;
          node.values[e] = value;
        }
      }
      for (int e = 0; e < node.size; e++) {
        if (!node.present[e]) {
          throw error(
              node.position(),
              "no data for '" + node.label(e) + "': no data file has a column '"
                  + columnName(node, node.index(e)) + "'",
              "the data files read are " + tableNames());
        }
      }
    }
    for (int i = 0; i < summaries.size(); i++) {
      DataSummary s = summaries.get(i);
      int missing = 0;
      for (Node node : nodes.values()) {
        if (node.missing != null && s.source().equals(node.source)
            && s.columns().stream().anyMatch(c -> c.equals(node.name())
                || c.startsWith(node.name() + "["))) {
          for (boolean m : node.missing) {
            missing += m ? 1 : 0;
          }
        }
      }
      summaries.set(i, new DataSummary(s.source(), s.indexSet(), s.rows(), s.columns(), missing));
    }
  }

  /** Scalar data {@code node} got a value neither inline nor from a data file. */
  private ModelException noScalarValue(Node node) {
    return error(
        node.position(),
        "no value for the scalar data '" + node.name() + "': "
            + (tables.isEmpty()
                ? "no data file was given"
                : "no data file has a column '" + node.name() + "'"),
        "give it inline (data " + node.name() + " = 5), or as a column of a data file of"
            + " scalars (one row under the header)"
            + (tables.isEmpty() ? "" : "; the data files read are " + tableNames()));
  }

  private void store(
      Node node, int e, boolean missing, double value, SourcePosition at, String shown) {
    if (missing && !node.modelled()) {
      throw missingCovariate(node, e, at, shown);
    }
    node.present[e] = true;
    node.missing[e] = missing;
    node.values[e] = value;
    node.cells[e] = at;
  }

  private ModelException emptyCell(Node node, int e, SourcePosition at, String header) {
    return error(
        at,
        "empty cell in column '" + header + "' for '" + node.label(e) + "'; empty cells of"
            + " modelled data are refused in this run, not imputed",
        "fill in the value, or write NA where the observation is missing so that it is imputed");
  }

  private ModelException missingCovariate(Node node, int e, SourcePosition at, String shown) {
    return error(
        at,
        "missing value (" + shown + ") for covariate '" + node.label(e)
            + "'; only modelled data (with a ~ line) may be missing",
        "fill in the value, or drop the row");
  }

  private static SourcePosition cellAt(ColumnBinding binding, int row) {
    return new SourcePosition(
        binding.table().fileName(), binding.table().line(row), binding.column() + 1);
  }

  /**
   * Where element {@code e} of data {@code node} was written: its inline value, or the cell of
   * the last column read into it (rows give the first index, the column the others).
   */
  private SourcePosition cellOf(Node node, int e) {
    return cells(node).at(e);
  }

  /** The cells of data {@code node}, one instance per node, shared by all its constants. */
  private Formula.Cells cells(Node node) {
    return cellsOf.computeIfAbsent(node, this::newCells);
  }

  private Formula.Cells newCells(Node node) {
    if (node.cells != null) {
      SourcePosition[] inline = node.cells;
      return e -> inline[e];
    }
    List<FileCells.Column> columns = new ArrayList<>();
    for (ColumnBinding binding : fileColumns.getOrDefault(node, List.of())) {
      DataTable table = binding.table();
      columns.add(new FileCells.Column(
          table.fileName(), table.lines(), binding.column() + 1, binding.trailing()));
    }
    return new FileCells(new ElementNames(node.name(), node.indexSets), List.copyOf(columns));
  }

  /**
   * The cells of a data name read from files; holds the tables' row lines (shared, not copied),
   * not the tables, so that a bound model does not keep its data files' values alive.
   */
  private record FileCells(ElementNames names, List<Column> columns) implements Formula.Cells {
    record Column(String fileName, IntUnaryOperator lines, int column, int[] trailing) {}

    @Override
    public SourcePosition at(int e) {
      int[] index = names.index(e);
      Column found = null;
      for (Column c : columns) {
        if (Arrays.equals(c.trailing(), 0, c.trailing().length, index, 1, index.length)) {
          found = c;
        }
      }
      if (found == null) {
        return null;
      }
      int row = index[0] - names.indexSets().get(0).lower();
      return new SourcePosition(found.fileName(), found.lines().applyAsInt(row), found.column());
    }
  }

  private String exampleColumn(Node node) {
    return node.target.indexSets().size() == 1 ? node.name() : node.name() + "[1]";
  }

  private static String columnName(Node node, int[] index) {
    if (index.length == 1) {
      return node.name();
    }
    StringBuilder text = new StringBuilder(node.name()).append('[');
    for (int i = 1; i < index.length; i++) {
      text.append(i == 1 ? "" : ", ").append(index[i]);
    }
    return text.append(']').toString();
  }

  private String tableNames() {
    List<String> names = new ArrayList<>();
    for (DataTable t : tables) {
      names.add(t.fileName());
    }
    return String.join(", ", names);
  }

  // ---- resolution ----

  /** Resolves {@code e} with the index sets in {@code env} bound to the given elements. */
  private Formula resolve(Expression e, Map<String, Integer> env) {
    if (e instanceof Expression.Number number) {
      return Formula.constant(number.value());
    }
    if (e instanceof Expression.Negation negation) {
      return Formulas.apply(Op.NEGATE, List.of(resolve(negation.operand(), env)));
    }
    if (e instanceof Expression.Binary binary) {
      Op op =
          switch (binary.operator()) {
            case ADD -> Op.ADD;
            case SUBTRACT -> Op.SUBTRACT;
            case MULTIPLY -> Op.MULTIPLY;
            case DIVIDE -> Op.DIVIDE;
            case POWER -> Op.POWER;
          };
      return Formulas.apply(op, List.of(resolve(binary.left(), env), resolve(binary.right(), env)));
    }
    if (e instanceof Expression.Call call) {
      String name = call.function().text();
      Op op = Op.function(name);
      if (op == null) {
        throw error(
            call.function().position(),
            "unknown function '" + name + "'; the functions are "
                + String.join(", ", Functions.names()) + ", and sum(set: ...)",
            NameSuggestion.hint(name, Functions.names()));
      }
      if (call.arguments().size() != op.arity()) {
        throw error(
            call.function().position(),
            name + " takes " + op.arity() + " argument" + (op.arity() == 1 ? "" : "s") + ", got "
                + call.arguments().size(),
            null);
      }
      List<Formula> parts = new ArrayList<>();
      for (Expression argument : call.arguments()) {
        parts.add(resolve(argument, env));
      }
      return Formulas.apply(op, parts);
    }
    if (e instanceof Expression.Sum sum) {
      String setName = sum.indexSet().text();
      IndexSet set = sets.get(setName);
      if (set == null) {
        throw error(
            sum.indexSet().position(),
            "unknown index set '" + setName + "' in sum",
            NameSuggestion.hint(setName, indexStatements.keySet()));
      }
      if (env.containsKey(setName)) {
        throw error(
            sum.indexSet().position(),
            "sum over '" + setName + "' inside an expression that already runs over '" + setName
                + "'",
            null);
      }
      List<Formula> terms = new ArrayList<>();
      Map<String, Integer> inner = new HashMap<>(env);
      for (int v = set.lower(); v <= set.upper(); v++) {
        inner.put(setName, v);
        terms.add(resolve(sum.body(), inner));
      }
      return Formulas.apply(Op.ADD, terms);
    }
    return resolveName((Expression.Name) e, env);
  }

  private Formula resolveName(Expression.Name reference, Map<String, Integer> env) {
    String name = reference.name().text();
    if (indexStatements.containsKey(name)) {
      if (!reference.indexes().isEmpty()) {
        throw error(reference.position(), "index set '" + name + "' cannot be indexed", null);
      }
      Integer value = env.get(name);
      if (value == null) {
        throw error(
            reference.position(),
            "index set '" + name + "' is not bound here; only "
                + (env.isEmpty() ? "the sets of the statement" : env.keySet().toString())
                + " can be used as values",
            null);
      }
      return Formula.constant(value);
    }
    Node node = nodes.get(name);
    if (node == null) {
      Set<String> valid = new TreeSet<>(nodes.keySet());
      valid.addAll(env.keySet());
      throw error(
          reference.position(),
          "unknown name '" + name + "'",
          NameSuggestion.hint(name, valid));
    }
    List<IndexSet> nodeSets = node.indexSets;
    if (nodeSets == null && node.kind == Node.Kind.DATA && node.target.indexSets().isEmpty()) {
      throw noScalarValue(node);
    }
    if (nodeSets == null) {
      // Only inline scalars are bound while index bounds are evaluated.
      throw error(
          reference.position(),
          "'" + name + "' cannot be used here: index bounds may use numbers and scalar data"
              + " only",
          null);
    }
    if (reference.indexes().size() != nodeSets.size()) {
      throw error(
          reference.position(),
          "'" + name + "' runs over " + setList(node.target.indexSets()) + " and needs "
              + nodeSets.size() + " index" + (nodeSets.size() == 1 ? "" : "es") + ", got "
              + reference.indexes().size(),
          nodeSets.isEmpty() ? "write " + name + " without brackets"
              : "write " + name + setList(node.target.indexSets()));
    }
    int[] index = new int[nodeSets.size()];
    for (int i = 0; i < index.length; i++) {
      Expression indexExpression = reference.indexes().get(i);
      IndexSet expected = nodeSets.get(i);
      if (indexExpression instanceof Expression.Name bare
          && bare.indexes().isEmpty()
          && indexStatements.containsKey(bare.name().text())
          && !bare.name().text().equals(expected.name())) {
        throw error(
            bare.position(),
            "'" + name + "' is indexed by '" + expected.name() + "' here, got index set '"
                + bare.name().text() + "'",
            "map one set to the other with integer data, as in " + name + "["
                + expected.name() + "_of[" + bare.name().text() + "]]");
      }
      Formula resolved = resolve(indexExpression, env);
      if (!(resolved instanceof Formula.Constant c)) {
        throw error(
            indexExpression.position(),
            "the index of '" + name + "' depends on an unknown; indexes must be known data",
            null);
      }
      double v = c.value();
      if (v != Math.rint(v)) {
        throw error(
            blame(c, indexExpression),
            "index " + v + " of '" + name + "' is not a whole number",
            "'" + name + "' is indexed by '" + expected.name() + "' (" + expected.range() + ")");
      }
      if (!expected.contains(v)) {
        throw error(
            blame(c, indexExpression),
            "index value " + (long) v + " is outside index set '" + expected.name() + "' ("
                + expected.range() + "), which indexes '" + name + "'",
            null);
      }
      index[i] = (int) v;
    }
    int offset = node.offset(index);
    switch (node.kind) {
      case DATA:
        if (node == replicated) {
          return slot(replicatedBase + offset);
        }
        if (node.missing[offset] && node.slots == null) {
          throw error(reference.position(), "'" + name + "' is missing and cannot be used"
              + " here", null);
        }
        if (node.missing[offset]) {
          return slot(node.slots[offset]);
        }
        return new Formula.Constant(node.values[offset], cells(node), offset);
      case PARAM:
        return slot(node.slots[offset]);
      default:
        Map<String, Integer> letEnv = new HashMap<>();
        for (int i = 0; i < index.length; i++) {
          letEnv.put(nodeSets.get(i).name(), index[i]);
        }
        if (replicated != null) {
          // Not cached: inside a check the checked name's elements are slots, not its data.
          return resolve(node.letValue, letEnv);
        }
        Formula[] cache = letCache.computeIfAbsent(node, k -> new Formula[k.size]);
        if (cache[offset] == null) {
          cache[offset] = resolve(node.letValue, letEnv);
        }
        return cache[offset];
    }
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
  private Formula.Slot slot(int index) {
    if (index >= slotFormulas.length) {
      slotFormulas = Arrays.copyOf(slotFormulas, Math.max(index + 1, 2 * slotFormulas.length));
    }
    if (slotFormulas[index] == null) {
      slotFormulas[index] = new Formula.Slot(index);
    }
    return slotFormulas[index];
  }

  // ---- terms ----

  private Result build() {
    List<String> labels = new ArrayList<>();
    List<String> nodeOfSlot = new ArrayList<>();
    List<Boolean> imputed = new ArrayList<>();
    // Params first, then missing observations, each in statement order.
    for (Node.Kind kind : List.of(Node.Kind.PARAM, Node.Kind.DATA)) {
      for (Node node : nodes.values()) {
        if (node.kind == kind && (kind == Node.Kind.PARAM || node.modelled())) {
          node.slots = new int[node.size];
          for (int e = 0; e < node.size; e++) {
            boolean unknown =
                kind == Node.Kind.PARAM || node.missing[e] && !censoredRow(node, e);
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
    // Lets are checked even when nothing uses them, so a fault in one never hides.
    DerivedQuantities.Builder derived = new DerivedQuantities.Builder();
    for (Node node : nodes.values()) {
      if (node.kind == Node.Kind.LET) {
        List<Formula> values = new ArrayList<>(node.size);
        for (int e = 0; e < node.size; e++) {
          values.add(resolveName(referenceTo(node, e), Map.of()));
        }
        chooseKept(node, values, derived);
      }
    }
    List<Term> terms = new ArrayList<>();
    int[] ownTerm = new int[labels.size()];
    java.util.Arrays.fill(ownTerm, -1);
    Map<String, Integer> counts = new LinkedHashMap<>();
    for (Node.Kind kind : Node.Kind.values()) {
      counts.put(kind.name().toLowerCase(java.util.Locale.ROOT), 0);
    }
    for (Node node : nodes.values()) {
      counts.merge(node.kindWord(), 1, Integer::sum);
      if (node.distribution == null) {
        continue;
      }
      for (int e = 0; e < node.size; e++) {
        Term term = term(node, e);
        if (term.owner() >= 0) {
          ownTerm[term.owner()] = terms.size();
        }
        terms.add(term);
      }
    }
    List<IndexSet> orderedSets = new ArrayList<>();
    for (String set : indexStatements.keySet()) {
      orderedSets.add(sets.get(set));
    }
    return new Result(
        modelName,
        source.fileName(),
        orderedSets,
        terms,
        labels,
        nodeOfSlot,
        imputed,
        ownTerm,
        summaries,
        counts,
        checks(labels.size()),
        derived.build());
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
        throw error(
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

  /** Binds every {@code check}: the one modelled data name it reads becomes slots from {@code base}. */
  private List<CheckFormula> checks(int base) {
    List<CheckFormula> bound = new ArrayList<>();
    for (Statement.Check check : checkStatements) {
      Set<Node> read = new LinkedHashSet<>();
      readThroughLets(check.value(), read, new HashSet<>());
      List<Node> modelled = read.stream().filter(n -> n.kind == Node.Kind.DATA && n.modelled()).toList();
      String name = check.name().text();
      if (modelled.size() != 1) {
        throw error(
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
        throw error(
            check.name().position(),
            "check '" + name + "' reads '" + modelled.get(0).name()
                + "', whose line is censored: a censored row has no observed value to compare",
            "check a data name without a 'censored' clause");
      }
      replicated = modelled.get(0);
      replicatedBase = base;
      try {
        bound.add(new CheckFormula(
            name, replicated.name(), base, resolve(check.value(), Map.of()), check.position()));
      } finally {
        replicated = null;
      }
    }
    return bound;
  }

  /** The nodes {@code e} names, and those named by the lets it reads, transitively. */
  private void readThroughLets(Expression e, Set<Node> into, Set<Node> visitedLets) {
    Set<Node> direct = new LinkedHashSet<>();
    collectNames(e, direct);
    for (Node node : direct) {
      into.add(node);
      if (node.kind == Node.Kind.LET && visitedLets.add(node)) {
        readThroughLets(node.letValue, into, visitedLets);
      }
    }
  }

  private static Expression.Name referenceTo(Node node, int e) {
    int[] index = node.index(e);
    List<Expression> indexes = new ArrayList<>();
    for (int i : index) {
      indexes.add(new Expression.Number(i, node.position()));
    }
    return new Expression.Name(node.target.name(), indexes, node.position());
  }

  private Term term(Node node, int e) {
    Map<String, Integer> env = new HashMap<>();
    int[] index = node.index(e);
    for (int i = 0; i < index.length; i++) {
      env.put(node.indexSets.get(i).name(), index[i]);
    }
    Parametrisation p = node.parametrisation;
    List<Formula> args = new ArrayList<>();
    boolean allKnown = true;
    Expression[] argumentExpressions = node.argumentExpressions;
    if (Categorical.takesVector(p)) {
      argumentExpressions = VectorArgument.expand(node.argumentExpressions[0], this::vectorSet,
          this::error);
      p = Categorical.withCategories(p, argumentExpressions.length);
    }
    for (Expression a : argumentExpressions) {
      Formula f = resolve(a, env);
      args.add(f);
      allKnown &= f.known();
    }
    double[] known = new double[args.size()];
    for (int k = 0; k < known.length; k++) {
      known[k] = args.get(k) instanceof Formula.Constant c ? c.value() : Double.NaN;
    }
    for (int k = 0; k < known.length; k++) {
      String problem = args.get(k) instanceof Formula.Constant c ? p.checkArgument(k, c.value())
          : null;
      if (problem != null) {
        SourcePosition origin = ((Formula.Constant) args.get(k)).origin();
        throw error(
            origin != null ? origin : argumentExpressions[k].position(),
            "invalid arguments of " + p.family().name() + " for '" + node.label(e) + "': " + problem,
            null);
      }
    }
    if (allKnown) {
      String problem = p.checkArguments(known);
      if (problem != null) {
        throw error(
            node.argumentExpressions[0].position(),
            "invalid arguments of " + p.family().name() + " for '" + node.label(e) + "': " + problem,
            null);
      }
    }
    double lower = Double.NEGATIVE_INFINITY;
    double upper = Double.POSITIVE_INFINITY;
    boolean truncated = node.distribution.truncation() != null;
    if (truncated) {
      lower = knownBound(node.distribution.truncation().lower(), env, "lower");
      upper = knownBound(node.distribution.truncation().upper(), env, "upper");
      if (!(lower < upper)) {
        throw error(
            node.distribution.truncation().position(),
            "within " + number(lower) + " .. " + number(upper) + " is empty; the lower bound must be below the"
                + " upper",
            null);
      }
    }
    if (censoredRow(node, e)) {
      return censoring(node).term(
          node.names(), e, args, truncated ? new Term.Within(lower, upper) : null, env,
          node.position());
    }
    int slot = node.slots[e];
    Formula value;
    if (slot >= 0) {
      value = slot(slot);
    } else {
      double y = node.values[e];
      value = Formula.constant(y);
      String problem = outsideSupport(y, p, known, allKnown);
      if (problem == null && truncated && !(y >= lower && y <= upper)) {
        problem = "it lies outside within " + number(lower) + " .. " + number(upper);
      }
      if (problem != null) {
        SourcePosition cell = cellOf(node, e);
        SourcePosition at = cell != null ? cell : node.position();
        throw error(at, "'" + node.label(e) + "' = " + number(y) + " is not a valid value of "
            + p.family().name() + ": " + problem, null);
      }
    }
    return new Term(
        node.names(), e, slot >= 0 ? null : cells(node), p, value, args, truncated ? new Term.Within(lower, upper) : null, slot,
        node.position());
  }

  /** The censored rows of {@code node}, or {@code null} when its line has no censored clause. */
  private CensoredRows censoring(Node node) {
    if (!(node.statement instanceof Statement.Data data) || data.censoring() == null) {
      return null;
    }
    return censoredRows.computeIfAbsent(
        node, n -> CensoredRows.of(data.censoring(), n.parametrisation, this::resolve, this::error));
  }

  /** True when element {@code e} of modelled data {@code node} is a censored row. */
  private boolean censoredRow(Node node, int e) {
    CensoredRows rows = censoring(node);
    if (rows == null) {
      return false;
    }
    Map<String, Integer> env = new HashMap<>();
    int[] index = node.index(e);
    for (int i = 0; i < index.length; i++) {
      env.put(node.indexSets.get(i).name(), index[i]);
    }
    return rows.censored(env, node.label(e));
  }

  /** The one index set of the node called {@code name}, for {@link VectorArgument}. */
  private VectorArgument.Shape vectorSet(String name) {
    Node node = nodes.get(name);
    if (node == null || node.indexSets == null) {
      return null;
    }
    List<IndexSet> list = node.indexSets;
    return new VectorArgument.Shape(node.kindWord(), list.size(),
        list.isEmpty() ? null : list.get(0));
  }

  private double knownBound(Expression e, Map<String, Integer> env, String which) {
    Formula f = resolve(e, env);
    if (!(f instanceof Formula.Constant c)) {
      throw error(e.position(), "the " + which + " bound of within must be known (data or a"
          + " number), not depend on an unknown", null);
    }
    return c.value();
  }

  /** Why {@code y} lies outside the support of {@code p}, or {@code null} when it does not. */
  static String outsideSupport(double y, Parametrisation p, double[] known, boolean allKnown) {
    boolean whole = y == Math.rint(y);
    String family = p.family().name();
    SupportKind kind = p.support();
    String problem =
        switch (kind) {
          case REAL -> null;
          case POSITIVE -> y > 0 ? null : "it must be > 0";
          case UNIT_INTERVAL -> y > 0 && y < 1 ? null : "it must lie strictly between 0 and 1";
          case BETWEEN_FIRST_TWO_ARGUMENTS -> !Double.isNaN(known[0]) && !(y >= known[0])
              || !Double.isNaN(known[1]) && !(y <= known[1])
              ? "it must lie between " + number(known[0]) + " and " + number(known[1]) : null;
          case COUNT -> !whole ? "it is not a whole number, and " + family + " needs a count"
              : y < 0 ? "it is negative, and " + family + " needs a count 0, 1, 2, ..." : null;
          case COUNT_UP_TO_FIRST_ARGUMENT -> !whole
              ? "it is not a whole number, and " + family + " needs a count"
              : y < 0 ? "it is negative, and " + family + " needs a count 0, 1, 2, ..."
              : !Double.isNaN(known[0]) && y > known[0]
                  ? "it exceeds " + p.argumentNames().get(0) + " = " + number(known[0]) : null;
          case BINARY -> y == 0 || y == 1 ? null : "it must be 0 or 1";
          case WHOLE_BETWEEN_FIRST_TWO_ARGUMENTS, CATEGORY -> !whole
              ? "it is not a whole number, and " + family + " needs one" : null;
        };
    if (problem == null && allKnown) {
      problem = p.checkValue(y, known);
    }
    return problem;
  }

  static String number(double v) {
    return NumberSyntax.written(v);
  }

  private ModelException error(SourcePosition position, String problem, String hint) {
    if (position.file().equals(source.fileName())) {
      return ModelException.at(source, position, problem, hint);
    }
    return new ModelException(position, null, problem, hint);
  }
}

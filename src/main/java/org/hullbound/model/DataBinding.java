package org.hullbound.model;

import static org.hullbound.model.BindingScope.columnBase;
import static org.hullbound.model.BindingScope.setList;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.function.IntUnaryOperator;
import org.hullbound.lang.Identifier;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.NameSuggestion;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.lang.SourcePosition;
import org.hullbound.lang.Statement;

/**
 * The data phase of binding: scalars (inline and from files of scalars), the headers of the data
 * files (which size the index sets their rows run over), every data element's value and flags,
 * the per-file summaries, and where each element was written ({@link #cells}) for messages.
 */
final class DataBinding {
  private final BindingScope scope;
  /** The tables read; let go once binding is over ({@link #bound}). */
  private List<DataTable> tables;
  private final EmptyCells emptyCells;
  private final List<DataSummary> summaries = new ArrayList<>();
  private final Map<Node, List<ColumnBinding>> fileColumns = new LinkedHashMap<>();
  private final Map<Node, Formula.Cells> cellsOf = new HashMap<>();

  DataBinding(BindingScope scope, List<DataTable> tables, EmptyCells emptyCells) {
    this.scope = scope;
    this.tables = List.copyOf(tables);
    this.emptyCells = emptyCells;
  }

  /**
   * Binding is over: the cells of every data name are worked out now, and the tables let go, as
   * the model keeps only the values it reads (in their nodes) and the row lines (in the cells);
   * a table holds every column read besides, about 9.6 bytes per row and column (issue 14).
   */
  void bound() {
    for (Node node : scope.nodes.values()) {
      if (node.kind == Node.Kind.DATA && node.values != null) {
        cells(node);
      }
    }
    fileColumns.clear();
    tables = List.of();
  }

  /** One line per data source read, with its count of missing cells once values are bound. */
  List<DataSummary> summaries() {
    return summaries;
  }

  void bindInlineScalars() {
    for (Node node : scope.nodes.values()) {
      if (node.kind == Node.Kind.DATA && node.inline != null && node.target.indexSets().isEmpty()) {
        if (node.inline.size() != 1) {
          throw scope.error(
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
            throw scope.error(
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
  void bindFileScalars() {
    for (DataTable table : tables) {
      for (int j = 0; j < table.header().size(); j++) {
        String header = table.header().get(j).trim();
        Node node = scope.nodes.get(header);
        if (node == null || node.kind != Node.Kind.DATA || node.inline != null
            || !node.target.indexSets().isEmpty()) {
          continue;
        }
        SourcePosition at = new SourcePosition(table.fileName(), 1, j + 1);
        if (node.values != null) {
          throw scope.error(
              at,
              "column '" + header + "' is in both " + node.source + " and " + table.fileName(),
              "give each column in one data file only");
        }
        for (String other : table.header()) {
          Node vector = scope.nodes.get(columnBase(other.trim()));
          if (vector != null && vector.kind == Node.Kind.DATA
              && !vector.target.indexSets().isEmpty()) {
            throw mixedScalarFile(
                at, header, other.trim(), vector.target.indexSets().get(0).text());
          }
        }
        if (table.rowCount() != 1) {
          throw scope.error(
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
    return scope.error(
        at,
        "'" + scalar + "' is a scalar but column '" + vectorColumn + "' of the same file runs"
            + " over '" + set + "'",
        "give scalars in a file of their own, their names in the header and their values in one"
            + " row, or inline: data " + scalar + " = 5");
  }

  ModelException notANumber(DataColumn column, String header, SourcePosition at) {
    String cell = column.firstInvalidText();
    String reason = "is not a finite number";
    try {
      NumberSyntax.parse(cell);
    } catch (NumberSyntax.InvalidNumberException ex) {
      reason = ex.reason();
    }
    String separator = cell.contains(";") ? "';'" : cell.contains("\t") ? "a tab" : null;
    return scope.error(
        at,
        "'" + NumberSyntax.shortened(cell) + "' in column '" + header + "' " + reason,
        separator != null
            ? "the cell holds " + separator + ": hullbound reads comma-separated files; separate"
                + " the cells with commas"
            : "write a finite number (" + NumberSyntax.FORMS + "), or NA (or leave the cell"
                + " empty) for a missing observation");
  }


  /** Where one column of a data file goes: its node and the trailing index values. */
  private record ColumnBinding(DataTable table, int column, Node node, int[] trailing) {}

  void readTableHeaders() {
    Map<String, String> setRowsFrom = new HashMap<>();
    Map<String, Integer> setRows = new HashMap<>();
    Map<String, Integer> trailingMax = new HashMap<>();
    Map<String, String> fileOfColumn = new HashMap<>();
    Set<String> dataNames = new TreeSet<>();
    for (Node n : scope.nodes.values()) {
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
          throw scope.error(at, "column '" + header + "' appears twice in the header", null);
        }
        String base = columnBase(header);
        int[] trailing = new int[0];
        int bracket = header.indexOf('[');
        if (bracket >= 0) {
          trailing = parseColumnIndexes(header, bracket, at);
        }
        Node node = scope.nodes.get(base);
        if (node == null || node.kind != Node.Kind.DATA) {
          String what =
              node == null
                  ? "is not a data name of the model"
                  : "names a " + node.kindWord() + ", and only data is read from files";
          String separator =
              header.contains(";") ? "';'" : header.contains("\t") ? "a tab" : null;
          throw scope.error(
              at,
              "column '" + header + "' " + what + "; the data names are " + dataNames,
              separator != null
                  ? "the header cell holds " + separator + ": hullbound reads comma-separated"
                      + " files; separate the cells with commas"
                  : node == null ? NameSuggestion.hint(base, dataNames) : null);
        }
        if (node.inline != null) {
          throw scope.error(
              at,
              "'" + base + "' is given inline at line " + node.position().line()
                  + " and again as a column of " + table.fileName(),
              null);
        }
        List<Identifier> nodeSets = node.target.indexSets();
        if (nodeSets.isEmpty()) {
          // Bound already, in a file of scalars only (bindFileScalars).
          if (trailing.length != 0) {
            throw scope.error(at, "'" + base + "' is a scalar, so its column is named '" + base
                + "'; got '" + header + "'", null);
          }
          scalarFile = true;
          columnNames.add(header);
          continue;
        }
        if (trailing.length != nodeSets.size() - 1) {
          throw scope.error(
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
          throw scope.error(
              at,
              "column '" + header + "' runs over '" + set + "' but column '" + fileSetColumn
                  + "' of this file runs over '" + fileSet + "'",
              "give one file per index set");
        }
        for (int t = 0; t < trailing.length; t++) {
          String trailingSet = nodeSets.get(t + 1).text();
          IndexSet bound = scope.sets.get(trailingSet);
          if (bound != null && !bound.contains(trailing[t])) {
            throw scope.error(
                at,
                "column '" + header + "': " + trailing[t] + " is outside index set '"
                    + trailingSet + "' (" + bound.range() + ")",
                null);
          }
          if (bound == null) {
            if (trailing[t] < 1) {
              throw scope.error(at, "column '" + header + "': index values of '" + trailingSet
                  + "' start at 1", null);
            }
            trailingMax.merge(trailingSet, trailing[t], Math::max);
          }
        }
        String earlierFile =
            fileOfColumn.putIfAbsent(base + Arrays.toString(trailing), table.fileName());
        if (earlierFile != null && !earlierFile.equals(table.fileName())) {
          // Reading both would let the order of the --data options decide which values count.
          throw scope.error(
              at,
              "column '" + header + "' is in both " + earlierFile + " and " + table.fileName(),
              "give each column in one data file only");
        }
        fileColumns.computeIfAbsent(node, k -> new ArrayList<>())
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
      IndexSet bound = scope.sets.get(fileSet);
      SourcePosition fileStart = new SourcePosition(table.fileName(), 1, 1);
      if (bound != null) {
        if (bound.size() != rows) {
          throw scope.error(
              fileStart,
              table.fileName() + " has " + rows + " data rows but index set '" + fileSet + "' is "
                  + bound.range() + " (" + bound.size() + " elements)",
              "one row per element of '" + fileSet + "'");
        }
      } else {
        Integer earlier = setRows.putIfAbsent(fileSet, rows);
        if (earlier != null && earlier != rows) {
          throw scope.error(
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
        throw scope.error(
            new SourcePosition(setRowsFrom.get(entry.getKey()), 1, 1),
            setRowsFrom.get(entry.getKey()) + " has no data rows, so index set '"
                + entry.getKey() + "' would be empty",
            null);
      }
      scope.sets.put(
          entry.getKey(),
          new IndexSet(entry.getKey(), 1, entry.getValue(), setRowsFrom.get(entry.getKey())));
    }
    for (Map.Entry<String, Integer> entry : trailingMax.entrySet()) {
      if (!scope.sets.containsKey(entry.getKey())) {
        scope.sets.put(
            entry.getKey(), new IndexSet(entry.getKey(), 1, entry.getValue(), "columns"));
      }
    }
  }

  private int[] parseColumnIndexes(String header, int bracket, SourcePosition at) {
    if (!header.endsWith("]")) {
      throw scope.error(
          at, "column '" + header + "' has an unclosed '['", "write columns as X[1], X[2]");
    }
    String[] pieces = header.substring(bracket + 1, header.length() - 1).split(",");
    int[] indexes = new int[pieces.length];
    for (int i = 0; i < pieces.length; i++) {
      try {
        indexes[i] = Integer.parseInt(pieces[i].trim());
      } catch (NumberFormatException e) {
        throw scope.error(
            at,
            "column '" + header + "': '" + pieces[i].trim() + "' is not a whole number",
            "write columns as X[1], X[2]");
      }
    }
    return indexes;
  }

  private static String exampleColumns(String base, int dims) {
    if (dims == 1) {
      return "'" + base + "'";
    }
    String tail = dims == 2 ? "" : ", 1".repeat(dims - 2);
    return "'" + base + "[1" + tail + "]', '" + base + "[2" + tail + "]', ...";
  }

  void bindDataValues() {
    for (Node node : scope.nodes.values()) {
      if (node.kind == Node.Kind.DATA && node.target.indexSets().isEmpty() && node.values == null) {
        throw noScalarValue(node);
      }
      if (node.kind != Node.Kind.DATA || node.target.indexSets().isEmpty()) {
        continue;
      }
      allocate(node, node.inline != null ? "inline" : null);
      if (node.inline != null) {
        if (node.inline.size() != node.size) {
          throw scope.error(
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
      List<ColumnBinding> bindings = fileColumns.getOrDefault(node, List.of());
      if (bindings.isEmpty()) {
        throw scope.error(
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
          throw scope.error(
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
      for (Node node : scope.nodes.values()) {
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
  ModelException noScalarValue(Node node) {
    return scope.error(
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
    return scope.error(
        at,
        "empty cell in column '" + header + "' for '" + node.label(e) + "'; empty cells of"
            + " modelled data are refused in this run, not imputed",
        "fill in the value, or write NA where the observation is missing so that it is imputed");
  }

  private ModelException missingCovariate(Node node, int e, SourcePosition at, String shown) {
    return scope.error(
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
  SourcePosition cellOf(Node node, int e) {
    return cells(node).at(e);
  }

  /** The cells of data {@code node}, one instance per node, shared by all its constants. */
  Formula.Cells cells(Node node) {
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

}

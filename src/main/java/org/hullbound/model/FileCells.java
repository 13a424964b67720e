package org.hullbound.model;

import java.util.Arrays;
import java.util.List;
import java.util.function.IntUnaryOperator;
import org.hullbound.lang.SourcePosition;

/**
 * The cells of a data name read from files; holds the tables' row lines (shared, not copied),
 * not the tables, so that a bound model does not keep its data files' values alive.
 */
record FileCells(ElementNames names, List<Column> columns) implements Formula.Cells {
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

package org.hullbound.model;

import java.util.List;

/**
 * One data file as read, before binding: its name, its header cells and its rows of cell texts,
 * each row with the line of the file it came from.
 *
 * <p>Kept as text so that binding can say exactly which cell is wrong (file, line, column) and
 * so that the reading of CSV (package {@code io}) stays apart from the meaning of the columns.
 */
public record DataTable(String fileName, List<String> header, List<Row> rows) {
  public DataTable {
    if (fileName == null) {
      throw new IllegalArgumentException("fileName must not be null");
    }
    header = List.copyOf(header);
    rows = List.copyOf(rows);
  }

  /** A data row: the 1-based line of the file it starts on and its cells, as many as the header. */
  public record Row(int line, List<String> cells) {
    public Row {
      cells = List.copyOf(cells);
    }
  }

  /** A table with rows numbered as if the header were line 1 and each row one line below. */
  public static DataTable of(String fileName, List<String> header, List<List<String>> cells) {
    List<Row> rows = new java.util.ArrayList<>();
    for (int r = 0; r < cells.size(); r++) {
      rows.add(new Row(r + 2, cells.get(r)));
    }
    return new DataTable(fileName, header, rows);
  }
}

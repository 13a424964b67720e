package org.hullbound.model;

import java.util.Arrays;
import java.util.List;
import java.util.function.IntUnaryOperator;
import java.util.function.Predicate;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.SourcePosition;

/**
 * One data file as read, before binding: its name, its header cells, the line each row starts on,
 * and the columns the model reads as {@link DataColumn}s of numbers.
 *
 * <p>Columns the reader was told to skip are not held at all (their cells were only counted, so
 * every row still has as many cells as the header): a file of many million rows costs 8 bytes a
 * row per column the model names plus 4 for the row's line. The lines let binding say exactly
 * which cell is wrong (file, line, column); what the columns mean is the binder's job, apart from
 * the reading of CSV (package {@code io}).
 *
 * <table>
 *   <caption>Factories</caption>
 *   <tr><td>{@link #builder(String, List, Predicate)}</td><td>row by row, for a reader</td></tr>
 *   <tr><td>{@link #of(String, List, List)}</td><td>from cell texts, every column held</td></tr>
 * </table>
 */
public final class DataTable {
  private static final int CHUNK_BITS = DataColumn.CHUNK_BITS;
  private static final int CHUNK = DataColumn.CHUNK;

  private final String fileName;
  private final List<String> header;
  private final int[][] lineChunks;
  private final int rowCount;
  private final DataColumn[] columns;

  private DataTable(
      String fileName, List<String> header, int[][] lineChunks, int rowCount,
      DataColumn[] columns) {
    this.fileName = fileName;
    this.header = header;
    this.lineChunks = lineChunks;
    this.rowCount = rowCount;
    this.columns = columns;
  }

  /**
   * Starts a table of the file {@code fileName} whose header row is {@code header}; the columns
   * whose header cell {@code holds} accepts are kept.
   */
  public static Builder builder(String fileName, List<String> header, Predicate<String> holds) {
    if (fileName == null || header == null || holds == null) {
      throw new IllegalArgumentException("fileName, header and holds must not be null");
    }
    return new Builder(fileName, header, holds);
  }

  /**
   * A table with every column held and rows numbered as if the header were line 1 and each row
   * one line below.
   *
   * @throws ModelException when a row has not as many cells as the header
   */
  public static DataTable of(String fileName, List<String> header, List<List<String>> cells) {
    Builder builder = builder(fileName, header, column -> true);
    for (int r = 0; r < cells.size(); r++) {
      List<String> row = cells.get(r);
      for (int j = 0; j < Math.min(row.size(), header.size()); j++) {
        builder.cell(j, row.get(j));
      }
      builder.endRow(r + 2, row.size());
    }
    return builder.build();
  }

  public String fileName() {
    return fileName;
  }

  /** The header cells, as read (a reader trims them). */
  public List<String> header() {
    return header;
  }

  /** The number of data rows (the header not counted). */
  public int rowCount() {
    return rowCount;
  }

  /** The 1-based line of the file that data row {@code row} (0-based) starts on. */
  public int line(int row) {
    if (row < 0 || row >= rowCount) {
      throw new IndexOutOfBoundsException("row " + row + " of " + rowCount);
    }
    return lineChunks[row >>> CHUNK_BITS][row & (CHUNK - 1)];
  }

  /**
   * The line of each data row, as {@link #line}, reading the table's row lines (not a copy) and
   * holding nothing else of the table.
   */
  IntUnaryOperator lines() {
    int[][] chunks = lineChunks;
    return row -> chunks[row >>> CHUNK_BITS][row & (CHUNK - 1)];
  }

  /** Whether column {@code column} (0-based, as in the header) was kept when reading. */
  public boolean holds(int column) {
    return column >= 0 && column < columns.length && columns[column] != null;
  }

  /** The number of columns kept. */
  public int heldColumnCount() {
    int held = 0;
    for (DataColumn c : columns) {
      held += c == null ? 0 : 1;
    }
    return held;
  }

  /**
   * Column {@code column} (0-based, as in the header).
   *
   * @throws IllegalArgumentException when the column was not kept
   */
  public DataColumn column(int column) {
    if (!holds(column)) {
      throw new IllegalArgumentException(
          "column " + (column + 1) + " of " + fileName + " was not kept when reading");
    }
    return columns[column];
  }

  /** This table with the cell in {@code rows[k]}, {@code columnsOf[k]} set to {@code values[k]}. */
  public DataTable withNumbers(int[] rows, int[] columnsOf, double[] values) {
    if (rows.length != columnsOf.length || rows.length != values.length) {
      throw new IllegalArgumentException("rows, columnsOf and values must have one length");
    }
    DataColumn[] changed = columns.clone();
    for (int j = 0; j < columns.length; j++) {
      int count = 0;
      for (int c : columnsOf) {
        count += c == j ? 1 : 0;
      }
      if (count == 0) {
        continue;
      }
      int[] columnRows = new int[count];
      double[] columnValues = new double[count];
      int at = 0;
      for (int k = 0; k < rows.length; k++) {
        if (columnsOf[k] == j) {
          columnRows[at] = rows[k];
          columnValues[at++] = values[k];
        }
      }
      changed[j] = column(j).withNumbers(columnRows, columnValues);
    }
    return new DataTable(fileName, header, lineChunks, rowCount, changed);
  }

  /** Collects a table row by row: the cells of the held columns, then the row's end. */
  public static final class Builder {
    private final String fileName;
    private final List<String> header;
    private final DataColumn.Builder[] columns;
    private int[][] lineChunks = new int[4][];
    private int rowCount;

    private Builder(String fileName, List<String> header, Predicate<String> holds) {
      this.fileName = fileName;
      this.header = List.copyOf(header);
      this.columns = new DataColumn.Builder[header.size()];
      for (int j = 0; j < columns.length; j++) {
        columns[j] = holds.test(header.get(j).trim()) ? new DataColumn.Builder() : null;
      }
    }

    /** Whether cells of column {@code column} are to be given to {@link #cell}. */
    public boolean holds(int column) {
      return column < columns.length && columns[column] != null;
    }

    /** The text of the current row's cell in held column {@code column}. */
    public void cell(int column, String text) {
      if (columns[column] != null) {
        columns[column].add(text);
      }
    }

    /**
     * Ends the current row, which starts on {@code line} and had {@code cellCount} cells.
     *
     * @throws ModelException when {@code cellCount} is not the header's
     */
    public void endRow(int line, int cellCount) {
      if (cellCount != header.size()) {
        int column = Math.min(cellCount, header.size()) + 1;
        throw new ModelException(
            new SourcePosition(fileName, line, column),
            null,
            "this row has " + cellCount + " cells but the header has " + header.size()
                + " columns, so the column lengths disagree",
            "every row needs one cell per column; leave a cell empty or write NA when it is"
                + " missing");
      }
      lineChunks = DataColumn.withChunk(lineChunks, rowCount >>> CHUNK_BITS, () -> new int[CHUNK]);
      lineChunks[rowCount >>> CHUNK_BITS][rowCount & (CHUNK - 1)] = line;
      rowCount++;
    }

    public DataTable build() {
      DataColumn[] built = new DataColumn[columns.length];
      for (int j = 0; j < columns.length; j++) {
        built[j] = columns[j] == null ? null : columns[j].build();
      }
      int used = (rowCount + CHUNK - 1) >>> CHUNK_BITS;
      return new DataTable(
          fileName, header, Arrays.copyOf(lineChunks, used), rowCount, built);
    }
  }
}

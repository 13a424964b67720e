package org.hullbound.io;

import java.io.IOException;
import java.io.Reader;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Predicate;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.SourcePosition;
import org.hullbound.model.DataTable;

/**
 * Reads a data file (CSV with a header row, RFC 4180) into a {@link DataTable} for binding,
 * streaming: the file is never held as text, and only the columns asked for are kept, as numbers.
 *
 * <p>Each row keeps the line it starts on, so that every later complaint can name the file, the
 * line and the cell. A row with a different number of cells than the header is reported here,
 * where the shape is known, for skipped columns too; what the columns mean is the binder's job.
 *
 * <p>Cells are split by {@link CsvRecords}, a tokenizer written for this rather than commons-csv's
 * parser: it counts lines itself (a row's line is exact across quoted line breaks and skipped
 * blank lines, with no table of line starts), names the line and cell of a quote never closed,
 * and makes no string for a cell of a skipped column.
 */
public final class CsvData {

  private CsvData() {}

  /**
   * Reads {@code file} keeping every column; its name as given is used in messages.
   *
   * @throws UncheckedIOException when the file cannot be read
   * @throws ModelException when it is not valid CSV or a row is ragged
   */
  public static DataTable read(Path file) {
    return read(file, column -> true);
  }

  /**
   * Reads {@code file} keeping the columns whose header cell {@code keep} accepts (as from {@code
   * BoundModel.readsColumn}); the others are checked for shape only.
   *
   * @throws UncheckedIOException when the file cannot be read
   * @throws ModelException when it is not valid CSV or a row is ragged
   */
  public static DataTable read(Path file, Predicate<String> keep) {
    try (Reader reader = TextFiles.openUtf8(file, "data file")) {
      return parse(file.toString(), reader, keep);
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read data file " + file + ": " + e.getMessage(), e);
    }
  }

  /** Reads CSV {@code text} as if it were the file {@code fileName}, keeping every column. */
  public static DataTable parse(String fileName, String text) {
    return parse(fileName, text, column -> true);
  }

  /**
   * Reads CSV {@code text} as if it were the file {@code fileName}, keeping the columns {@code
   * keep} accepts, as {@link #read(Path, Predicate)} does for a file.
   */
  public static DataTable parse(String fileName, String text, Predicate<String> keep) {
    return parse(fileName, new StringReader(text), keep);
  }

  /** A record of a CSV file as text: the line it starts on and its trimmed cells. */
  public record TextRow(int line, List<String> cells) {
    public TextRow {
      cells = List.copyOf(cells);
    }
  }

  /**
   * Every record of a small CSV file as text, the header first, for files of names and words
   * rather than data (such as a validation case's reference values).
   *
   * @throws UncheckedIOException when the file cannot be read
   * @throws ModelException when it is not valid CSV
   */
  public static List<TextRow> readText(Path file) {
    List<TextRow> rows = new ArrayList<>();
    List<String> cells = new ArrayList<>();
    CsvRecords.Sink sink =
        new CsvRecords.Sink() {
          @Override
          public boolean wants(int column) {
            return true;
          }

          @Override
          public void cell(int column, String text) {
            cells.add(text.trim());
          }

          @Override
          public void endRecord(int line, int cellCount) {
            rows.add(new TextRow(line, cells));
            cells.clear();
          }
        };
    try (Reader reader = TextFiles.openUtf8(file, "file")) {
      CsvRecords.read(reader, file.toString(), sink);
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read " + file + ": " + e.getMessage(), e);
    }
    return rows;
  }

  private static DataTable parse(String fileName, Reader reader, Predicate<String> keep) {
    TableSink sink = new TableSink(fileName, keep);
    try {
      CsvRecords.read(reader, fileName, sink);
    } catch (IOException e) {
      throw new UncheckedIOException(
          "cannot read data file " + fileName + ": " + e.getMessage(), e);
    }
    if (sink.table == null) {
      throw new ModelException(
          new SourcePosition(fileName, 1, 1), null, "the data file is empty; a header row is"
              + " needed", null);
    }
    return sink.table.build();
  }

  /**
   * A header of one cell holding ';' or a tab is a file written with another separator: say so,
   * before its one long column name is read as a model name.
   */
  private static String otherSeparator(List<String> header) {
    if (header.size() != 1) {
      return null;
    }
    if (header.get(0).contains(";")) {
      return "';'";
    }
    return header.get(0).contains("\t") ? "tabs" : null;
  }

  /** Takes the first record as the header, then hands the kept cells of each row to a table. */
  private static final class TableSink implements CsvRecords.Sink {
    private final String fileName;
    private final Predicate<String> keep;
    private final List<String> header = new ArrayList<>();
    private DataTable.Builder table;

    TableSink(String fileName, Predicate<String> keep) {
      this.fileName = fileName;
      this.keep = keep;
    }

    @Override
    public boolean wants(int column) {
      return table == null || table.holds(column);
    }

    @Override
    public void cell(int column, String text) {
      if (table == null) {
        header.add(text.trim());
      } else {
        table.cell(column, text);
      }
    }

    private void requireCommas(int line) {
      String separator = otherSeparator(header);
      if (separator != null) {
        throw new ModelException(
            new SourcePosition(fileName, line, 1), null,
            "the header holds " + separator + " but no ','; hullbound reads"
                + " comma-separated files",
            "separate the cells with commas, as in x,y (a spreadsheet saves this as CSV with"
                + " comma as the separator)");
      }
    }

    @Override
    public void endRecord(int line, int cellCount) {
      if (table == null) {
        requireCommas(line);
        table = DataTable.builder(fileName, header, keep);
      } else {
        table.endRow(line, cellCount);
      }
    }
  }
}

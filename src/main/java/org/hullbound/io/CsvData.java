package org.hullbound.io;

import java.io.IOException;
import java.io.Reader;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.SourcePosition;
import org.hullbound.model.DataTable;

/**
 * Reads a data file (CSV with a header row, RFC 4180) into a {@link DataTable} for binding.
 *
 * <p>Cells stay text, each row keeps the line it starts on, so that every later complaint can
 * name the file, the line and the cell. A row with a different number of cells than the header
 * is reported here, where the shape is known; what the columns mean is the binder's job.
 */
public final class CsvData {

  private static final CSVFormat FORMAT =
      CSVFormat.RFC4180.builder().setIgnoreEmptyLines(true).setTrim(true).get();

  private CsvData() {}

  /**
   * Reads {@code file}; its name as given is used in messages.
   *
   * @throws UncheckedIOException when the file cannot be read
   * @throws ModelException when it is not valid CSV or a row is ragged
   */
  public static DataTable read(Path file) {
    return parse(file.toString(), TextFiles.readUtf8(file, "data file"));
  }

  /** Reads CSV {@code text} as if it were the file called {@code fileName}. */
  public static DataTable parse(String fileName, String text) {
    if (text.startsWith("\uFEFF")) {
      text = text.substring(1);
    }
    int[] lineStarts = lineStarts(text);
    List<String> header = null;
    List<DataTable.Row> rows = new ArrayList<>();
    try (Reader reader = new StringReader(text);
        CSVParser parser = CSVParser.builder().setReader(reader).setFormat(FORMAT).get()) {
      for (CSVRecord record : parser) {
        int line = lineOf(lineStarts, firstNonBlank(text, record.getCharacterPosition()));
        List<String> cells = record.toList();
        if (header == null) {
          header = cells;
          continue;
        }
        if (cells.size() != header.size()) {
          int column = Math.min(cells.size(), header.size()) + 1;
          throw new ModelException(
              new SourcePosition(fileName, line, column),
              null,
              "this row has " + cells.size() + " cells but the header has " + header.size()
                  + " columns, so the column lengths disagree",
              "every row needs one cell per column; leave a cell empty or write NA when it is"
                  + " missing");
        }
        rows.add(new DataTable.Row(line, cells));
      }
    } catch (IOException | UncheckedIOException | IllegalStateException e) {
      throw CsvQuotes.error(fileName, text, e);
    }
    if (header == null) {
      throw new ModelException(
          new SourcePosition(fileName, 1, 1), null, "the data file is empty; a header row is"
              + " needed", null);
    }
    return new DataTable(fileName, header, rows);
  }

  private static int[] lineStarts(String text) {
    List<Integer> starts = new ArrayList<>();
    starts.add(0);
    for (int i = 0; i < text.length(); i++) {
      char c = text.charAt(i);
      if (c == '\n' || (c == '\r' && (i + 1 >= text.length() || text.charAt(i + 1) != '\n'))) {
        starts.add(i + 1);
      }
    }
    return starts.stream().mapToInt(Integer::intValue).toArray();
  }

  /** Skips the blank lines the parser passed over before the record it reports at position. */
  private static long firstNonBlank(String text, long position) {
    int at = (int) position;
    while (at < text.length() && (text.charAt(at) == '\n' || text.charAt(at) == '\r')) {
      at++;
    }
    return at;
  }

  private static int lineOf(int[] lineStarts, long position) {
    int at = Arrays.binarySearch(lineStarts, (int) position);
    return (at >= 0 ? at : -at - 2) + 1;
  }
}

package org.hullbound.io;

import java.io.IOException;
import java.io.Reader;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.SourcePosition;

/**
 * Splits CSV text (RFC 4180) into records as it streams past, handing each wanted cell's text and
 * each record's end, with the line the record starts on, to a {@link Sink}.
 *
 * <p>Reads as commons-csv's RFC 4180 format with trimmed cells and empty lines ignored, which this
 * replaces for data files: cells split at commas; a cell that starts with a quote runs to the
 * matching quote, a doubled quote standing for one, and may hold commas and line breaks; after
 * the closing quote only blanks may come before the comma or the line's end; a line with nothing
 * on it is skipped; line breaks are LF, CRLF or a lone CR, each one line. A leading byte-order
 * mark is dropped. Cells the sink does not want are passed over without making a string.
 */
final class CsvRecords {

  /** Receives the records of one file. */
  interface Sink {
    /** Whether the text of cell {@code column} (0-based) of the current record is needed. */
    boolean wants(int column);

    /** The untrimmed text of wanted cell {@code column} of the current record. */
    void cell(int column, String text);

    /** The end of the record that starts on {@code line} (1-based) and had {@code cellCount}. */
    void endRecord(int line, int cellCount);
  }

  private static final int END = -1;

  private final Reader in;
  private final String fileName;
  private final char[] buffer = new char[1 << 16];
  private final StringBuilder cell = new StringBuilder();
  private int position;
  private int limit;
  private int line = 1;

  private CsvRecords(Reader in, String fileName) {
    this.in = in;
    this.fileName = fileName;
  }

  /**
   * Reads every record of {@code in} into {@code sink}.
   *
   * @throws ModelException naming the line and cell when a quoted cell is never closed or is
   *     followed by more than blanks
   */
  static void read(Reader in, String fileName, Sink sink) throws IOException {
    new CsvRecords(in, fileName).run(sink);
  }

  private void run(Sink sink) throws IOException {
    int c = next();
    if (c == '\uFEFF') {
      c = next();
    }
    while (c != END) {
      if (c == '\n' || c == '\r') {
        lineBreak(c);
        c = next();
        continue;
      }
      int recordLine = line;
      int column = 0;
      while (true) {
        boolean wanted = sink.wants(column);
        cell.setLength(0);
        if (c == '"') {
          c = quoted(wanted, column);
        } else {
          while (c != END && c != ',' && c != '\n' && c != '\r') {
            if (wanted) {
              cell.append((char) c);
            }
            c = next();
          }
        }
        if (wanted) {
          sink.cell(column, cell.toString());
        }
        column++;
        if (c != ',') {
          break;
        }
        c = next();
      }
      if (c != END) {
        lineBreak(c);
      }
      sink.endRecord(recordLine, column);
      c = next();
    }
  }

  /** Reads a quoted cell from after its opening quote; returns the character after the cell. */
  private int quoted(boolean wanted, int column) throws IOException {
    int openedOn = line;
    while (true) {
      int c = next();
      if (c == END) {
        throw invalid(openedOn, column, "the quote that opens this cell is never closed",
            "close the quote; a quote inside a quoted cell is written twice (\"\")");
      }
      if (c == '"') {
        c = next();
        if (c == '"') {
          if (wanted) {
            cell.append('"');
          }
          continue;
        }
        while (c != END && c != ',' && c != '\n' && c != '\r') {
          if (!Character.isWhitespace(c)) {
            throw invalid(line, column, "'" + (char) c + "' follows the closing quote of this"
                + " cell, where a comma or the end of the line belongs",
                "a quote inside a quoted cell is written twice (\"\")");
          }
          c = next();
        }
        return c;
      }
      if (wanted) {
        cell.append((char) c);
      }
      if (c == '\r' && peek() == '\n') {
        c = next();
        if (wanted) {
          cell.append('\n');
        }
      }
      if (c == '\n' || c == '\r') {
        line++;
      }
    }
  }

  /** Counts the line break that starts with {@code c}, taking the LF of a CRLF with it. */
  private void lineBreak(int c) throws IOException {
    if (c == '\r' && peek() == '\n') {
      next();
    }
    line++;
  }

  private ModelException invalid(int atLine, int column, String problem, String hint) {
    return new ModelException(
        new SourcePosition(fileName, atLine, column + 1), null,
        "not a valid CSV file: " + problem, hint);
  }

  private int next() throws IOException {
    if (position == limit && !fill()) {
      return END;
    }
    return buffer[position++];
  }

  private int peek() throws IOException {
    if (position == limit && !fill()) {
      return END;
    }
    return buffer[position];
  }

  private boolean fill() throws IOException {
    int n;
    do {
      n = in.read(buffer, 0, buffer.length);
    } while (n == 0);
    if (n < 0) {
      return false;
    }
    position = 0;
    limit = n;
    return true;
  }
}

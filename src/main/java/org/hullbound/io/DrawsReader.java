package org.hullbound.io;

import java.io.BufferedReader;
import java.io.FilterReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.lang.SourcePosition;

/**
 * Reads a draws CSV (RFC 4180, a header row, UTF-8, an optional byte-order mark) into a {@link
 * DrawsTable}: either the {@code draws.csv} of {@code fit} (columns {@code chain}, {@code draw},
 * then one per unknown) or any CSV whose columns are variables, with an optional {@code chain}
 * column and an optional {@code draw} or {@code iteration} column that is not a variable.
 *
 * <p>Diagnostics need complete, numeric draws, so every cell must be a number of the one number
 * grammar ({@link NumberSyntax}, as data cells are read: Java's {@code 22d}, {@code 2.2e1f}, {@code
 * 0x1.6p4} are not numbers) or one of {@code NaN}, {@code inf}, {@code -inf} (as {@code fit} writes
 * them); an empty or {@code NA} cell, a ragged row, a repeated column name, a chain label that is
 * not a whole number or a number too large or too small for a double is refused with a {@link
 * ModelException} at {@code file:line:cell}, the problem naming the column. Rows of different
 * chains may interleave (as {@code fit} writes them); within a chain the file order is the draw
 * order. Chains of unequal length (an interrupted run, a foreign file) are cut to the shortest, and
 * {@link DrawsTable#notes()} says so.
 */
public final class DrawsReader {

  /** Column names (any letter case) that label the chain. */
  public static final String CHAIN_COLUMN = "chain";

  /** Column names (any letter case) that number the draws and are not variables. */
  public static final List<String> DRAW_COLUMNS = List.of("draw", "iteration");

  private static final CSVFormat FORMAT =
      CSVFormat.RFC4180.builder().setIgnoreEmptyLines(true).get();
  private static final Map<String, Double> NON_FINITE_WORDS =
      Map.of(
          "nan", Double.NaN,
          "inf", Double.POSITIVE_INFINITY,
          "+inf", Double.POSITIVE_INFINITY,
          "-inf", Double.NEGATIVE_INFINITY,
          "infinity", Double.POSITIVE_INFINITY,
          "+infinity", Double.POSITIVE_INFINITY,
          "-infinity", Double.NEGATIVE_INFINITY);
  private static final int SHOWN_LENGTH = 40;
  private static final char REPLACEMENT = '\uFFFD';

  private DrawsReader() {}

  /**
   * Reads {@code file}; its name as given is used in messages.
   *
   * @throws UncheckedIOException when the file cannot be read
   * @throws ModelException when its content is not a valid draws table
   */
  public static DrawsTable read(Path file) {
    if (file == null) {
      throw new IllegalArgumentException("file must not be null");
    }
    String name = file.toString();
    if (Files.isDirectory(file)) {
      throw new UncheckedIOException(
          "cannot read '" + name + "': it is a folder, not a draws file",
          new IOException(name + " is a directory"));
    }
    try (Reader reader =
        new BufferedReader(
            // Bytes that are not UTF-8 become U+FFFD, so that the cell holding them is named.
            new InputStreamReader(Files.newInputStream(file), StandardCharsets.UTF_8), 1 << 16)) {
      return read(name, reader);
    } catch (NoSuchFileException missing) {
      throw new UncheckedIOException("cannot read '" + name + "': no such file", missing);
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read '" + name + "': " + e.getMessage(), e);
    }
  }

  /**
   * Reads draws CSV text from {@code reader} as if it were the file called {@code fileName}.
   * The reader is not closed.
   *
   * @throws ModelException when the content is not a valid draws table
   */
  public static DrawsTable read(String fileName, Reader reader) {
    if (fileName == null || reader == null) {
      throw new IllegalArgumentException("fileName and reader must not be null");
    }
    return new Reading(fileName).run(reader);
  }

  /** The state of one read: header roles, growing columns, and the line of every record. */
  private static final class Reading {
    private final String fileName;
    private LineTrackingReader lines;
    private CSVParser parser;
    private List<String> header;
    private int chainCell = -1;
    private int drawCell = -1;
    private int[] variableCells;
    private double[][] values;
    private long[] chainOfRow = new long[1024];
    private int rowCount;

    Reading(String fileName) {
      this.fileName = fileName;
    }

    DrawsTable run(Reader source) {
      try {
        lines = new LineTrackingReader(withoutByteOrderMark(source));
        parser = CSVParser.builder().setReader(lines).setFormat(FORMAT).get();
        Iterator<CSVRecord> records = parser.iterator();
        while (hasNext(records)) {
          CSVRecord record = records.next();
          int line = lines.lineOf(record.getCharacterPosition());
          if (header == null) {
            readHeader(record, line);
          } else {
            readRow(record, line, records);
          }
        }
      } catch (IOException e) {
        throw new UncheckedIOException("cannot read '" + fileName + "': " + e.getMessage(), e);
      }
      if (header == null) {
        throw error(1, 1, "the draws file is empty; expected a header row naming the columns",
            null);
      }
      if (rowCount == 0) {
        throw error(lines.currentLine(), 1,
            "the draws file has a header row but no draws; expected one row per draw", null);
      }
      return table();
    }

    /** Advances the parser, turning its complaints (an unclosed quote, say) into a position. */
    private boolean hasNext(Iterator<CSVRecord> records) {
      // The record being parsed starts on the line after the last one the parser finished.
      int line = (int) Math.min(Integer.MAX_VALUE, parser.getCurrentLineNumber() + 1);
      try {
        return records.hasNext();
      } catch (UncheckedIOException e) {
        throw error(line, 1, "this is not valid CSV: " + e.getCause().getMessage(),
            "a quoted cell must end with a closing quote, and a quote inside it is written twice");
      } catch (IllegalStateException | IllegalArgumentException e) {
        throw error(line, 1, "this is not valid CSV: " + e.getMessage(), null);
      }
    }

    private void readHeader(CSVRecord record, int line) {
      header = new ArrayList<>(record.size());
      Map<String, Integer> seen = new HashMap<>();
      List<Integer> variables = new ArrayList<>();
      for (int k = 0; k < record.size(); k++) {
        String name = record.get(k).strip();
        int cell = k + 1;
        if (name.isEmpty()) {
          throw error(line, cell, "cell " + cell + " of the header is empty; every column needs a"
              + " name", null);
        }
        if (name.indexOf(REPLACEMENT) >= 0) {
          throw notUtf8(line, cell, "cell " + cell + " of the header");
        }
        Integer earlier = seen.put(name, cell);
        if (earlier != null) {
          throw error(line, cell, "column names must be distinct, but '" + shown(name)
              + "' names both cell " + earlier + " and cell " + cell + " of the header", null);
        }
        header.add(name);
        String role = name.toLowerCase(Locale.ROOT);
        if (role.equals(CHAIN_COLUMN)) {
          if (chainCell >= 0) {
            throw error(line, cell, "two columns label the chain: cell " + (chainCell + 1)
                + " and cell " + cell + " of the header", "keep one chain column");
          }
          chainCell = k;
        } else if (DRAW_COLUMNS.contains(role)) {
          if (drawCell >= 0) {
            throw error(line, cell, "two columns number the draws: cell " + (drawCell + 1)
                + " and cell " + cell + " of the header", "keep one draw or iteration column");
          }
          drawCell = k;
        } else {
          variables.add(k);
        }
      }
      if (variables.isEmpty()) {
        throw error(line, 1, "the header names no variable, only the chain and draw columns;"
            + " expected at least one column of draws", null);
      }
      variableCells = variables.stream().mapToInt(Integer::intValue).toArray();
      values = new double[variableCells.length][1024];
    }

    private void readRow(CSVRecord record, int line, Iterator<CSVRecord> records) {
      if (record.size() != header.size()) {
        int cell = Math.min(record.size(), header.size()) + 1;
        boolean last = !hasNext(records);
        throw error(line, cell, "this row has " + record.size() + " cell"
                + (record.size() == 1 ? "" : "s") + " but the header has " + header.size()
                + " columns",
            last && record.size() < header.size()
                ? "the last row is cut short; was the run that wrote the file interrupted? delete"
                    + " that row and summarise again"
                : "every row needs one cell per column");
      }
      if (rowCount == chainOfRow.length) {
        int grown = Math.max(chainOfRow.length * 2, chainOfRow.length + 1);
        chainOfRow = Arrays.copyOf(chainOfRow, grown);
        for (int v = 0; v < values.length; v++) {
          values[v] = Arrays.copyOf(values[v], grown);
        }
      }
      chainOfRow[rowCount] = chainCell < 0 ? 1 : chainLabel(record.get(chainCell), line);
      for (int v = 0; v < variableCells.length; v++) {
        int k = variableCells[v];
        values[v][rowCount] = number(record.get(k), line, k);
      }
      rowCount++;
    }

    private long chainLabel(String text, int line) {
      String cell = text.strip();
      if (cell.indexOf(REPLACEMENT) >= 0) {
        throw notUtf8(line, chainCell + 1, "cell " + (chainCell + 1) + " (column '"
            + shown(header.get(chainCell)) + "')");
      }
      try {
        return NumberSyntax.parseWhole(cell);
      } catch (NumberSyntax.InvalidNumberException notWhole) {
        throw error(line, chainCell + 1, "cell " + (chainCell + 1) + " (column '"
                + shown(header.get(chainCell)) + "'): expected a whole number labelling the chain,"
                + " got " + quoted(text),
            null);
      }
    }

    private double number(String text, int line, int k) {
      String cell = text.strip();
      String where = "cell " + (k + 1) + " (column '" + shown(header.get(k)) + "')";
      if (cell.isEmpty() || cell.equalsIgnoreCase("NA")) {
        throw error(line, k + 1, where + " is " + (cell.isEmpty() ? "empty" : "NA")
                + "; every draw must be a number, since R-hat and effective sample size need"
                + " complete draws",
            "remove the incomplete rows or the column");
      }
      if (cell.indexOf(REPLACEMENT) >= 0) {
        throw notUtf8(line, k + 1, where);
      }
      Double word = NON_FINITE_WORDS.get(cell.toLowerCase(Locale.ROOT));
      if (word != null) {
        return word;
      }
      try {
        return NumberSyntax.parse(cell);
      } catch (NumberSyntax.InvalidNumberException notNumber) {
        // the one number grammar: Java's 22d, 2.2e1f, 0x1.6p4 are not numbers here either
        String problem =
            notNumber.reason().equals("is not a number")
                ? "expected a number, got " + quoted(text)
                : quoted(text) + " " + notNumber.reason();
        throw error(line, k + 1, where + ": " + problem, notNumber.hint());
      }
    }

    private DrawsTable table() {
      TreeMap<Long, int[]> counts = new TreeMap<>();
      for (int r = 0; r < rowCount; r++) {
        counts.computeIfAbsent(chainOfRow[r], label -> new int[1])[0]++;
      }
      int shortest = Integer.MAX_VALUE;
      int longest = 0;
      for (int[] count : counts.values()) {
        shortest = Math.min(shortest, count[0]);
        longest = Math.max(longest, count[0]);
      }
      Map<Long, Integer> chainIndex = new HashMap<>();
      List<Long> labels = new ArrayList<>(counts.keySet());
      for (int c = 0; c < labels.size(); c++) {
        chainIndex.put(labels.get(c), c);
      }
      int[][] rowsOfChain = new int[labels.size()][shortest];
      int[] filled = new int[labels.size()];
      for (int r = 0; r < rowCount; r++) {
        int c = chainIndex.get(chainOfRow[r]);
        if (filled[c] < shortest) {
          rowsOfChain[c][filled[c]++] = r;
        }
      }
      List<String> notes = new ArrayList<>();
      if (longest > shortest) {
        StringBuilder lengths = new StringBuilder();
        for (Map.Entry<Long, int[]> entry : counts.entrySet()) {
          lengths.append(lengths.length() == 0 ? "" : ", ")
              .append("chain ").append(entry.getKey()).append(": ").append(entry.getValue()[0]);
        }
        notes.add("the chains differ in length (" + lengths + "), so each is cut to its first "
            + shortest + " draw" + (shortest == 1 ? "" : "s"));
      }
      List<String> variables = new ArrayList<>();
      Map<String, double[]> columns = new LinkedHashMap<>();
      for (int v = 0; v < variableCells.length; v++) {
        String name = header.get(variableCells[v]);
        variables.add(name);
        columns.put(name, values[v]);
      }
      return new DrawsTable(fileName, variables, columns, labels, rowsOfChain, notes);
    }

    private ModelException notUtf8(int line, int cell, String where) {
      return error(line, cell, where + " holds bytes that are not UTF-8 text (read as U+FFFD)",
          "save the draws file as UTF-8 CSV");
    }

    private ModelException error(int line, int cell, String problem, String hint) {
      return new ModelException(new SourcePosition(fileName, line, cell), null, problem, hint);
    }
  }

  private static Reader withoutByteOrderMark(Reader source) throws IOException {
    java.io.PushbackReader pushback = new java.io.PushbackReader(source, 1);
    int first = pushback.read();
    if (first != -1 && first != '\uFEFF') {
      pushback.unread(first);
    }
    return pushback;
  }

  /** A cell's text for a message: quoted, control characters escaped, long text cut. */
  private static String quoted(String text) {
    return "'" + shown(text) + "'";
  }

  private static String shown(String text) {
    StringBuilder out = new StringBuilder();
    int count = 0;
    for (int i = 0; i < text.length() && count < SHOWN_LENGTH; count++) {
      int codePoint = text.codePointAt(i);
      i += Character.charCount(codePoint);
      if (Character.isISOControl(codePoint) || !Character.isDefined(codePoint)
          || Character.getType(codePoint) == Character.FORMAT
          || Character.getType(codePoint) == Character.SURROGATE) {
        out.append(String.format(Locale.ROOT, "\\u%04x", codePoint));
      } else {
        out.appendCodePoint(codePoint);
      }
      if (count == SHOWN_LENGTH - 1 && i < text.length()) {
        out.append("...");
      }
    }
    return out.toString();
  }

  /**
   * Remembers where each line starts as characters pass through, so that a record's character
   * position becomes a 1-based line number without holding the file in memory. CRLF, CR and LF
   * each end a line.
   */
  private static final class LineTrackingReader extends FilterReader {
    private long[] starts = new long[256];
    private int lineCount = 1;
    private long position;
    private boolean afterCarriageReturn;

    LineTrackingReader(Reader in) {
      super(in);
    }

    @Override
    public int read() throws IOException {
      int c = in.read();
      if (c >= 0) {
        see((char) c);
      }
      return c;
    }

    @Override
    public int read(char[] buffer, int offset, int length) throws IOException {
      int n = in.read(buffer, offset, length);
      for (int i = 0; i < n; i++) {
        see(buffer[offset + i]);
      }
      return n;
    }

    private void see(char c) {
      position++;
      if (c == '\n' && afterCarriageReturn) {
        starts[lineCount - 1] = position;
      } else if (c == '\n' || c == '\r') {
        if (lineCount == starts.length) {
          starts = Arrays.copyOf(starts, starts.length * 2);
        }
        starts[lineCount++] = position;
      }
      afterCarriageReturn = c == '\r';
    }

    /** The 1-based line holding character {@code characterPosition} (0-based). */
    int lineOf(long characterPosition) {
      int at = Arrays.binarySearch(starts, 0, lineCount, characterPosition);
      return (at >= 0 ? at : -at - 2) + 1;
    }

    /** The line being read now. */
    int currentLine() {
      return lineCount;
    }
  }
}

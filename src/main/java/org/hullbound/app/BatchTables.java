package org.hullbound.app;

import java.io.IOException;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.Collection;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.io.AtomicFiles;
import org.hullbound.io.RowWrites;
import org.hullbound.io.Closing;
import org.hullbound.report.SummaryTable;

/**
 * The two tables of a batch, {@value BatchRun#SUMMARY_FILE} and {@value BatchRun#UNITS_FILE},
 * written a unit at a time as units finish, so that an interrupt, a crash or a full disk keeps
 * every unit that finished before it.
 *
 * <p>A unit's summary rows are appended first and its row of {@value BatchRun#UNITS_FILE} last,
 * each in one write that is flushed to the disk before the next unit's: the units row is what
 * makes a unit finished, so a unit whose summary rows landed but whose units row did not is run
 * again on resume (its summary rows dropped then). When a write fails, the file is cut back to
 * its length before the write, so that it holds whole rows only. Rows follow the order in which
 * units finish; every row begins with its unit (and a summary row then with its quantity), a key
 * that does not depend on the order. A finished batch rewrites both tables in the units' input
 * order ({@link #inOrder}), so that its files do not depend on the engine either.
 *
 * <p>Why not rewrite the whole tables atomically after each unit: that costs the square of the
 * units' count in bytes written, and an append of a few hundred bytes is cut back as cheaply.
 */
final class BatchTables implements AutoCloseable {
  /** The summary's columns: the unit, then those of {@code fit}'s summary.csv. */
  static final List<String> SUMMARY_HEADER = summaryHeader();

  private static final String RECORD_END = "\r\n";

  private final Path folder;
  private final Table summary;
  private final Table units;
  /** Every unit's rows written so far, by unit: what {@link #inOrder} writes again. */
  private final Map<String, Written> written;

  private BatchTables(Path folder, Table summary, Table units, Map<String, Written> written) {
    this.folder = folder;
    this.summary = summary;
    this.units = units;
    this.written = written;
  }

  /** The rows of one unit: its summary records and its units record, as written. */
  record Written(List<List<String>> summaryRows, List<String> unitRow) {}

  /**
   * Starts both tables in {@code folder} with their headers, replacing older ones, writing
   * through {@code writes} ({@link FileChannel#write}, or a failing disk in tests).
   */
  static BatchTables start(Path folder, RowWrites writes) {
    AtomicFiles.write(folder.resolve(BatchRun.SUMMARY_FILE), line(SUMMARY_HEADER));
    AtomicFiles.write(folder.resolve(BatchRun.UNITS_FILE), line(BatchRun.UNITS_HEADER));
    return open(folder, new LinkedHashMap<>(), writes);
  }

  /**
   * The units of the interrupted batch in {@code folder} that have their whole row in {@value
   * BatchRun#UNITS_FILE}, with their rows of both tables (a torn last line, and the summary rows of
   * a unit that had not finished, left out).
   *
   * @throws RunRefusedException when a table is missing or is not a batch's
   */
  static Map<String, Written> read(Path folder) {
    List<List<String>> unitRows =
        wholeRecords(folder.resolve(BatchRun.UNITS_FILE), BatchRun.UNITS_HEADER);
    List<List<String>> summaryRows =
        wholeRecords(folder.resolve(BatchRun.SUMMARY_FILE), SUMMARY_HEADER);
    Map<String, Written> written = new LinkedHashMap<>();
    for (List<String> unitRow : unitRows) {
      written.put(unitRow.get(0), new Written(new ArrayList<>(), unitRow));
    }
    for (List<String> row : summaryRows) {
      Written unit = written.get(row.get(0));
      if (unit != null) {
        unit.summaryRows().add(row);
      }
    }
    return written;
  }

  /**
   * Continues the tables in {@code folder} with the finished units {@code finished} ({@link
   * #read}): both files are rewritten atomically with their rows only, then appended to.
   */
  static BatchTables resume(Path folder, Map<String, Written> finished, RowWrites writes) {
    Map<String, Written> written = new LinkedHashMap<>(finished);
    rewrite(folder, written.values());
    return open(folder, written, writes);
  }

  private static BatchTables open(Path folder, Map<String, Written> written, RowWrites writes) {
    Table summary = Table.append(folder.resolve(BatchRun.SUMMARY_FILE), writes);
    try {
      return new BatchTables(
          folder, summary, Table.append(folder.resolve(BatchRun.UNITS_FILE), writes), written);
    } catch (RuntimeException e) {
      Closing.quietly(summary);
      throw e;
    }
  }

  /** The names of the units whose rows are complete. */
  List<String> finishedUnits() {
    return List.copyOf(written.keySet());
  }

  /** The rows written of {@code unit}, or null when it has not finished. */
  Written rowsOf(String unit) {
    return written.get(unit);
  }

  /**
   * Appends {@code outcome}'s rows: the summary's, then its units row, each flushed to the disk.
   *
   * @throws UncheckedIOException when a table cannot be written; the files then hold whole rows,
   *     and this unit is not among the finished
   */
  void append(UnitOutcome outcome) {
    List<List<String>> rows = new ArrayList<>();
    StringBuilder summaryText = new StringBuilder();
    for (List<String> row : outcome.rows()) {
      List<String> cells = new ArrayList<>(List.of(outcome.unit()));
      cells.addAll(row);
      rows.add(cells);
      summaryText.append(line(cells));
    }
    // one line per record, so that a torn record is always the text after the last record end
    String verdict = outcome.verdict().replaceAll("[\r\n]+", " ");
    List<String> unitRow =
        List.of(outcome.unit(), Long.toString(outcome.seed()), outcome.status(), verdict);
    summary.add(summaryText.toString());
    units.add(line(unitRow));
    written.put(outcome.unit(), new Written(rows, unitRow));
  }

  /**
   * Writes both tables again, atomically, with the units in the order of {@code order} (the
   * batch's input order), once every unit has finished.
   */
  void inOrder(List<String> order) {
    close();
    rewrite(folder, order.stream().map(written::get).toList());
  }

  /** Writes both tables of {@code units}' rows, in that order, atomically. */
  private static void rewrite(Path folder, Collection<Written> units) {
    StringBuilder summaryText = new StringBuilder(line(SUMMARY_HEADER));
    StringBuilder unitsText = new StringBuilder(line(BatchRun.UNITS_HEADER));
    for (Written unit : units) {
      unit.summaryRows().forEach(row -> summaryText.append(line(row)));
      unitsText.append(line(unit.unitRow()));
    }
    AtomicFiles.write(folder.resolve(BatchRun.SUMMARY_FILE), summaryText.toString());
    AtomicFiles.write(folder.resolve(BatchRun.UNITS_FILE), unitsText.toString());
  }

  /** Closes both files; later calls do nothing. */
  @Override
  public void close() {
    try {
      summary.close();
    } finally {
      units.close();
    }
  }

  /** One CSV record with its CRLF end (RFC 4180, as summary.csv's). */
  static String line(List<String> cells) {
    StringBuilder out = new StringBuilder();
    try {
      CSVFormat.RFC4180.printRecord(out, cells.toArray());
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return out.toString();
  }

  /**
   * The records of {@code file} after its header, up to the last whole one: a record is whole when
   * the text up to its end closes with a record end and it has the header's number of cells.
   */
  private static List<List<String>> wholeRecords(Path file, List<String> header) {
    String text;
    try {
      text = Files.readString(file, StandardCharsets.UTF_8);
    } catch (NoSuchFileException missing) {
      throw new RunRefusedException(
          "cannot resume the batch: " + file + " does not exist (only a batch that was stopped"
              + " leaves its tables to continue)");
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read " + file + ": " + e.getMessage(), e);
    }
    // A torn write ends without a record end; the records before it are whole. No cell of ours
    // holds a line break (verdicts are one line each, joined by " | "), so the last record end in
    // the text ends the last whole record.
    int end = text.lastIndexOf(RECORD_END);
    String whole = end < 0 ? "" : text.substring(0, end + RECORD_END.length());
    List<List<String>> records = new ArrayList<>();
    try (var parser = CSVFormat.RFC4180.parse(new StringReader(whole))) {
      for (CSVRecord record : parser) {
        records.add(record.toList());
      }
    } catch (IOException | UncheckedIOException damaged) {
      throw new RunRefusedException(
          "cannot resume the batch: " + file + " is not a table of a batch ("
              + damaged.getMessage() + ")");
    }
    if (records.isEmpty() || !records.get(0).equals(header)) {
      throw new RunRefusedException(
          "cannot resume the batch: " + file + " does not begin with the header "
              + String.join(",", header));
    }
    List<List<String>> rows = new ArrayList<>();
    for (List<String> record : records.subList(1, records.size())) {
      if (record.size() != header.size()) {
        throw new RunRefusedException(
            "cannot resume the batch: a row of " + file + " has " + record.size() + " cells, not "
                + header.size() + ": " + String.join(",", record));
      }
      rows.add(record);
    }
    return rows;
  }

  private static List<String> summaryHeader() {
    List<String> header = new ArrayList<>(List.of("unit"));
    header.addAll(SummaryTable.CSV_HEADER);
    return List.copyOf(header);
  }

  /** A table opened for appending, cut back to its whole rows when a write fails. */
  private static final class Table implements java.io.Closeable {
    private final Path file;
    private final FileChannel channel;
    private final RowWrites writes;
    private boolean closed;

    private Table(Path file, FileChannel channel, RowWrites writes) {
      this.file = file;
      this.channel = channel;
      this.writes = writes;
    }

    static Table append(Path file, RowWrites writes) {
      try {
        return new Table(file, FileChannel.open(file, StandardOpenOption.WRITE), writes);
      } catch (IOException e) {
        throw new UncheckedIOException("cannot write " + file + ": " + e.getMessage(), e);
      }
    }

    void add(String text) {
      if (text.isEmpty()) {
        return;
      }
      ByteBuffer bytes = ByteBuffer.wrap(text.getBytes(StandardCharsets.UTF_8));
      long whole;
      try {
        whole = channel.size();
      } catch (IOException e) {
        throw new UncheckedIOException("cannot write " + file + ": " + e.getMessage(), e);
      }
      try {
        channel.position(whole);
        writes.appendWhole(channel, bytes, whole, true);
      } catch (IOException e) {
        throw new UncheckedIOException("cannot write " + file + ": " + e.getMessage(), e);
      }
    }

    @Override
    public void close() {
      if (!closed) {
        closed = true;
        Closing.quietly(channel);
      }
    }
  }

}

package org.hullbound.io;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.List;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.TimeUnit;
import org.hullbound.gibbs.DrawSink;
import org.hullbound.lang.NumberSyntax;

/**
 * Streams draws to {@code DIR/draws.csv} as they are made: columns {@code chain}, {@code draw},
 * then one per scalar unknown ({@code name}, {@code name[i]}, {@code name[i,j]}).
 *
 * <p>Each row is written whole under one lock, and the file is flushed at least every half second
 * and on close, so that an interrupted run leaves a valid CSV of every completed draw; rows of
 * different chains may interleave. Chains and draws are numbered from 1 in the file.
 *
 * <p>Rows are buffered here, not in a {@link java.io.BufferedWriter} (which writes whenever its
 * buffer fills, in the middle of a row), and written to the file in whole rows; the writer keeps
 * the length of the file's whole rows, and when a write fails (the disk is full) it cuts the file
 * back to that length, so that the file holds whole rows only, every row written before the
 * failure.
 */
public final class DrawsWriter implements DrawSink, AutoCloseable {
  /** The file name inside the output folder. */
  public static final String FILE_NAME = "draws.csv";

  private static final long FLUSH_INTERVAL_MILLIS = 500;

  /** Rows held before a write; a multiple of the usual page size, far above one row. */
  private static final int BUFFER_CHARS = 1 << 16;

  private final Path file;
  private final FileChannel out;
  private final RowWrites writes;
  private final int width;
  private final ScheduledExecutorService flusher;
  private final StringBuilder row = new StringBuilder(256);
  private final StringBuilder pending = new StringBuilder(BUFFER_CHARS + 256);
  /** Bytes of the file that end with a whole row: where a failed write is cut back to. */
  private long whole;
  private IOException failure;
  private boolean closed;

  private DrawsWriter(Path file, FileChannel out, RowWrites writes, int width) throws IOException {
    this.file = file;
    this.out = out;
    this.writes = writes;
    this.width = width;
    this.whole = out.size();
    this.flusher =
        Executors.newSingleThreadScheduledExecutor(
            task -> {
              Thread thread = new Thread(task, "hullbound-draws-flush");
              thread.setDaemon(true);
              return thread;
            });
    flusher.scheduleAtFixedRate(
        this::flushQuietly, FLUSH_INTERVAL_MILLIS, FLUSH_INTERVAL_MILLIS, TimeUnit.MILLISECONDS);
  }

  /**
   * Creates {@code directory} if needed and starts {@code draws.csv} there with its header,
   * replacing an older file.
   *
   * @param columns the labels of the recorded quantities, in the order of each draw's values
   */
  public static DrawsWriter open(Path directory, List<String> columns) {
    return open(directory, FILE_NAME, columns, FileChannel::write);
  }

  /**
   * Like {@link #open(Path, List)}, for a file of rows like the draws' under another name (such
   * as the replicated data of predictive checks).
   */
  public static DrawsWriter open(Path directory, String fileName, List<String> columns) {
    if (fileName == null || fileName.isBlank()) {
      throw new IllegalArgumentException("fileName must name a file, got " + fileName);
    }
    return open(directory, fileName, columns, FileChannel::write);
  }

  /** {@link #open(Path, List)} writing through {@code writes}: tests inject a failing disk. */
  static DrawsWriter open(Path directory, List<String> columns, RowWrites writes) {
    return open(directory, FILE_NAME, columns, writes);
  }

  private static DrawsWriter open(
      Path directory, String fileName, List<String> columns, RowWrites writes) {
    if (directory == null || columns == null) {
      throw new IllegalArgumentException("directory and columns must not be null");
    }
    Path file = directory.resolve(fileName);
    DrawsWriter writer = null;
    try {
      Files.createDirectories(directory);
      writer =
          new DrawsWriter(
              file,
              FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.WRITE,
                  StandardOpenOption.TRUNCATE_EXISTING),
              writes, columns.size());
      writer.pending.append(header(columns));
      writer.flush();
      return writer;
    } catch (IOException | UncheckedIOException e) {
      // Not even the header could be written: leave no empty draws file behind.
      if (writer != null) {
        writer.flusher.shutdownNow();
        Closing.quietly(writer.out);
      }
      try {
        Files.deleteIfExists(file);
      } catch (IOException cannotDelete) {
        e.addSuppressed(cannotDelete);
      }
      throw e instanceof UncheckedIOException unchecked
          ? unchecked
          : new UncheckedIOException(
              "cannot write " + file + ": " + e.getMessage(), (IOException) e);
    }
  }

  /**
   * Continues the {@code draws.csv} of an interrupted run in {@code directory}: checks its header,
   * keeps the first {@code kept[c]} rows of each chain {@code c} (a partial last line, or rows
   * written after the checkpoint, are dropped, rewriting the file atomically), hands each kept row
   * to {@code existing} (so that the summary covers every draw), and opens the file for appending.
   *
   * @param kept draws per chain (chain 0 first) that the checkpoint says were made
   * @throws CheckpointException when the file is missing, has other columns, or lacks rows the
   *     checkpoint counts
   */
  public static DrawsWriter resume(
      Path directory, List<String> columns, int[] kept, DrawSink existing) {
    Path file = directory.resolve(FILE_NAME);
    String text;
    try {
      text = Files.readString(file, StandardCharsets.UTF_8);
    } catch (IOException e) {
      throw new CheckpointException(
          "cannot continue " + file + ": " + e.getMessage() + " (the draws so far are needed)");
    }
    String header = header(columns);
    if (!text.startsWith(header)) {
      throw new CheckpointException(
          file + " does not start with the header " + header.strip()
              + ": it is not the draws file of this checkpoint");
    }
    int wholeEnd = text.lastIndexOf('\n') + 1;
    StringBuilder keptText = new StringBuilder(header);
    int[] seen = new int[kept.length];
    double[] values = new double[columns.size()];
    int start = header.length();
    int lineNumber = 1;
    while (start < wholeEnd) {
      int end = text.indexOf('\n', start);
      String line = text.substring(start, end);
      lineNumber++;
      String[] fields = line.split(",", -1);
      int chain;
      int draw;
      if (fields.length < 2) {
        throw new CheckpointException(file + ":" + lineNumber + ": not a row of draws: " + line);
      }
      long chainNumber = whole(fields[0], file, lineNumber, 1);
      long drawNumber = whole(fields[1], file, lineNumber, fields[0].length() + 2);
      // out of range: refused just below, as a chain or draw that does not follow
      chain = chainNumber >= 1 && chainNumber <= kept.length ? (int) chainNumber - 1 : -1;
      draw = (int) Math.max(-1, Math.min(Integer.MAX_VALUE, drawNumber));
      if (chain < 0 || chain >= kept.length || fields.length != columns.size() + 2) {
        throw new CheckpointException(
            file + ":" + lineNumber + ": expected chain 1 to " + kept.length + " and "
                + (columns.size() + 2) + " fields, got " + line);
      }
      if (draw <= kept[chain]) {
        if (draw != seen[chain] + 1) {
          throw new CheckpointException(
              file + ":" + lineNumber + ": chain " + (chain + 1) + " draw " + draw
                  + " follows draw " + seen[chain]);
        }
        seen[chain] = draw;
        int column = fields[0].length() + fields[1].length() + 3;
        for (int k = 0; k < values.length; k++) {
          values[k] = parseNumber(fields[k + 2], file, lineNumber, column);
          column += fields[k + 2].length() + 1;
        }
        existing.accept(chain, draw, values);
        keptText.append(line).append('\n');
      }
      start = end + 1;
    }
    for (int chain = 0; chain < kept.length; chain++) {
      if (seen[chain] != kept[chain]) {
        throw new CheckpointException(
            file + " has " + seen[chain] + " draws of chain " + (chain + 1) + ", the checkpoint "
                + kept[chain] + ": the draws file and the checkpoint do not belong together");
      }
    }
    try {
      if (keptText.length() != text.length()) {
        AtomicFiles.write(file, keptText.toString());
      }
      FileChannel out = FileChannel.open(file, StandardOpenOption.WRITE, StandardOpenOption.APPEND);
      return new DrawsWriter(file, out, FileChannel::write, columns.size());
    } catch (IOException e) {
      throw new UncheckedIOException("cannot write " + file + ": " + e.getMessage(), e);
    }
  }

  private static String header(List<String> columns) {
    StringBuilder header = new StringBuilder("chain,draw");
    for (String column : columns) {
      header.append(',').append(Csv.quote(column));
    }
    return header.append('\n').toString();
  }

  /**
   * A draw as this writer writes it: a number of the one number grammar ({@link NumberSyntax}, so
   * not Java's {@code 22d} or {@code 0x1.6p4}), {@code inf}, {@code -inf} or {@code NaN}.
   */
  private static double parseNumber(String field, Path file, int lineNumber, int column) {
    if (field.equals("NaN")) {
      return Double.NaN;
    }
    try {
      return NumberSyntax.parse(field);
    } catch (NumberSyntax.InvalidNumberException bad) {
      throw new CheckpointException(
          file + ":" + lineNumber + ":" + column + ": not a draw: " + bad.getMessage());
    }
  }

  /** A chain or draw number of a row, by the one number grammar. */
  private static long whole(String field, Path file, int lineNumber, int column) {
    try {
      return NumberSyntax.parseWhole(field);
    } catch (NumberSyntax.InvalidNumberException bad) {
      throw new CheckpointException(
          file + ":" + lineNumber + ":" + column + ": not a row of draws: " + bad.getMessage());
    }
  }

  /** The file being written. */
  public Path file() {
    return file;
  }

  /**
   * Appends one whole row; {@code chain} counts from 0 as in the runner and is written from 1.
   *
   * @throws UncheckedIOException when an earlier write or flush failed (the disk is full, say)
   */
  @Override
  public synchronized void accept(int chain, int draw, double[] values) {
    if (values.length != width) {
      throw new IllegalArgumentException(
          "a draw must have " + width + " values, got " + values.length);
    }
    if (closed) {
      throw new IllegalStateException("draws writer for " + file + " is closed");
    }
    rethrowFailure();
    row.setLength(0);
    row.append(chain + 1).append(',').append(draw);
    for (double value : values) {
      row.append(',');
      Csv.appendNumber(row, value);
    }
    row.append('\n');
    pending.append(row);
    if (pending.length() >= BUFFER_CHARS) {
      writePending();
      rethrowFailure();
    }
  }

  /** Writes out everything buffered so far. */
  public synchronized void flush() {
    if (closed) {
      return;
    }
    writePending();
    rethrowFailure();
  }

  /** Flushes and closes the file; later calls do nothing. */
  @Override
  public void close() {
    flusher.shutdownNow();
    synchronized (this) {
      if (closed) {
        return;
      }
      writePending();
      closed = true;
      try {
        out.close();
      } catch (IOException e) {
        if (failure == null) {
          failure = e;
        }
      }
      rethrowFailure();
    }
  }

  private synchronized void flushQuietly() {
    if (!closed) {
      writePending();
    }
  }

  /**
   * Writes the buffered rows; when the write fails, remembers the failure and cuts the file back
   * to its whole rows (a full disk has room for a cut: it frees space).
   */
  private void writePending() {
    if (failure != null || pending.length() == 0) {
      return;
    }
    ByteBuffer bytes = ByteBuffer.wrap(pending.toString().getBytes(StandardCharsets.UTF_8));
    pending.setLength(0);
    try {
      writes.appendWhole(out, bytes, whole, false);
      whole += bytes.limit();
    } catch (IOException e) {
      failure = e;
    }
  }

  private void rethrowFailure() {
    if (failure != null) {
      throw new UncheckedIOException("cannot write " + file + ": " + failure.getMessage(), failure);
    }
  }
}

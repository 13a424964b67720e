package org.hullbound.io;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.TimeUnit;
import org.hullbound.gibbs.DrawSink;

/**
 * Streams draws to {@code DIR/draws.csv} as they are made: columns {@code chain}, {@code draw},
 * then one per scalar unknown ({@code name}, {@code name[i]}, {@code name[i,j]}).
 *
 * <p>Each row is written whole under one lock, and the file is flushed at least every half second
 * and on close, so that an interrupted run leaves a valid CSV of every completed draw; rows of
 * different chains may interleave. Chains and draws are numbered from 1 in the file.
 */
public final class DrawsWriter implements DrawSink, AutoCloseable {
  /** The file name inside the output folder. */
  public static final String FILE_NAME = "draws.csv";

  private static final long FLUSH_INTERVAL_MILLIS = 500;

  private final Path file;
  private final BufferedWriter out;
  private final int width;
  private final ScheduledExecutorService flusher;
  private final StringBuilder row = new StringBuilder(256);
  private IOException failure;
  private boolean closed;

  private DrawsWriter(Path file, BufferedWriter out, int width) {
    this.file = file;
    this.out = out;
    this.width = width;
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
    if (directory == null || columns == null) {
      throw new IllegalArgumentException("directory and columns must not be null");
    }
    Path file = directory.resolve(FILE_NAME);
    try {
      Files.createDirectories(directory);
      BufferedWriter out = Files.newBufferedWriter(file, StandardCharsets.UTF_8);
      StringBuilder header = new StringBuilder("chain,draw");
      for (String column : columns) {
        header.append(',').append(Csv.quote(column));
      }
      out.write(header.append('\n').toString());
      out.flush();
      return new DrawsWriter(file, out, columns.size());
    } catch (IOException e) {
      throw new UncheckedIOException("cannot write " + file + ": " + e.getMessage(), e);
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
    try {
      out.append(row);
    } catch (IOException e) {
      failure = e;
      rethrowFailure();
    }
  }

  /** Writes out everything buffered so far. */
  public synchronized void flush() {
    if (closed) {
      return;
    }
    try {
      out.flush();
    } catch (IOException e) {
      failure = e;
    }
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
    if (closed || failure != null) {
      return;
    }
    try {
      out.flush();
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

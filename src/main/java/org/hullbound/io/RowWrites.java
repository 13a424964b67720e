package org.hullbound.io;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;

/**
 * How rows reach a file ({@link FileChannel#write}, or a failing disk in tests), and the one rule
 * for appending them: a file holds whole rows only. Shared by {@code draws.csv} and a batch's
 * tables, the outputs that grow while a run goes on and must stay readable after any failure.
 */
@FunctionalInterface
public interface RowWrites {
  /** Writes some of {@code bytes} at the channel's position, as {@link FileChannel#write} does. */
  int write(FileChannel channel, ByteBuffer bytes) throws IOException;

  /**
   * Writes every byte of {@code rows} at the channel's position (and, when {@code force}, forces
   * them to the device); when that fails, cuts the file back to {@code whole} bytes, its whole
   * rows before, and rethrows (a full disk has room for a cut: it frees space).
   */
  default void appendWhole(FileChannel channel, ByteBuffer rows, long whole, boolean force)
      throws IOException {
    try {
      while (rows.hasRemaining()) {
        write(channel, rows);
      }
      if (force) {
        channel.force(false);
      }
    } catch (IOException e) {
      try {
        channel.truncate(whole);
      } catch (IOException cannotCut) {
        e.addSuppressed(cannotCut);
      }
      throw e;
    }
  }
}

package org.hullbound.io;

import java.io.BufferedWriter;
import java.io.Closeable;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;

/**
 * A file written as a stream and put in place only when complete: the text goes to a temporary
 * file in the target's folder, {@link #commit()} renames it over the target, and {@link #close()}
 * without a commit deletes it, so the target never holds half an output.
 *
 * <p>{@link AtomicFiles#write(Path, String)} does the same for text held in memory; this form is
 * for outputs too large to hold, such as millions of draws.
 */
public final class AtomicOutputFile implements Closeable {
  private final Path target;
  private final Path temporary;
  private final BufferedWriter writer;
  private boolean finished;

  private AtomicOutputFile(Path target, Path temporary, BufferedWriter writer) {
    this.target = target;
    this.temporary = temporary;
    this.writer = writer;
  }

  /**
   * Starts writing what will become {@code target}, creating its folder if needed.
   *
   * @throws UncheckedIOException when the folder or the temporary file cannot be made
   */
  public static AtomicOutputFile create(Path target) {
    if (target == null) {
      throw new IllegalArgumentException("target must not be null");
    }
    Path directory = target.toAbsolutePath().getParent();
    try {
      Files.createDirectories(directory);
      Path temporary = Files.createTempFile(directory, "." + target.getFileName(), ".tmp");
      return new AtomicOutputFile(
          target, temporary, Files.newBufferedWriter(temporary, StandardCharsets.UTF_8));
    } catch (IOException e) {
      throw new UncheckedIOException("cannot write " + target + ": " + e.getMessage(), e);
    }
  }

  /** The writer of the content; do not close it, call {@link #commit()} or {@link #close()}. */
  public Writer writer() {
    return writer;
  }

  /**
   * Closes the content and renames it over the target.
   *
   * @throws UncheckedIOException when writing or renaming fails (the temporary file is removed)
   */
  public void commit() {
    if (finished) {
      throw new IllegalStateException("output to " + target + " is already finished");
    }
    finished = true;
    try {
      writer.close();
      try {
        Files.move(
            temporary, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
      } catch (AtomicMoveNotSupportedException notAtomic) {
        Files.move(temporary, target, StandardCopyOption.REPLACE_EXISTING);
      }
    } catch (IOException e) {
      deleteQuietly();
      throw new UncheckedIOException("cannot write " + target + ": " + e.getMessage(), e);
    }
  }

  /** Discards the content unless it was committed; the target is left as it was. */
  @Override
  public void close() {
    if (finished) {
      return;
    }
    finished = true;
    try {
      writer.close();
    } catch (IOException ignored) {
      // The content is being discarded; a failure to close it changes nothing.
    }
    deleteQuietly();
  }

  private void deleteQuietly() {
    try {
      Files.deleteIfExists(temporary);
    } catch (IOException ignored) {
      // Nothing more can be done about a temporary file that cannot be removed.
    }
  }
}

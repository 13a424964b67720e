package org.hullbound.io;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.UUID;

/**
 * Writes a whole file so that readers see either the old content or the new, never half: a
 * temporary file in the same folder, then a rename over the target.
 */
public final class AtomicFiles {
  private AtomicFiles() {}

  /**
   * Replaces {@code target} with {@code text} (UTF-8) atomically, creating its folder if needed.
   */
  public static void write(Path target, String text) {
    if (target == null || text == null) {
      throw new IllegalArgumentException("target and text must not be null");
    }
    Path directory = target.toAbsolutePath().getParent();
    Path temporary = null;
    try {
      Files.createDirectories(directory);
      // CREATE_NEW gives the umask's permissions, as any new file: createTempFile's owner-only
      // permissions would leave the replaced file unreadable to the group that read the old one.
      temporary = directory.resolve("." + target.getFileName() + "." + UUID.randomUUID() + ".tmp");
      Files.writeString(temporary, text, StandardCharsets.UTF_8, StandardOpenOption.CREATE_NEW,
          StandardOpenOption.WRITE);
      try {
        Files.move(
            temporary, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
      } catch (AtomicMoveNotSupportedException notAtomic) {
        Files.move(temporary, target, StandardCopyOption.REPLACE_EXISTING);
      }
    } catch (IOException e) {
      if (temporary != null) {
        try {
          Files.deleteIfExists(temporary);
        } catch (IOException ignored) {
          // The write already failed; that failure is the one to report.
        }
      }
      throw new UncheckedIOException("cannot write " + target + ": " + e.getMessage(), e);
    }
  }
}

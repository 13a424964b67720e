package org.hullbound.report;

import java.io.IOException;
import java.io.OutputStream;
import java.io.OutputStreamWriter;
import java.io.Writer;
import java.nio.channels.Channels;
import java.nio.channels.FileChannel;
import java.nio.charset.CharsetEncoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.UUID;

/**
 * Writes a text file so that readers see either the old file or the complete new one, never a part:
 * the text goes to a temporary file in the same folder, is forced to disk, then moved over the
 * target in one atomic step.
 *
 * <p>A report is often opened while a long run is still being written; a half-written page would
 * look like a broken run. On any failure the temporary file is deleted and the old target, if any,
 * is left untouched. Text that is not valid UTF-16 (an unpaired surrogate) is refused rather than
 * silently replaced.
 */
public final class ReportWriter {
  private ReportWriter() {}

  /**
   * Writes {@code content} as UTF-8 to {@code target}, replacing it atomically.
   *
   * @throws IllegalArgumentException if an argument is null or {@code target} has no file name
   * @throws IOException if the folder cannot be written, the text cannot be encoded, or the move
   *     fails; the target is then unchanged and no temporary file remains
   */
  public static void writeAtomically(Path target, String content) throws IOException {
    if (target == null || content == null) {
      throw new IllegalArgumentException("target and content must not be null");
    }
    Path absolute = target.toAbsolutePath();
    Path folder = absolute.getParent();
    if (folder == null || absolute.getFileName() == null) {
      throw new IllegalArgumentException("target must name a file in a folder, got " + target);
    }
    Path temporary =
        folder.resolve("." + absolute.getFileName() + "." + UUID.randomUUID() + ".part");
    // CREATE_NEW gives the default permissions (the umask's), unlike createTempFile's owner-only;
    // if it fails nothing was created, so nothing needs cleaning up.
    FileChannel channel =
        FileChannel.open(temporary, StandardOpenOption.WRITE, StandardOpenOption.CREATE_NEW);
    try {
      try (channel) {
        CharsetEncoder encoder =
            StandardCharsets.UTF_8
                .newEncoder()
                .onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        OutputStream stream = Channels.newOutputStream(channel);
        Writer writer = new OutputStreamWriter(stream, encoder);
        writer.write(content);
        writer.flush();
        channel.force(true);
      }
      try {
        Files.move(
            temporary,
            absolute,
            StandardCopyOption.ATOMIC_MOVE,
            StandardCopyOption.REPLACE_EXISTING);
      } catch (AtomicMoveNotSupportedException e) {
        // Within one folder a rename is atomic on every common file system; this branch only
        // serves exotic ones, where a plain replacing move is the best available.
        Files.move(temporary, absolute, StandardCopyOption.REPLACE_EXISTING);
      }
    } catch (IOException | RuntimeException | Error e) {
      try {
        Files.deleteIfExists(temporary);
      } catch (IOException cleanup) {
        e.addSuppressed(cleanup);
      }
      throw e;
    }
  }
}

package org.hullbound.io;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CoderResult;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * Reads a whole input file as UTF-8 text, with a message that names the file and what is wrong
 * with it: a folder given as a file, or bytes that are not UTF-8 (with their offset).
 *
 * <p>The JDK's own failures say only "Is a directory" or "Input length = 1", which leave a user
 * guessing which of several files was meant; every reader of model, data and starting-value files
 * goes through here instead.
 */
public final class TextFiles {
  private TextFiles() {}

  /**
   * The text of {@code file}.
   *
   * @param what what the file is, for messages ("model file", "data file")
   * @throws UncheckedIOException naming the file when it cannot be read, is a folder, or is not
   *     UTF-8; a missing file keeps its {@link java.nio.file.NoSuchFileException} as the cause
   */
  public static String readUtf8(Path file, String what) {
    if (file == null || what == null) {
      throw new IllegalArgumentException("file and what must not be null");
    }
    if (Files.isDirectory(file)) {
      throw failure(file, what, "it is a folder, not a file", null);
    }
    byte[] bytes;
    try {
      bytes = Files.readAllBytes(file);
    } catch (IOException e) {
      throw failure(file, what, String.valueOf(e.getMessage()), e);
    } catch (OutOfMemoryError tooLarge) {
      throw failure(file, what, "it is too large to read into memory", null);
    }
    CharsetDecoder decoder =
        StandardCharsets.UTF_8
            .newDecoder()
            .onMalformedInput(CodingErrorAction.REPORT)
            .onUnmappableCharacter(CodingErrorAction.REPORT);
    ByteBuffer in = ByteBuffer.wrap(bytes);
    CharBuffer out = CharBuffer.allocate(bytes.length);
    CoderResult result = decoder.decode(in, out, true);
    if (result.isError()) {
      throw failure(file, what, "it is not UTF-8 text (byte " + (in.position() + 1)
          + " of " + bytes.length + " starts an invalid sequence)", null);
    }
    decoder.flush(out);
    return out.flip().toString();
  }

  private static UncheckedIOException failure(Path file, String what, String why, IOException cause) {
    String message = "cannot read " + what + " " + file + ": " + why;
    return new UncheckedIOException(message, cause != null ? cause : new IOException(message));
  }
}

package org.hullbound.io;

import java.io.IOException;
import java.io.InputStream;
import java.io.Reader;
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
 * goes through here instead. Data files, which may be far larger than the heap's share for text,
 * are streamed through {@link #openUtf8} with the same checks and messages.
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
    CharsetDecoder decoder = strictDecoder();
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

  /**
   * A reader of {@code file} as UTF-8 that decodes as it goes, so the text is never held whole;
   * it fails as {@link #readUtf8} does, naming the file, when the file cannot be opened, is a
   * folder, or holds bytes that are not UTF-8 (with their offset, found when reached).
   *
   * @param what what the file is, for messages ("data file")
   * @throws UncheckedIOException naming the file, here or from the reader's methods
   */
  public static Reader openUtf8(Path file, String what) {
    if (file == null || what == null) {
      throw new IllegalArgumentException("file and what must not be null");
    }
    if (Files.isDirectory(file)) {
      throw failure(file, what, "it is a folder, not a file", null);
    }
    try {
      return new Utf8Reader(file, what, Files.newInputStream(file), Files.size(file));
    } catch (IOException e) {
      throw failure(file, what, String.valueOf(e.getMessage()), e);
    }
  }

  /** Decodes UTF-8 from a stream, counting the bytes passed so an invalid one can be named. */
  private static final class Utf8Reader extends Reader {
    private final Path file;
    private final String what;
    private final InputStream in;
    private final long total;
    private final CharsetDecoder decoder = strictDecoder();
    private final ByteBuffer bytes = ByteBuffer.allocate(1 << 16).flip();
    private long passed;
    private boolean endOfInput;
    private boolean flushed;

    Utf8Reader(Path file, String what, InputStream in, long total) {
      this.file = file;
      this.what = what;
      this.in = in;
      this.total = total;
    }

    @Override
    public int read(char[] target, int offset, int length) {
      if (length == 0) {
        return 0;
      }
      CharBuffer out = CharBuffer.wrap(target, offset, length);
      while (out.position() == offset && !flushed) {
        CoderResult result = decoder.decode(bytes, out, endOfInput);
        if (result.isError()) {
          throw failure(file, what, "it is not UTF-8 text (byte " + (passed + bytes.position() + 1)
              + " of " + total + " starts an invalid sequence)", null);
        }
        if (out.position() > offset) {
          break;
        }
        if (endOfInput) {
          decoder.flush(out);
          flushed = true;
        } else {
          fill();
        }
      }
      return out.position() > offset ? out.position() - offset : -1;
    }

    private void fill() {
      passed += bytes.position();
      bytes.compact();
      try {
        int n = in.read(bytes.array(), bytes.position(), bytes.remaining());
        if (n < 0) {
          endOfInput = true;
        } else {
          bytes.position(bytes.position() + n);
        }
      } catch (IOException e) {
        throw failure(file, what, String.valueOf(e.getMessage()), e);
      }
      bytes.flip();
    }

    @Override
    public void close() throws IOException {
      in.close();
    }
  }

  /** A UTF-8 decoder that reports malformed input instead of replacing it. */
  private static CharsetDecoder strictDecoder() {
    return StandardCharsets.UTF_8
        .newDecoder()
        .onMalformedInput(CodingErrorAction.REPORT)
        .onUnmappableCharacter(CodingErrorAction.REPORT);
  }

  private static UncheckedIOException failure(
      Path file, String what, String why, IOException cause) {
    String message = "cannot read " + what + " " + file + ": " + why;
    return new UncheckedIOException(message, cause != null ? cause : new IOException(message));
  }
}

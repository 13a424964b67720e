package org.hullbound.lang;

import java.util.List;

/**
 * The text of one input file split into lines, so that a message can quote the line it is about
 * and put a caret under the column.
 */
public final class SourceText {
  private final String fileName;
  private final List<String> lines;

  private SourceText(String fileName, List<String> lines) {
    this.fileName = fileName;
    this.lines = lines;
  }

  /** Wraps {@code text}, read from the file called {@code fileName} (used in messages only). */
  public static SourceText of(String fileName, String text) {
    return new SourceText(fileName, List.of(text.split("\r\n|\r|\n", -1)));
  }

  public String fileName() {
    return fileName;
  }

  /** The 1-based line {@code number}, or an empty string past the end of the file. */
  public String line(int number) {
    return number >= 1 && number <= lines.size() ? lines.get(number - 1) : "";
  }

  public int lineCount() {
    return lines.size();
  }

  public SourcePosition position(int line, int column) {
    return new SourcePosition(fileName, line, column);
  }
}

package org.hullbound.io;

import org.hullbound.lang.ModelException;
import org.hullbound.lang.SourceText;

/**
 * Turns a CSV reader's failure into a positioned message of our own: an unterminated quoted field
 * (RFC 4180) is reported at its opening quote, and nothing names a Java exception class.
 *
 * <p>commons-csv reports an unterminated quote at the end of the file, as an exception whose
 * message starts with its class name; the user needs the place where the field began.
 */
final class CsvQuotes {
  private CsvQuotes() {}

  /**
   * The error for {@code failure}, thrown while reading {@code text}: at the opening quote of a
   * field that is never closed, else at the start of the file with the reader's own words.
   */
  static ModelException error(String fileName, String text, Exception failure) {
    SourceText source = SourceText.of(fileName, text);
    int[] open = unclosedQuote(text);
    if (open != null) {
      return ModelException.at(
          source, source.position(open[0], open[1]),
          "this quote opens a field that is never closed; the file ends first",
          "close the field with '\"'; inside a quoted field write a quote as '\"\"'");
    }
    Throwable root = failure;
    while (root.getCause() != null) {
      root = root.getCause();
    }
    return ModelException.at(
        source, source.position(1, 1), "not a valid CSV file: " + root.getMessage(), null);
  }

  /** Line and column (1-based, in code points) of an opening quote never closed, or null. */
  static int[] unclosedQuote(String text) {
    int line = 1;
    int column = 1;
    boolean quoted = false;
    boolean fieldStart = true;
    int[] opening = null;
    for (int i = 0; i < text.length(); i += Character.charCount(text.codePointAt(i))) {
      char c = text.charAt(i);
      if (quoted) {
        if (c == '"') {
          if (i + 1 < text.length() && text.charAt(i + 1) == '"') {
            i++;
            column++;
          } else {
            quoted = false;
          }
        }
      } else if (c == '"' && fieldStart) {
        quoted = true;
        opening = new int[] {line, column};
      }
      if (!quoted) {
        fieldStart = c == ',' || c == '\n' || c == '\r'
            || (fieldStart && (c == ' ' || c == '\t'));
      } else {
        fieldStart = false;
      }
      if (c == '\n' || (c == '\r' && (i + 1 >= text.length() || text.charAt(i + 1) != '\n'))) {
        line++;
        column = 1;
      } else if (c != '\r') {
        column++;
      }
    }
    return quoted ? opening : null;
  }
}

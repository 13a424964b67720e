package org.hullbound.lang;

/**
 * A fault in a model or data file, positioned so that it can be shown as {@code file:line:col},
 * the line itself and a caret under the fault.
 *
 * <p>Thrown by the parser and by binding in the {@code model} package; the CLI prints {@link
 * #render()} and exits with status 2, never a stack trace.
 */
public class ModelException extends RuntimeException {
  /** Code points of a source line shown at most; a longer line is cut around the column. */
  private static final int SHOWN_WIDTH = 100;

  private static final String ELLIPSIS = "...";

  private final SourcePosition position;
  private final String sourceLine;
  private final String problem;
  private final String hint;

  /**
   * @param position where the fault is
   * @param sourceLine the text of that line, or {@code null} when there is none to show
   * @param problem what is wrong and what was expected, one sentence
   * @param hint a suggestion such as "did you mean 'spread'?", or {@code null}
   */
  public ModelException(SourcePosition position, String sourceLine, String problem, String hint) {
    super(position + ": " + problem + (hint == null ? "" : " (" + hint + ")"));
    this.position = position;
    this.sourceLine = sourceLine;
    this.problem = problem;
    this.hint = hint;
  }

  /** Builds the exception quoting the line of {@code position} from {@code source}. */
  public static ModelException at(
      SourceText source, SourcePosition position, String problem, String hint) {
    return new ModelException(position, source.line(position.line()), problem, hint);
  }

  public SourcePosition position() {
    return position;
  }

  public String problem() {
    return problem;
  }

  /** The suggestion, or {@code null}. */
  public String hint() {
    return hint;
  }

  /** The message as a user sees it: position and problem, the line, a caret, and the hint. */
  public String render() {
    StringBuilder text = new StringBuilder();
    text.append(position).append(": ").append(problem).append('\n');
    if (sourceLine != null) {
      // A long line (a huge literal, a minified file) is cut to a window around the column, so
      // that the message stays readable and the caret still points at the fault.
      int length = sourceLine.codePointCount(0, sourceLine.length());
      int first = 0;
      int last = length;
      if (length > SHOWN_WIDTH) {
        first = Math.max(0, Math.min(position.column() - 1 - SHOWN_WIDTH / 2, length - SHOWN_WIDTH));
        last = first + SHOWN_WIDTH;
      }
      String shown = sourceLine.substring(
          sourceLine.offsetByCodePoints(0, first), sourceLine.offsetByCodePoints(0, last));
      String before = first > 0 ? ELLIPSIS : "";
      text.append("  | ").append(before).append(shown)
          .append(last < length ? ELLIPSIS : "").append('\n');
      text.append("  | ").append(" ".repeat(before.length()))
          .append(caretPadding(shown, position.column() - first)).append("^\n");
    }
    if (hint != null) {
      text.append("  = ").append(hint).append('\n');
    }
    return text.toString();
  }

  /**
   * Spaces up to {@code column} of {@code line}, counted in code points as the lexer counts them;
   * a tab in the line is copied as a tab, so the caret lines up whatever width the terminal gives
   * tabs.
   */
  private static String caretPadding(String line, int column) {
    StringBuilder pad = new StringBuilder();
    int at = 1;
    int offset = 0;
    while (at < column && offset < line.length()) {
      int codePoint = line.codePointAt(offset);
      pad.append(codePoint == '\t' ? '\t' : ' ');
      offset += Character.charCount(codePoint);
      at++;
    }
    for (; at < column; at++) {
      pad.append(' ');
    }
    return pad.toString();
  }
}

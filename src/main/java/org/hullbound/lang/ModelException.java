package org.hullbound.lang;

/**
 * A fault in a model or data file, positioned so that it can be shown as {@code file:line:col},
 * the line itself and a caret under the fault.
 *
 * <p>Thrown by the parser and by binding in the {@code model} package; the CLI prints {@link
 * #render()} and exits with status 2, never a stack trace.
 */
public class ModelException extends RuntimeException {
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
      text.append("  | ").append(sourceLine).append('\n');
      text.append("  | ").append(caretPadding()).append("^\n");
    }
    if (hint != null) {
      text.append("  = ").append(hint).append('\n');
    }
    return text.toString();
  }

  /**
   * Spaces up to the column, counted in code points as the lexer counts them; a tab in the line
   * is copied as a tab, so the caret lines up whatever width the terminal gives tabs.
   */
  private String caretPadding() {
    StringBuilder pad = new StringBuilder();
    int column = 1;
    int offset = 0;
    while (column < position.column() && offset < sourceLine.length()) {
      int codePoint = sourceLine.codePointAt(offset);
      pad.append(codePoint == '\t' ? '\t' : ' ');
      offset += Character.charCount(codePoint);
      column++;
    }
    for (; column < position.column(); column++) {
      pad.append(' ');
    }
    return pad.toString();
  }
}

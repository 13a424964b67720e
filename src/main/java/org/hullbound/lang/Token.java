package org.hullbound.lang;

/**
 * One token of a model file: its kind, the text as written, its numeric value (numbers only) and
 * where it starts.
 *
 * <p>Kept with the written text so that messages can quote exactly what the user typed.
 */
public record Token(Kind kind, String text, double number, SourcePosition position) {

  /** The kinds of token; keywords and operators each have their own kind. */
  public enum Kind {
    NAME("a name"),
    /** A numeric literal, including {@code inf}. */
    NUMBER("a number"),
    MODEL("'model'"),
    INDEX("'index'"),
    DATA("'data'"),
    PARAM("'param'"),
    LET("'let'"),
    CHECK("'check'"),
    WITHIN("'within'"),
    /** {@code NA}, a missing value inside an inline data vector. */
    MISSING("'NA'"),
    TILDE("'~'"),
    EQUALS("'='"),
    COMMA("','"),
    COLON("':'"),
    RANGE("'..'"),
    PLUS("'+'"),
    MINUS("'-'"),
    STAR("'*'"),
    SLASH("'/'"),
    CARET("'^'"),
    OPEN_PAREN("'('"),
    CLOSE_PAREN("')'"),
    OPEN_BRACKET("'['"),
    CLOSE_BRACKET("']'"),
    /** The end of a statement: a line break outside every parenthesis and bracket. */
    NEWLINE("the end of the line"),
    END("the end of the file");

    private final String description;

    Kind(String description) {
      this.description = description;
    }

    /** How the kind is named in a message, such as {@code "'~'"} or {@code "a name"}. */
    public String description() {
      return description;
    }

    /** True for the keywords that begin a statement. */
    public boolean startsStatement() {
      return this == MODEL || this == INDEX || this == DATA || this == PARAM || this == LET
          || this == CHECK;
    }
  }

  /** How this token is named in a message: its text in quotes, or "the end of the line". */
  public String describe() {
    return switch (kind) {
      case NEWLINE, END -> kind.description();
      default -> "'" + text + "'";
    };
  }
}

package org.hullbound.lang;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Splits a model file into {@link Token}s on demand, each with its 1-based line and column.
 *
 * <p>Hand-written so that every fault gets a message of our own wording at the right place. A line
 * break ends a statement ({@link Token.Kind#NEWLINE}) unless a parenthesis or bracket is open; the
 * lexer keeps the open brackets, so that an unclosed one is reported where it was opened. Columns
 * count Unicode code points, so a caret lines up under non-ASCII text.
 */
public final class Lexer {

  /** Words that cannot name a quantity. */
  public static final Set<String> RESERVED_WORDS =
      Set.of("model", "index", "data", "param", "let", "check", "within", "NA", "inf");

  private static final Map<String, Token.Kind> KEYWORDS =
      Map.of(
          "model", Token.Kind.MODEL,
          "index", Token.Kind.INDEX,
          "data", Token.Kind.DATA,
          "param", Token.Kind.PARAM,
          "let", Token.Kind.LET,
          "check", Token.Kind.CHECK,
          "within", Token.Kind.WITHIN,
          "NA", Token.Kind.MISSING);

  private final SourceText source;
  private final String text;
  private int offset;
  private int line = 1;
  private int column = 1;
  private boolean firstOnLine = true;
  private final Deque<Token> openBrackets = new ArrayDeque<>();

  private Lexer(SourceText source) {
    this.source = source;
    StringBuilder joined = new StringBuilder();
    for (int i = 1; i <= source.lineCount(); i++) {
      if (i > 1) {
        joined.append('\n');
      }
      joined.append(source.line(i));
    }
    // A byte-order mark is an encoding artefact, not part of the text.
    if (joined.length() > 0 && joined.charAt(0) == '\uFEFF') {
      joined.setCharAt(0, ' ');
    }
    this.text = joined.toString();
  }

  /** A lexer over {@code source}, positioned at its start. */
  public static Lexer of(SourceText source) {
    if (source == null) {
      throw new IllegalArgumentException("source must not be null");
    }
    return new Lexer(source);
  }

  /** All tokens of {@code source}, ending with one {@link Token.Kind#END}. */
  public static List<Token> tokenize(SourceText source) {
    Lexer lexer = of(source);
    List<Token> tokens = new ArrayList<>();
    Token token;
    do {
      token = lexer.next();
      tokens.add(token);
    } while (token.kind() != Token.Kind.END);
    return tokens;
  }

  /**
   * The next token; after the last one, {@link Token.Kind#END} again and again.
   *
   * @throws ModelException for a character or number the language does not allow, a closing
   *     bracket that matches no opening one, or an opening bracket left unclosed
   */
  public Token next() {
    while (true) {
      skipBlanksAndComment();
      if (offset >= text.length()) {
        if (!openBrackets.isEmpty()) {
          Token open = openBrackets.peek();
          throw error(
              open.position(),
              "this '" + open.text() + "' is never closed; the file ends first",
              "close it with '" + closing(open.text()) + "'");
        }
        return token(Token.Kind.END, "", position());
      }
      char c = text.charAt(offset);
      if (c == '\n') {
        SourcePosition at = position();
        advance();
        line++;
        column = 1;
        firstOnLine = true;
        if (openBrackets.isEmpty()) {
          return token(Token.Kind.NEWLINE, "\n", at);
        }
        continue;
      }
      boolean first = firstOnLine;
      firstOnLine = false;
      if (isNameStart(c)) {
        return name(first);
      }
      if (isDigit(c) || (c == '.' && isDigit(charAt(offset + 1)))) {
        return number();
      }
      return operator(c);
    }
  }

  private void skipBlanksAndComment() {
    while (offset < text.length()) {
      char c = text.charAt(offset);
      if (c == ' ' || c == '\t') {
        advance();
      } else if (c == '#') {
        while (offset < text.length() && text.charAt(offset) != '\n') {
          advance();
        }
      } else {
        return;
      }
    }
  }

  private Token name(boolean firstOnItsLine) {
    SourcePosition at = position();
    int start = offset;
    while (offset < text.length() && isNamePart(text.charAt(offset))) {
      advance();
    }
    String word = text.substring(start, offset);
    if (word.equals("inf")) {
      return new Token(Token.Kind.NUMBER, word, Double.POSITIVE_INFINITY, at);
    }
    Token.Kind kind = KEYWORDS.getOrDefault(word, Token.Kind.NAME);
    if (kind.startsStatement() && firstOnItsLine && !openBrackets.isEmpty()) {
      Token open = openBrackets.peek();
      throw error(
          open.position(),
          "this '"
              + open.text()
              + "' is not closed before the '"
              + word
              + "' statement on line "
              + at.line(),
          "close it with '" + closing(open.text()) + "'");
    }
    return token(kind, word, at);
  }

  /** digits [ '.' digits? ] | '.' digits, then an optional exponent e[+-]digits. */
  private Token number() {
    SourcePosition at = position();
    int start = offset;
    skipDigits();
    // A '.' directly followed by another '.' is the range operator, as in 1..8.
    if (charAt(offset) == '.' && charAt(offset + 1) != '.') {
      advance();
      skipDigits();
    }
    if (charAt(offset) == 'e' || charAt(offset) == 'E') {
      int exponentStart = offset;
      advance();
      if (charAt(offset) == '+' || charAt(offset) == '-') {
        advance();
      }
      if (!isDigit(charAt(offset))) {
        String written = text.substring(start, offset);
        throw error(
            at,
            "the number '" + written + "' has no digits after its exponent '"
                + text.charAt(exponentStart) + "'",
            "write the exponent as digits, as in 1e-3 or 2.5E4");
      }
      skipDigits();
    }
    String written = text.substring(start, offset);
    double value;
    try {
      value = NumberSyntax.parse(written);
    } catch (NumberSyntax.InvalidNumberException e) {
      throw error(at, "the number " + e.getMessage(), e.hint());
    }
    return new Token(Token.Kind.NUMBER, written, value, at);
  }

  private Token operator(char c) {
    SourcePosition at = position();
    Token.Kind kind =
        switch (c) {
          case '~' -> Token.Kind.TILDE;
          case '=' -> Token.Kind.EQUALS;
          case ',' -> Token.Kind.COMMA;
          case ':' -> Token.Kind.COLON;
          case '+' -> Token.Kind.PLUS;
          case '-' -> Token.Kind.MINUS;
          case '*' -> Token.Kind.STAR;
          case '/' -> Token.Kind.SLASH;
          case '^' -> Token.Kind.CARET;
          case '(' -> Token.Kind.OPEN_PAREN;
          case ')' -> Token.Kind.CLOSE_PAREN;
          case '[' -> Token.Kind.OPEN_BRACKET;
          case ']' -> Token.Kind.CLOSE_BRACKET;
          case '.' -> Token.Kind.RANGE;
          default -> null;
        };
    if (kind == null) {
      throw unexpectedCharacter(at);
    }
    if (kind == Token.Kind.RANGE) {
      if (charAt(offset + 1) != '.') {
        throw error(
            at,
            "unexpected '.'",
            "a range is written with two dots, as in 1 .. 8; a decimal number needs a digit"
                + " next to its point, as in 0.5");
      }
      if (charAt(offset + 2) == '.') {
        throw error(at, "found '...', which is not an operator", "a range has two dots: lo .. hi");
      }
      advance();
      advance();
      return token(kind, "..", at);
    }
    advance();
    Token token = token(kind, String.valueOf(c), at);
    if (kind == Token.Kind.OPEN_PAREN || kind == Token.Kind.OPEN_BRACKET) {
      openBrackets.push(token);
    } else if (kind == Token.Kind.CLOSE_PAREN || kind == Token.Kind.CLOSE_BRACKET) {
      closeBracket(token);
    }
    return token;
  }

  private void closeBracket(Token close) {
    String opening = close.kind() == Token.Kind.CLOSE_PAREN ? "(" : "[";
    if (openBrackets.isEmpty()) {
      throw error(
          close.position(),
          "found '" + close.text() + "' without a matching '" + opening + "' before it",
          null);
    }
    Token open = openBrackets.peek();
    if (!open.text().equals(opening)) {
      throw error(
          close.position(),
          "found '"
              + close.text()
              + "' while the '"
              + open.text()
              + "' opened at line "
              + open.position().line()
              + ", column "
              + open.position().column()
              + " is still open",
          "close the '" + open.text() + "' with '" + closing(open.text()) + "' first");
    }
    openBrackets.pop();
  }

  private ModelException unexpectedCharacter(SourcePosition at) {
    int codePoint = text.codePointAt(offset);
    String code = String.format("U+%04X", codePoint);
    boolean printable =
        !Character.isISOControl(codePoint)
            && Character.isDefined(codePoint)
            && !Character.isWhitespace(codePoint)
            && !Character.isSpaceChar(codePoint)
            && Character.getType(codePoint) != Character.FORMAT
            && Character.getType(codePoint) != Character.SURROGATE
            && Character.getType(codePoint) != Character.PRIVATE_USE;
    String shown = printable ? "'" + new String(Character.toChars(codePoint)) + "' (" + code + ")" : code;
    return error(at, "unexpected character " + shown, hintFor(codePoint));
  }

  private static String hintFor(int codePoint) {
    switch (codePoint) {
      case 0x2212, 0x2013, 0x2014:
        return "this is a typographic dash; write the minus sign '-'";
      case 0x00D7, 0x22C5, 0x00B7:
        return "write multiplication as '*'";
      case 0x00A0, 0x2009, 0x202F, 0x3000:
        return "this is a special space; write an ordinary space";
      case 0x2026:
        return "a range has two dots: lo .. hi";
      case ';':
        return "a statement ends at the end of its line; no ';' is needed";
      case '{', '}':
        return "the language has no blocks; a quantity declared over an index set loops over it";
      case '"', '\'', 0x201C, 0x201D, 0x2018, 0x2019:
        return "the language has no strings; names are written without quotes";
      case '<', '>':
        return "for bounds write 'within lo .. hi' after the distribution";
      case '\r', '\f', 0x0B:
        return "remove the control character";
      default:
        if (Character.isLetter(codePoint)) {
          return "names use only the ASCII letters a-z and A-Z, digits and '_'";
        }
        return null;
    }
  }

  private Token token(Token.Kind kind, String written, SourcePosition at) {
    return new Token(kind, written, Double.NaN, at);
  }

  private ModelException error(SourcePosition at, String problem, String hint) {
    return ModelException.at(source, at, problem, hint);
  }

  private SourcePosition position() {
    return source.position(line, column);
  }

  private void advance() {
    offset += Character.isHighSurrogate(text.charAt(offset))
            && offset + 1 < text.length()
            && Character.isLowSurrogate(text.charAt(offset + 1))
        ? 2
        : 1;
    column++;
  }

  private void skipDigits() {
    while (isDigit(charAt(offset))) {
      advance();
    }
  }

  private char charAt(int at) {
    return at < text.length() ? text.charAt(at) : '\0';
  }

  private static String closing(String opening) {
    return opening.equals("(") ? ")" : "]";
  }

  private static boolean isDigit(char c) {
    return c >= '0' && c <= '9';
  }

  private static boolean isNameStart(char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_';
  }

  private static boolean isNamePart(char c) {
    return isNameStart(c) || isDigit(c);
  }
}

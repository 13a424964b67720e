package org.hullbound.lang;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** The lexer's tokens, their values and their 1-based positions. */
class LexerTest {

  private static List<Token> tokens(String text) {
    return Lexer.tokenize(SourceText.of("t.hbm", text));
  }

  private static String kinds(String text) {
    return tokens(text).stream().map(t -> t.kind().name()).collect(Collectors.joining(" "));
  }

  @Test
  void keywordsOperatorsAndNames() {
    assertEquals(
        "MODEL INDEX DATA PARAM LET WITHIN MISSING NAME NUMBER END",
        kinds("model index data param let within NA sum inf"));
    assertEquals(
        "TILDE EQUALS COMMA COLON RANGE PLUS MINUS STAR SLASH CARET OPEN_PAREN CLOSE_PAREN"
            + " OPEN_BRACKET CLOSE_BRACKET END",
        kinds("~ = , : .. + - * / ^ ( ) [ ]"));
  }

  @Test
  void namesUseLettersDigitsAndUnderscores() {
    List<Token> t = tokens("bench_of x2 _hidden A");
    assertEquals(List.of("bench_of", "x2", "_hidden", "A"), t.subList(0, 4).stream().map(Token::text).toList());
  }

  @ParameterizedTest(name = "{0} is {1}")
  @CsvSource({
    "0, 0",
    "42, 42",
    "2., 2",
    ".5, 0.5",
    "1e-3, 0.001",
    "1E3, 1000",
    "2.5e+2, 250",
    "6.02e23, 6.02e23",
    "999999999999999999999, 1e21",
    "4.9e-324, 4.9e-324",
    "1.7976931348623157e308, 1.7976931348623157e308",
    "0e999, 0",
  })
  void numbers(String written, double value) {
    List<Token> t = tokens(written);
    assertEquals(Token.Kind.NUMBER, t.get(0).kind());
    assertEquals(value, t.get(0).number());
    assertEquals(written, t.get(0).text());
    assertEquals(Token.Kind.END, t.get(1).kind());
  }

  @Test
  void infIsAnInfiniteNumber() {
    Token inf = tokens("inf").get(0);
    assertEquals(Double.POSITIVE_INFINITY, inf.number());
    assertEquals("inf", inf.text());
  }

  @Test
  void rangeBetweenIntegersIsNotADecimalPoint() {
    List<Token> t = tokens("1..8");
    assertEquals("NUMBER RANGE NUMBER END", kinds("1..8"));
    assertEquals(1, t.get(0).number());
    assertEquals(8, t.get(2).number());
    assertEquals("NUMBER RANGE NUMBER END", kinds("1. .. .5"));
  }

  @Test
  void positionsAreOneBasedLinesAndColumns() {
    List<Token> t = tokens("let x =\n  log(y)");
    assertEquals(new SourcePosition("t.hbm", 1, 1), t.get(0).position());
    assertEquals(new SourcePosition("t.hbm", 1, 5), t.get(1).position());
    assertEquals(new SourcePosition("t.hbm", 1, 7), t.get(2).position());
    assertEquals(Token.Kind.NEWLINE, t.get(3).kind());
    assertEquals(new SourcePosition("t.hbm", 1, 8), t.get(3).position());
    assertEquals(new SourcePosition("t.hbm", 2, 3), t.get(4).position());
    assertEquals(new SourcePosition("t.hbm", 2, 6), t.get(5).position());
  }

  @Test
  void aTabCountsAsOneColumn() {
    assertEquals(3, tokens("\t\tx").get(0).position().column());
  }

  @Test
  void columnsCountCodePointsNotUtf16Units() {
    // U+1F331 (a seedling emoji) is two UTF-16 units but one code point.
    List<Token> t = tokens("# \uD83C\uDF31\nlet x = 1 # \uD83C\uDF31 \uD83C\uDF31\nlet y = 2");
    assertEquals(new SourcePosition("t.hbm", 3, 5), t.get(t.size() - 4).position());
    ModelException e = assertThrows(ModelException.class, () -> tokens("\uD83C\uDF31 x"));
    assertEquals(1, e.position().column());
    ModelException after = assertThrows(ModelException.class, () -> tokens("x \u00e9\u00e9 \uD83C\uDF31"));
    assertEquals(3, after.position().column());
  }

  @Test
  void commentsRunToTheEndOfTheLine() {
    assertEquals("NAME NEWLINE NAME END", kinds("a # b ( [ ~ \nc"));
    assertEquals("NAME END", kinds("a #"));
  }

  @Test
  void newlinesInsideBracketsDoNotEndTheStatement() {
    assertEquals("NAME OPEN_PAREN NAME CLOSE_PAREN NEWLINE NAME END", kinds("f(\n x # note\n\n)\ng"));
    assertEquals("OPEN_BRACKET NUMBER COMMA NUMBER CLOSE_BRACKET END", kinds("[1,\n2]"));
    assertEquals("OPEN_PAREN OPEN_BRACKET CLOSE_BRACKET CLOSE_PAREN NEWLINE END", kinds("([\n])\n"));
  }

  @Test
  void everyLineEndIsANewline() {
    assertEquals("NAME NEWLINE NAME NEWLINE NAME NEWLINE NAME END", kinds("a\r\nb\rc\nd"));
    List<Token> t = tokens("a\r\nb");
    assertEquals(new SourcePosition("t.hbm", 2, 1), t.get(2).position());
  }

  @Test
  void aLeadingByteOrderMarkIsIgnored() {
    List<Token> t = tokens("\uFEFFmodel m");
    assertEquals(Token.Kind.MODEL, t.get(0).kind());
  }

  @Test
  void endRepeatsAfterTheLastToken() {
    Lexer lexer = Lexer.of(SourceText.of("t", "x"));
    assertEquals(Token.Kind.NAME, lexer.next().kind());
    for (int i = 0; i < 3; i++) {
      assertEquals(Token.Kind.END, lexer.next().kind());
    }
  }

  @Test
  void anUnclosedBracketIsReportedWhereItWasOpened() {
    ModelException e = assertThrows(ModelException.class, () -> tokens("a\n  f(x, [1,\n 2"));
    assertEquals(new SourcePosition("t.hbm", 2, 8), e.position());
    assertTrue(e.problem().contains("'[' is never closed"), e.problem());
  }

  @Test
  void aControlCharacterIsShownByItsCodeOnly() {
    ModelException e = assertThrows(ModelException.class, () -> tokens("let x = \u0000"));
    assertEquals("unexpected character U+0000", e.problem());
    assertEquals(9, e.position().column());
  }

  @Test
  void describesTokensForMessages() {
    List<Token> t = tokens("normal\n");
    assertEquals("'normal'", t.get(0).describe());
    assertEquals("the end of the line", t.get(1).describe());
    assertEquals("the end of the file", t.get(2).describe());
  }
}

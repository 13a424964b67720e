package org.hullbound.lang;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

/** {@link ModelException#render()} shows the position, the line and a caret under the fault. */
class ModelExceptionTest {

  private static String renderedError(String text) {
    return assertThrows(ModelException.class, () -> Parser.parse("m.hbm", text)).render();
  }

  @Test
  void caretStandsUnderTheOffendingToken() {
    assertEquals(
        "m.hbm:2:11: expected '~', '=', ',' or the end of the line after the declaration of 'y',"
            + " found 'normal'\n"
            + "  | data y[s] normal(mean = 0, sd = 1)\n"
            + "  |           ^\n"
            + "  = write '~' before the family: data y[s] ~ normal(...)\n",
        renderedError("model m\ndata y[s] normal(mean = 0, sd = 1)\n"));
  }

  @Test
  void tabsBeforeTheFaultAreKeptSoTheCaretLinesUp() {
    assertEquals(
        "m.hbm:1:8: expected '=' after the declaration of 'x', found '+'\n"
            + "  | \tlet\tx\t+ 1\n"
            + "  | \t   \t \t^\n",
        renderedError("\tlet\tx\t+ 1"));
  }

  @Test
  void nonAsciiTextBeforeTheFaultTakesOneColumnPerCharacter() {
    String rendered = renderedError("let x = 1 # \u00e9t\u00e9 \uD83C\uDF31\nlet y = (\u00e9t\u00e9");
    assertEquals(
        "m.hbm:2:10: unexpected character '\u00e9' (U+00E9)\n"
            + "  | let y = (\u00e9t\u00e9\n"
            + "  |          ^\n"
            + "  = names use only the ASCII letters a-z and A-Z, digits and '_'\n",
        rendered);
  }

  @Test
  void aFaultAtTheEndOfTheLinePutsTheCaretJustPastIt() {
    assertEquals(
        "m.hbm:1:12: expected an expression after '+', found the end of the line\n"
            + "  | let x = 1 +\n"
            + "  |            ^\n"
            + "  = a statement continues onto the next line only while a parenthesis or bracket"
            + " is open; wrap the expression in ( ... ) to break it across lines\n",
        renderedError("let x = 1 +\n  2"));
  }

  @Test
  void withoutALineOnlyThePositionAndProblemAreShown() {
    ModelException e =
        new ModelException(new SourcePosition("d.csv", 3, 4), null, "bad cell", null);
    assertEquals("d.csv:3:4: bad cell\n", e.render());
    assertEquals("d.csv:3:4: bad cell", e.getMessage());
  }

  @Test
  void aPositionPastTheLineIsPaddedWithSpaces() {
    ModelException e =
        new ModelException(new SourcePosition("f", 1, 6), "ab", "past the end", "a hint");
    assertEquals("f:1:6: past the end\n  | ab\n  |      ^\n  = a hint\n", e.render());
    assertEquals("f:1:6: past the end (a hint)", e.getMessage());
  }

  @Test
  void aHugeLiteralIsShortenedInTheProblemAndTheLine() {
    // 1e2000 written out: too large for a double, reported at its first digit (column 10).
    String rendered = renderedError("data x = " + "9".repeat(2000) + "\n");
    String[] lines = rendered.split("\n");
    assertEquals(true, lines[0].length() < 200, lines[0]);
    assertEquals(true, lines[0].startsWith("m.hbm:1:10: the number '999"), lines[0]);
    String shown = lines[1].substring("  | ".length());
    assertEquals("data x = " + "9".repeat(91) + "...", shown);
    assertEquals(" ".repeat(9) + "^", lines[2].substring("  | ".length()));
  }

  @Test
  void aLongLineCutOnBothSidesKeepsTheCaretUnderTheFault() {
    String line = "let x = " + "1 + ".repeat(100) + "1 ) " + "+ 2 ".repeat(100);
    String rendered = renderedError(line + "\n");
    String[] lines = rendered.split("\n");
    int column = Integer.parseInt(lines[0].split(":")[2]);
    assertEquals(')', line.charAt(column - 1), rendered);
    String shown = lines[1].substring("  | ".length());
    String caret = lines[2].substring("  | ".length());
    assertEquals(true, shown.startsWith("...") && shown.endsWith("..."), shown);
    assertEquals(3 + 100 + 3, shown.length(), shown);
    assertEquals(')', shown.charAt(caret.indexOf('^')), rendered);
    assertEquals(caret.length() - 1, caret.indexOf('^'));
  }
}

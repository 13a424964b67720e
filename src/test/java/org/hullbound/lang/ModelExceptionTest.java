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
}

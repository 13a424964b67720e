package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** Escaping follows XML 1.0 (W3C, section 2.2 characters and 2.4 markup); numbers stay compact. */
class MarkupTest {

  @Test
  void theFiveMarkupCharactersAreEscaped() {
    assertEquals("a&lt;b&amp;c&gt;d&quot;e&#39;f", Markup.escape("a<b&c>d\"e'f"));
  }

  @Test
  void charactersXmlForbidsBecomeReplacementCharacters() {
    assertEquals("a\uFFFDb\uFFFDc", Markup.escape("a\u0001b\uFFFEc"));
    assertEquals("x\uFFFD", Markup.escape("x\uD800"));
    assertEquals("tab\tok \uD83D\uDE00", Markup.escape("tab\tok \uD83D\uDE00"));
  }

  @Test
  void coordinatesHaveOneDecimalAtMost() {
    assertEquals("12.3", Markup.coordinate(new StringBuilder(), 12.34).toString());
    assertEquals("-0.5", Markup.coordinate(new StringBuilder(), -0.46).toString());
    assertEquals("7", Markup.coordinate(new StringBuilder(), 7.01).toString());
  }
}

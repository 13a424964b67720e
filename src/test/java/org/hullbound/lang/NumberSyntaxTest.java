package org.hullbound.lang;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The number grammar of docs/model-language.md ("Numbers"): the forms it lists are read with the
 * value it lists; the forms Java's {@code Double.parseDouble} also takes (type suffixes,
 * hexadecimal, {@code NaN}, {@code Infinity}, a leading {@code +}) are refused.
 */
class NumberSyntaxTest {

  @ParameterizedTest(name = "{0} = {1}")
  @CsvSource({
    "42, 42", "0, 0", "2.5, 2.5", "2., 2", ".5, 0.5", "1e-3, 0.001", "2.5E+2, 250",
    "6.02e23, 6.02e23", "-3, -3", "-.5, -0.5", "1.0E-5, 0.00001",
    // Long integers are rounded to the nearest double (docs/model-language.md).
    "999999999999999999999, 1e21",
    // The smallest subnormal is representable (IEEE 754 binary64, common practice).
    "4.9e-324, 4.9e-324"
  })
  void readsTheDocumentedForms(String text, double value) {
    assertEquals(value, NumberSyntax.parse(text));
  }

  /**
   * Plain decimals (no exponent) are read by a fast path of their own (Clinger 1990): the same
   * bits as the JDK's {@code Double.parseDouble}, the reference here (correctly rounded by its
   * specification), on the edges of that path (2^53 and 22 digits after the point, where it hands
   * over) and on 200,000 random decimals of 1 to 20 digits with the point anywhere (fixed seed).
   */
  @Test
  void readsPlainDecimalsAsTheJdksCorrectlyRoundedParser() {
    String[] edges = {
      "9007199254740991", "9007199254740992", "9007199254740993", "900719925474099.1",
      "90071992547409.93", "0.1", "0.2", "0.3", "2.2", "1.0000000000000002", "-0", "-0.0", "0.",
      "000123.4500", "0.0000000000000000000001", "0.00000000000000000000001",
      "1.2345678901234567890", "123456789012345678", "-8.7", ".000001", "17.29999999999999"
    };
    for (String text : edges) {
      assertEquals(Double.doubleToRawLongBits(Double.parseDouble(text)),
          Double.doubleToRawLongBits(NumberSyntax.parse(text)), text);
    }
    java.util.Random random = new java.util.Random(20261203L);
    for (int i = 0; i < 200_000; i++) {
      StringBuilder text = new StringBuilder(random.nextBoolean() ? "-" : "");
      int length = 1 + random.nextInt(20);
      int point = random.nextInt(length + 1);
      for (int d = 0; d < length; d++) {
        if (d == point) {
          text.append('.');
        }
        text.append((char) ('0' + random.nextInt(10)));
      }
      String written = text.toString();
      assertEquals(Double.doubleToRawLongBits(Double.parseDouble(written)),
          Double.doubleToRawLongBits(NumberSyntax.parse(written)), written);
    }
  }

  @ParameterizedTest
  @ValueSource(strings = {"inf", "-inf"})
  void readsInfinity(String text) {
    assertEquals(
        text.startsWith("-") ? Double.NEGATIVE_INFINITY : Double.POSITIVE_INFINITY,
        NumberSyntax.parse(text));
  }

  @ParameterizedTest
  @ValueSource(strings = {
    "22d", "2.2e1f", "0x1.6p4", "22D", "1F", "NaN", "Infinity", "-Infinity", "+1", "1e", "1e+",
    ".", "-", "", " 1", "1 ", "1_000", "1,5", "--1", "1..2", "e3", "0x10", "1.2.3", "-inf2", "INF",
    "-.", "..", "5..", "-1.5.", "1-2"
  })
  void refusesEverythingElse(String text) {
    NumberSyntax.InvalidNumberException e =
        assertThrows(NumberSyntax.InvalidNumberException.class, () -> NumberSyntax.parse(text));
    assertEquals("'" + text + "' is not a number", e.getMessage());
  }

  @ParameterizedTest
  @ValueSource(strings = {"1e999", "-1e400", "2e308"})
  void refusesWhatOverflows(String text) {
    NumberSyntax.InvalidNumberException e =
        assertThrows(NumberSyntax.InvalidNumberException.class, () -> NumberSyntax.parse(text));
    assertTrue(e.getMessage().contains("too large to represent"), e.getMessage());
  }

  @ParameterizedTest
  @ValueSource(strings = {"1e-999", "-2.5e-400"})
  void refusesWhatUnderflowsToZero(String text) {
    NumberSyntax.InvalidNumberException e =
        assertThrows(NumberSyntax.InvalidNumberException.class, () -> NumberSyntax.parse(text));
    assertTrue(e.getMessage().contains("too small to represent"), e.getMessage());
  }

  @ParameterizedTest
  @ValueSource(strings = {"0", "0.0", "0e-999", "-0.000"})
  void zeroWrittenAsZeroIsZero(String text) {
    assertEquals(0.0, Math.abs(NumberSyntax.parse(text)));
  }

  @Test
  void messagesWriteNumbersAsTheLanguageDoesAndTheyReadBack() {
    // The spellings are this project's grammar (docs/model-language.md); 0.1 + 0.2 and 3e-8 * (1 +
    // 2^-52) are the usual binary rounding examples (IEEE 754, common practice).
    assertEquals("-inf", NumberSyntax.written(Double.NEGATIVE_INFINITY));
    assertEquals("inf", NumberSyntax.written(Double.POSITIVE_INFINITY));
    assertEquals("-1", NumberSyntax.written(-1.0));
    assertEquals("0.1", NumberSyntax.written(0.1));
    assertEquals("0.3", NumberSyntax.written(0.1 + 0.2));
    assertEquals("3e-8", NumberSyntax.written(3.0000000000000004E-8));
    assertEquals("-2.5e-5", NumberSyntax.written(-0.000025));
    assertEquals("1.5e20", NumberSyntax.written(1.5e20));
    assertEquals("0.333333", NumberSyntax.written(1.0 / 3));
    assertEquals("NaN", NumberSyntax.written(Double.NaN));
    for (double v : new double[] {0.1, 3e-8, -2.5e-5, 1.5e20, 1e300, 4.9e-324, 0.5}) {
      assertEquals(v, NumberSyntax.parse(NumberSyntax.written(v)), NumberSyntax.written(v));
    }
  }

  @Test
  void wholeNumbersAreExactOverTheRangeOfALong() {
    // Long.MIN_VALUE and MAX_VALUE are -2^63 and 2^63 - 1 (Java Language Specification 4.2.1).
    assertEquals(Long.MIN_VALUE, NumberSyntax.parseWhole("-9223372036854775808"));
    assertEquals(Long.MAX_VALUE, NumberSyntax.parseWhole("9223372036854775807"));
    assertEquals(1000, NumberSyntax.parseWhole("1e3"));
    assertEquals(-12, NumberSyntax.parseWhole("-12.0"));
    assertTrue(assertThrows(NumberSyntax.InvalidNumberException.class,
        () -> NumberSyntax.parseWhole("9223372036854775808")).getMessage().contains("too large"));
  }

  @ParameterizedTest
  @ValueSource(strings = {"22d", "0x1.6p4", "2.2e1f", "+5", "2.5", "1e20", "\u0665", "", "-"})
  void wholeNumbersOutsideTheGrammarOrNotWholeAreRefused(String text) {
    assertThrows(NumberSyntax.InvalidNumberException.class, () -> NumberSyntax.parseWhole(text));
  }
}

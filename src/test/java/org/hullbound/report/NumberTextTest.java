package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

class NumberTextTest {

  @Test
  void moderateNumbersGetPlainNotationWithFixedSignificantDigits() {
    assertEquals("1235", NumberText.significant(1234.6, 4));
    assertEquals("0.5000", NumberText.significant(0.5, 4));
    assertEquals("2.000", NumberText.significant(2, 4));
    assertEquals("-3.142", NumberText.significant(-Math.PI, 4));
    assertEquals("0.001000", NumberText.significant(0.00099996, 4));
    assertEquals("99990", NumberText.significant(99990.2, 4));
    assertEquals("0.33", NumberText.significant(1.0 / 3, 2));
    assertEquals("0", NumberText.significant(0, 4));
    assertEquals("0", NumberText.significant(-0.0, 4));
  }

  @Test
  void hugeAndTinyNumbersGetScientificNotation() {
    assertEquals("1.235e+05", NumberText.significant(123456, 4));
    assertEquals("1.000e+05", NumberText.significant(99999.7, 4));
    assertEquals("-1.234e-04", NumberText.significant(-0.00012341, 4));
    assertEquals("1.000e-300", NumberText.significant(1e-300, 4));
    assertEquals("1.798e+308", NumberText.significant(Double.MAX_VALUE, 4));
    assertEquals("4.9e-324", NumberText.significant(Double.MIN_VALUE, 2));
    assertEquals("-6.0e+23", NumberText.significant(-6.02e23, 2));
  }

  @Test
  void nonFiniteValuesAreWords() {
    assertEquals("n/a", NumberText.significant(Double.NaN, 4));
    assertEquals("inf", NumberText.significant(Double.POSITIVE_INFINITY, 4));
    assertEquals("-inf", NumberText.significant(Double.NEGATIVE_INFINITY, 4));
    assertEquals("n/a", NumberText.fixed(Double.NaN, 3));
    assertEquals("inf", NumberText.fixed(Double.POSITIVE_INFINITY, 3));
    assertEquals("n/a", NumberText.count(Double.NaN));
  }

  @Test
  void fixedDecimalsForRhat() {
    assertEquals("1.000", NumberText.fixed(1.0004, 3));
    assertEquals("1.083", NumberText.fixed(1.0826, 3));
    assertEquals("0.998", NumberText.fixed(0.99812, 3));
    assertEquals("12.500", NumberText.fixed(12.5, 3));
    assertEquals("1.235e+05", NumberText.fixed(123456.7, 3));
  }

  @Test
  void countsAreWholeNumbersExceptWhenSmallOrHuge() {
    assertEquals("4071", NumberText.count(4071.4));
    assertEquals("12", NumberText.count(11.6));
    assertEquals("3.2", NumberText.count(3.24));
    assertEquals("2.50e+07", NumberText.count(2.5e7));
  }
}

package org.hullbound.report;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/**
 * Short renderings of numbers for the terminal: a fixed count of significant digits, plain
 * notation for moderate magnitudes and scientific notation outside them, "n/a" for NaN.
 *
 * <p>One place for these rules keeps the table and the verdicts consistent; the thresholds
 * (plain for 0.001 &lt;= |x| &lt; 100000) are our own choice for readability (common practice
 * in spirit, not from a standard).
 */
final class NumberText {
  static final String NOT_AVAILABLE = "n/a";
  private static final double SMALLEST_PLAIN = 1e-3;
  private static final double LARGEST_PLAIN = 1e5;

  private NumberText() {}

  /** {@code x} to {@code digits} significant digits, e.g. 1234.5 to 4 gives "1235". */
  static String significant(double x, int digits) {
    if (Double.isNaN(x)) {
      return NOT_AVAILABLE;
    }
    if (Double.isInfinite(x)) {
      return x > 0 ? "inf" : "-inf";
    }
    if (x == 0) {
      return "0";
    }
    BigDecimal rounded = new BigDecimal(x).round(new MathContext(digits, RoundingMode.HALF_UP));
    double magnitude = Math.abs(rounded.doubleValue());
    if (magnitude < SMALLEST_PLAIN || magnitude >= LARGEST_PLAIN) {
      return scientific(rounded, digits);
    }
    if (rounded.precision() < digits) {
      // Pad with zeros so that every entry shows the same number of significant digits.
      rounded = rounded.setScale(rounded.scale() + digits - rounded.precision());
    }
    if (rounded.scale() < 0) {
      rounded = rounded.setScale(0, RoundingMode.UNNECESSARY);
    }
    return rounded.toPlainString();
  }

  /** {@code x} with exactly {@code decimals} decimals, or scientific when that hides it. */
  static String fixed(double x, int decimals) {
    if (Double.isNaN(x) || Double.isInfinite(x)) {
      return significant(x, 1);
    }
    if (Math.abs(x) >= LARGEST_PLAIN) {
      return significant(x, decimals + 1);
    }
    return new BigDecimal(x).setScale(decimals, RoundingMode.HALF_UP).toPlainString();
  }

  /** A count-like value (effective sample size): whole numbers, 2 significant digits below 10. */
  static String count(double x) {
    if (Double.isNaN(x) || Double.isInfinite(x)) {
      return significant(x, 1);
    }
    if (Math.abs(x) < 10) {
      return significant(x, 2);
    }
    if (Math.abs(x) >= 1e7) {
      return significant(x, 3);
    }
    return Long.toString(Math.round(x));
  }

  /** Mantissa with {@code digits - 1} decimals and a signed exponent of two or more digits. */
  private static String scientific(BigDecimal rounded, int digits) {
    int exponent = rounded.precision() - rounded.scale() - 1;
    BigDecimal mantissa =
        rounded.movePointLeft(exponent).setScale(digits - 1, RoundingMode.HALF_UP);
    String sign = exponent < 0 ? "-" : "+";
    int absolute = Math.abs(exponent);
    return mantissa.toPlainString() + "e" + sign + (absolute < 10 ? "0" : "") + absolute;
  }
}

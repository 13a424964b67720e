package org.hullbound.lang;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;

/**
 * The one grammar of numbers that hullbound reads, wherever they come from: literals of a model
 * file, cells of a data file, starting values, and command options that take numbers.
 *
 * <p>A number is the language's literal, {@code digits [. digits?] | . digits}, then an optional
 * exponent {@code e} or {@code E}, optional sign, digits; or the word {@code inf}. Written alone
 * (a cell, an option) it may carry one leading {@code -}. Nothing else is a number: Java's suffixes
 * and hexadecimal forms ({@code 22d}, {@code 2.2e1f}, {@code 0x1.6p4}), which
 * {@link Double#parseDouble} would read as 22, are refused, as are {@code +1}, {@code NaN} and
 * {@code Infinity}. A value too large to represent ({@code 1e999}) or too small to tell from zero
 * ({@code 1e-999}) is refused rather than silently made infinite or zero. Whether {@code inf} or a
 * missing-value word is allowed at a place is for the caller to say.
 */
public final class NumberSyntax {
  private NumberSyntax() {}

  /**
   * A text that is not a number of the grammar, or one outside the range of a double.
   * {@link #reason()} completes a sentence that starts with the text, as in {@code "'22d' " +
   * reason()}.
   */
  public static final class InvalidNumberException extends IllegalArgumentException {
    private final String reason;
    private final String hint;

    InvalidNumberException(String text, String reason, String hint) {
      super("'" + shortened(text) + "' " + reason);
      this.reason = reason;
      this.hint = hint;
    }

    /** What is wrong, e.g. {@code "is not a number"}. */
    public String reason() {
      return reason;
    }

    /** How to write it instead. */
    public String hint() {
      return hint;
    }
  }

  /** {@code text}, or for a huge one its start and end around "...", to keep messages short. */
  public static String shortened(String text) {
    return text.length() <= 40 ? text : text.substring(0, 24) + "..." + text.substring(text.length() - 12);
  }

  /** Significant digits a message shows of a number that is not whole. */
  private static final int MESSAGE_DIGITS = 6;

  /**
   * {@code value} as a message shows it, in this grammar so that it can be pasted back into a
   * model, data file or option: {@code inf} and {@code -inf} for the infinities, whole numbers
   * without a point ({@code -1}), others with the fewest significant digits (at most six) that
   * give them back, as in {@code 0.1}, {@code 3e-8} (not {@code 3.0000000000000004E-8}) and
   * {@code 1.5e+20} written {@code 1.5e20}. {@code NaN}, which the grammar has no word for, is
   * shown as {@code NaN}.
   */
  public static String written(double value) {
    if (Double.isNaN(value)) {
      return "NaN";
    }
    if (Double.isInfinite(value)) {
      return value > 0 ? "inf" : "-inf";
    }
    if (value == Math.rint(value) && Math.abs(value) < 1e15) {
      return Long.toString((long) value);
    }
    BigDecimal shown = null;
    for (int digits = 1; digits <= MESSAGE_DIGITS; digits++) {
      shown = new BigDecimal(value).round(new MathContext(digits, RoundingMode.HALF_EVEN));
      if (shown.doubleValue() == value) {
        break;
      }
    }
    shown = shown.stripTrailingZeros();
    int exponent = shown.precision() - shown.scale() - 1;
    if (exponent >= -4 && exponent < 15) {
      return shown.toPlainString();
    }
    String mantissa = shown.movePointLeft(exponent).toPlainString();
    return mantissa + "e" + exponent;
  }

  /** What a number is, for hints. */
  public static final String FORMS = "digits with an optional point and exponent, as in 22, -0.5,"
      + " 2.5e-3";

  /**
   * The value of {@code text}: a literal or {@code inf}, optionally preceded by {@code -}.
   *
   * @throws InvalidNumberException when it is not of that form, or too large or too small to
   *     represent
   */
  public static double parse(String text) {
    int start = text.startsWith("-") ? 1 : 0;
    if (text.startsWith("inf", start) && text.length() == start + 3) {
      return start == 0 ? Double.POSITIVE_INFINITY : Double.NEGATIVE_INFINITY;
    }
    double plain = plainDecimal(text, start);
    if (plain == plain) {
      return plain;
    }
    if (start == text.length() || literalEnd(text, start) != text.length()) {
      throw new InvalidNumberException(text, "is not a number", "write a number as " + FORMS);
    }
    // The grammar is a subset of Java's, so parseDouble reads it exactly (correctly rounded).
    double value = Double.parseDouble(text);
    if (Double.isInfinite(value)) {
      throw new InvalidNumberException(
          text, "is too large to represent (the largest is about 1.8e308)", "write 'inf' for"
              + " infinity");
    }
    if (value == 0 && hasNonZeroDigit(text)) {
      throw new InvalidNumberException(
          text, "is too small to represent; it would become 0", "the smallest positive number is"
              + " about 4.9e-324");
    }
    return value;
  }

  /**
   * The value of {@code text} from {@code start} where it is a literal without exponent (digits
   * with at most one point, at least one digit) whose digits, point removed, make a whole number
   * below 2^53 with at most 22 after the point: that number and the power of ten are then exact doubles, and their quotient,
   * rounded once by the division, is the correctly rounded value of the decimal (Clinger 1990,
   * "How to read floating point numbers accurately", the fast path), the same bits as {@link
   * Double#parseDouble}. {@code NaN} for any other literal, which parseDouble reads. Why: data
   * files of millions of cells such as {@code 2.2} spent most of their reading in parseDouble's
   * general algorithm (issue 14).
   */
  private static double plainDecimal(String text, int start) {
    long digits = 0;
    int afterPoint = -1;
    if (start + (text.indexOf('.') >= 0 ? 1 : 0) >= text.length()) {
      return Double.NaN; // no digit: not a literal
    }
    for (int i = start; i < text.length(); i++) {
      char c = text.charAt(i);
      if (c == '.') {
        if (afterPoint >= 0) {
          return Double.NaN; // a second point: not a literal
        }
        afterPoint = 0;
        continue;
      }
      if (c < '0' || c > '9' || digits >= EXACT_DIGITS) {
        return Double.NaN;
      }
      digits = 10 * digits + (c - '0');
      if (afterPoint >= 0) {
        afterPoint++;
      }
    }
    if (afterPoint >= POWERS_OF_TEN.length) {
      return Double.NaN;
    }
    double value = afterPoint > 0 ? digits / POWERS_OF_TEN[afterPoint] : digits;
    return start == 1 ? -value : value;
  }

  /** While the digits so far are below this, one more keeps them below 2^53, exact as a double. */
  private static final long EXACT_DIGITS = (1L << 53) / 10;

  /** 10^0 .. 10^22, each exact as a double (5^22 < 2^53). */
  private static final double[] POWERS_OF_TEN = {
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
    1e17, 1e18, 1e19, 1e20, 1e21, 1e22
  };

  /** Whole numbers beyond this magnitude are not all exact as doubles (2^53). */
  private static final double EXACT_WHOLE = 9007199254740992.0;

  /**
   * The whole number {@code text} stands for: digits with an optional leading {@code -}, read
   * exactly over the whole range of a {@code long} (a seed needs all 64 bits); or any other number
   * of the grammar whose value is whole and at most 2^53 in magnitude ({@code 1e3}), where a
   * double holds it exactly.
   *
   * @throws InvalidNumberException when it is not a number of the grammar, not whole, or outside
   *     that range
   */
  public static long parseWhole(String text) {
    int start = text.startsWith("-") ? 1 : 0;
    if (start < text.length() && skipDigits(text, start) == text.length()) {
      try {
        return Long.parseLong(text);
      } catch (NumberFormatException tooLarge) {
        throw new InvalidNumberException(
            text, "is too large for a whole number (the largest is " + Long.MAX_VALUE + ")",
            "write a smaller number");
      }
    }
    double value = parse(text);
    if (value != Math.rint(value) || !(Math.abs(value) <= EXACT_WHOLE)) {
      throw new InvalidNumberException(
          text, "is not a whole number", "write a whole number, as in 0, 12, -3");
    }
    return (long) value;
  }

  /**
   * The end of the literal that starts at {@code from} in {@code text}: past its digits, point and
   * exponent; {@code from} itself when none starts there. A point followed by another point is not
   * part of it ({@code 1..8} is a range).
   */
  private static int literalEnd(String text, int from) {
    int at = skipDigits(text, from);
    boolean digits = at > from;
    if (charAt(text, at) == '.' && charAt(text, at + 1) != '.') {
      int afterPoint = skipDigits(text, at + 1);
      if (!digits && afterPoint == at + 1) {
        return from;
      }
      digits = true;
      at = afterPoint;
    }
    if (!digits) {
      return from;
    }
    char e = charAt(text, at);
    if (e == 'e' || e == 'E') {
      int sign = at + 1;
      if (charAt(text, sign) == '+' || charAt(text, sign) == '-') {
        sign++;
      }
      int exponentEnd = skipDigits(text, sign);
      if (exponentEnd > sign) {
        at = exponentEnd;
      }
    }
    return at;
  }

  private static int skipDigits(String text, int at) {
    while (isDigit(charAt(text, at))) {
      at++;
    }
    return at;
  }

  private static char charAt(String text, int at) {
    return at < text.length() ? text.charAt(at) : '\0';
  }

  private static boolean isDigit(char c) {
    return c >= '0' && c <= '9';
  }

  private static boolean hasNonZeroDigit(String written) {
    for (int i = 0; i < written.length(); i++) {
      char c = written.charAt(i);
      if (c == 'e' || c == 'E') {
        return false;
      }
      if (c >= '1' && c <= '9') {
        return true;
      }
    }
    return false;
  }
}

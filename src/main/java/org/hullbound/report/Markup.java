package org.hullbound.report;

/**
 * Escaping and compact number writing shared by the SVG and HTML writers.
 *
 * <p>Every user string (model names, unknown names, notes) passes through {@link #escape} so that
 * the report stays well-formed whatever the names contain; characters XML forbids are replaced.
 */
final class Markup {
  private Markup() {}

  /**
   * Escapes {@code text} for use in HTML or XML text and in double- or single-quoted attributes.
   * Control characters that XML 1.0 forbids and unpaired surrogates become U+FFFD, so an odd name
   * can never make an inline SVG unparseable.
   */
  static String escape(String text) {
    if (text == null) {
      return "";
    }
    StringBuilder out = new StringBuilder(text.length() + 16);
    for (int i = 0; i < text.length(); i++) {
      char c = text.charAt(i);
      switch (c) {
        case '&' -> out.append("&amp;");
        case '<' -> out.append("&lt;");
        case '>' -> out.append("&gt;");
        case '"' -> out.append("&quot;");
        case '\'' -> out.append("&#39;");
        default -> {
          if (Character.isHighSurrogate(c)
              && i + 1 < text.length()
              && Character.isLowSurrogate(text.charAt(i + 1))) {
            out.append(c).append(text.charAt(++i));
          } else if (isXmlChar(c)) {
            out.append(c);
          } else {
            out.append('\uFFFD');
          }
        }
      }
    }
    return out.toString();
  }

  private static boolean isXmlChar(char c) {
    // XML 1.0 section 2.2: tab, newline, carriage return, and U+0020..U+FFFD minus surrogates.
    if (c == '\t' || c == '\n' || c == '\r') {
      return true;
    }
    return c >= 0x20 && c <= 0xFFFD && !Character.isSurrogate(c) && c != 0xFFFE;
  }

  /**
   * Appends {@code v} rounded to one decimal, without a trailing ".0"; used for SVG coordinates.
   */
  static StringBuilder coordinate(StringBuilder out, double v) {
    long tenths = Math.round(v * 10.0);
    if (tenths < 0) {
      out.append('-');
      tenths = -tenths;
    }
    out.append(tenths / 10);
    long rest = tenths % 10;
    if (rest != 0) {
      out.append('.').append(rest);
    }
    return out;
  }

  /** Rewrites Java's {@code 1.50e+06} as {@code 1.50e6} and {@code 2.0e-05} as {@code 2.0e-5}. */
  static String tidyExponent(String formatted) {
    int e = formatted.indexOf('e');
    if (e < 0) {
      return formatted;
    }
    String mantissa = formatted.substring(0, e);
    String exponent = formatted.substring(e + 1);
    boolean negative = exponent.startsWith("-");
    String digits = exponent.replaceFirst("^[+-]", "").replaceFirst("^0+(?=.)", "");
    return mantissa + "e" + (negative ? "-" : "") + digits;
  }
}

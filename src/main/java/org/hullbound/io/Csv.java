package org.hullbound.io;

/** Small CSV helpers shared by the writers (RFC 4180 quoting, round-trip numbers). */
final class Csv {
  private Csv() {}

  /** The field as written: quoted when it holds a comma, quote or line break (RFC 4180). */
  static String quote(String field) {
    boolean plain = true;
    for (int i = 0; i < field.length() && plain; i++) {
      char c = field.charAt(i);
      plain = c != ',' && c != '"' && c != '\n' && c != '\r';
    }
    return plain ? field : '"' + field.replace("\"", "\"\"") + '"';
  }

  /**
   * Appends {@code value} so that parsing it back gives the same double; non-finite values as
   * {@code NaN}, {@code inf}, {@code -inf}.
   */
  static void appendNumber(StringBuilder out, double value) {
    if (Double.isNaN(value)) {
      out.append("NaN");
    } else if (Double.isInfinite(value)) {
      out.append(value > 0 ? "inf" : "-inf");
    } else if (value == Math.rint(value) && Math.abs(value) < 1e15) {
      out.append((long) value);
    } else {
      out.append(value);
    }
  }
}

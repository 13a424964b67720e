package org.hullbound.sampling;

import java.util.function.DoubleUnaryOperator;

/** NaN-safe argument checks shared by the samplers' factories; each names the argument. */
final class Arguments {
  private Arguments() {}

  static double positive(String name, double value) {
    if (!(value > 0) || value == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException(name + " must be finite and > 0, got " + value);
    }
    return value;
  }

  static double finite(String name, double value) {
    if (!Double.isFinite(value)) {
      throw new IllegalArgumentException(name + " must be finite, got " + value);
    }
    return value;
  }

  static int atLeast(String name, int value, int minimum) {
    if (value < minimum) {
      throw new IllegalArgumentException(name + " must be >= " + minimum + ", got " + value);
    }
    return value;
  }

  static <T> T notNull(String name, T value) {
    // The message is made only on failure: an exact draw of each allocation of a mixture checks
    // its arguments, and a string made per draw showed in its profile.
    if (value == null) {
      throw new NullPointerException(name + " must not be null");
    }
    return value;
  }

  /** Checks a support interval {@code (lower, upper)}; infinite ends are allowed. */
  static void support(double lower, double upper) {
    if (Double.isNaN(lower) || lower == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException("lower must be a number below +Infinity, got " + lower);
    }
    if (Double.isNaN(upper) || upper == Double.NEGATIVE_INFINITY) {
      throw new IllegalArgumentException("upper must be a number above -Infinity, got " + upper);
    }
    if (!(lower < upper)) {
      throw new IllegalArgumentException(
          "lower must be < upper, got lower = " + lower + ", upper = " + upper);
    }
  }

  /**
   * Checks that {@code point} lies inside the open support {@code (lower, upper)}: a density may
   * be infinite at a finite end (a beta with {@code a < 1}), so the ends are never evaluated.
   */
  static double inSupport(String name, double point, double lower, double upper) {
    if (!(point > lower && point < upper)) {
      throw new IllegalArgumentException(
          name + " must lie inside (" + lower + ", " + upper + "), got " + point);
    }
    return point;
  }

  /** Evaluates a log-density, rejecting NaN and +Infinity with a typed exception. */
  static double evaluate(DoubleUnaryOperator logDensity, double x) {
    double value = logDensity.applyAsDouble(x);
    if (Double.isNaN(value) || value == Double.POSITIVE_INFINITY) {
      throw new DensityEvaluationException("log-density", x, value);
    }
    return value;
  }
}

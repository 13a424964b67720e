package org.hullbound.model.family;

/**
 * The values one distribution argument may take; it phrases the argument check and sizes the step
 * of numerical derivatives.
 */
enum ArgumentDomain {
  REAL("must be a finite number"),
  POSITIVE("must be > 0"),
  PROBABILITY("must be between 0 and 1"),
  WHOLE("must be a whole number >= 0"),
  /** A weight: {@code >= 0} and finite (an entry of a categorical's vector). */
  NON_NEGATIVE("must be >= 0 and finite"),
  /** A whole number of either sign (the bounds of a whole-number uniform). */
  INTEGER("must be a whole number");

  /** Relative step of the Richardson-extrapolated central difference. */
  static final double RELATIVE_STEP = 1e-3;

  private final String requirement;

  ArgumentDomain(String requirement) {
    this.requirement = requirement;
  }

  String requirement() {
    return requirement;
  }

  boolean accepts(double value) {
    return switch (this) {
      case REAL -> Double.isFinite(value);
      case POSITIVE -> value > 0 && value < Double.POSITIVE_INFINITY;
      case PROBABILITY -> value >= 0 && value <= 1;
      case WHOLE -> value >= 0 && value < 0x1p53 && value == Math.rint(value);
      case NON_NEGATIVE -> value >= 0 && value < Double.POSITIVE_INFINITY;
      case INTEGER -> Math.abs(value) < 0x1p53 && value == Math.rint(value);
    };
  }

  /** A step that keeps {@code value +- step} inside the domain and is scaled to the value. */
  double step(double value) {
    return switch (this) {
      case REAL -> RELATIVE_STEP * Math.max(1.0, Math.abs(value));
      case POSITIVE, NON_NEGATIVE -> RELATIVE_STEP * value;
      case PROBABILITY -> RELATIVE_STEP * Math.min(value, 1.0 - value);
      case WHOLE, INTEGER -> 0.0;
    };
  }
}

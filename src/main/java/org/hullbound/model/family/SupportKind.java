package org.hullbound.model.family;

/**
 * Where a family puts its mass: the set of values with a finite log-density.
 *
 * <p>The compiler uses it to pick the scale of an unknown and to reject impossible data.
 */
public enum SupportKind {
  /** Every finite real number. */
  REAL,
  /** {@code (0, inf)}. */
  POSITIVE,
  /** {@code (0, 1)}. */
  UNIT_INTERVAL,
  /** {@code [lower, upper]}, the first two arguments (uniform). */
  BETWEEN_FIRST_TWO_ARGUMENTS,
  /** {@code 0, 1, 2, ...}. */
  COUNT,
  /** {@code 0, 1, ..., trials}, trials being the first argument (binomial). */
  COUNT_UP_TO_FIRST_ARGUMENT,
  /** {@code 0} or {@code 1}. */
  BINARY,
  /** {@code lower, lower + 1, ..., upper}, the first two arguments (whole-number uniform). */
  WHOLE_BETWEEN_FIRST_TWO_ARGUMENTS,
  /** {@code 1, 2, ..., K}, K being the number of arguments (categorical over a vector). */
  CATEGORY;

  /** Whether the support is a set of whole numbers. */
  public boolean discrete() {
    return this == COUNT || this == COUNT_UP_TO_FIRST_ARGUMENT || this == BINARY
        || this == WHOLE_BETWEEN_FIRST_TWO_ARGUMENTS || this == CATEGORY;
  }

  /**
   * Whether every value lies in a finite set fixed by the arguments (so that a conditional over it
   * can be drawn by enumeration): all discrete supports but the unbounded counts.
   */
  public boolean finite() {
    return discrete() && this != COUNT;
  }
}

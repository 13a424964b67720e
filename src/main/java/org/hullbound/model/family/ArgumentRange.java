package org.hullbound.model.family;

/**
 * The values one distribution argument may take, as an interval: what a caller needs to cut an
 * unknown's support to where an argument that moves with it stays valid (a binomial {@code p =
 * alpha + beta * dose} must stay in [0, 1], a Poisson {@code rate = a + b * x} above 0).
 *
 * <p>A whole-number argument (binomial {@code trials}) is given as [0, 2^53 - 1]; its wholeness is not
 * an interval and is not part of this.
 *
 * @param lower the lowest value, {@code -inf} when unbounded below
 * @param upper the highest value, {@code inf} when unbounded above
 * @param closed whether the ends themselves are valid ([0, 1] for a probability, (0, inf) for a
 *     positive argument)
 */
public record ArgumentRange(double lower, double upper, boolean closed) {

  /** True when one end at least is finite, so that the range can cut a support. */
  public boolean bounded() {
    return lower > Double.NEGATIVE_INFINITY || upper < Double.POSITIVE_INFINITY;
  }

  /** True when {@code value} lies in the range; false for NaN. */
  public boolean contains(double value) {
    return closed ? value >= lower && value <= upper : value > lower && value < upper;
  }

  /** {@code [0, 1]} or {@code (0, inf)}, as in messages. */
  @Override
  public String toString() {
    return (closed ? "[" : "(") + end(lower) + ", " + end(upper) + (closed ? "]" : ")");
  }

  private static String end(double v) {
    if (Double.isInfinite(v)) {
      return v > 0 ? "inf" : "-inf";
    }
    return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
  }
}

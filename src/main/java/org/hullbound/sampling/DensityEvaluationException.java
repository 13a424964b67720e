package org.hullbound.sampling;

/**
 * Thrown when a log-density handed to a sampler returns NaN or +Infinity at a point of its support.
 *
 * <p>A sampler must never turn such a value into a draw: NaN compares false with everything and
 * +Infinity would accept any proposal, so either silently biases the chain. Minus infinity is not
 * an error: it means density zero there.
 */
public final class DensityEvaluationException extends RuntimeException {
  private final double point;
  private final double value;

  DensityEvaluationException(String what, double point, double value) {
    super(what + " returned " + value + " at x = " + point
        + "; expected a finite value, or -Infinity where the density is zero");
    this.point = point;
    this.value = value;
  }

  /** The point at which the bad value was returned. */
  public double point() {
    return point;
  }

  /** The bad value itself (NaN or +Infinity). */
  public double value() {
    return value;
  }
}

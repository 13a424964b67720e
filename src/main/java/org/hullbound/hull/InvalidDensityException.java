package org.hullbound.hull;

/**
 * The log density returned NaN or +inf (or a non-finite slope where the value is finite).
 *
 * <p>Such values cannot bound or be bounded by a hull, so the sampler names the point and stops
 * instead of drawing from a broken envelope.
 */
public final class InvalidDensityException extends HullException {

  private final double value;

  InvalidDensityException(String message, double x, double value) {
    super(message, x);
    this.value = value;
  }

  /** The offending value of h (or of h' when the slope was at fault). */
  public double value() {
    return value;
  }
}

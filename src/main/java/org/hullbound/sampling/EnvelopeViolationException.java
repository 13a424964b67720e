package org.hullbound.sampling;

/**
 * Thrown by {@link FixedEnvelopeRejection} when the target exceeds its envelope {@code M g} at a
 * proposed point, so the bound {@code M} was wrong.
 *
 * <p>Draws made with a bound that is too small come from the wrong distribution; failing loudly is
 * the only honest answer.
 */
public final class EnvelopeViolationException extends RuntimeException {
  private final double point;
  private final double logRatio;
  private final double logBound;

  EnvelopeViolationException(double point, double logRatio, double logBound) {
    super("log f - log g = " + logRatio + " at x = " + point + " exceeds log M = " + logBound
        + "; the envelope bound is too small");
    this.point = point;
    this.logRatio = logRatio;
    this.logBound = logBound;
  }

  /** The proposed point at which the envelope was exceeded. */
  public double point() {
    return point;
  }

  /** {@code log f(x) - log g(x)} at that point. */
  public double logRatio() {
    return logRatio;
  }

  /** The bound {@code log M} that was exceeded. */
  public double logBound() {
    return logBound;
  }
}

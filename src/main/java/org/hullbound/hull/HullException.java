package org.hullbound.hull;

/**
 * A density that adaptive rejection sampling cannot sample exactly: not log-concave, invalid
 * values, values rounded more coarsely than the log-concavity tolerance, or a hull that cannot be
 * normalised.
 *
 * <p>The sampler refuses such input with one of these typed, unchecked exceptions rather than
 * returning draws of an unknown distribution; callers such as a Gibbs driver may catch the parent
 * type to fall back to another updater.
 */
public abstract sealed class HullException extends RuntimeException
    permits NotLogConcaveException,
        InvalidDensityException,
        NonIntegrableHullException,
        ProposalLimitException,
        ImpreciseDensityException {

  private final double x;

  HullException(String message, double x) {
    super(message);
    this.x = x;
  }

  /** The point at which the problem was found. */
  public double x() {
    return x;
  }
}

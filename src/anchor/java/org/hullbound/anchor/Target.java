package org.hullbound.anchor;

/**
 * A log-density on all of R^d with its gradient, up to an additive constant: what the No-U-Turn
 * sampler moves on ({@link NoUTurnSampler}).
 *
 * <p>An implementation may keep scratch space, so each chain has its own instance.
 */
public interface Target {

  /** The number of coordinates d. */
  int dimension();

  /**
   * The log-density at {@code position}, {@code -inf} where the density is zero or cannot be
   * evaluated; when finite, {@code gradient} receives its gradient (left unspecified otherwise).
   */
  double logDensity(double[] position, double[] gradient);
}

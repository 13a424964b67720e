package org.hullbound.hull;

/**
 * A log mass h(k) = log p(k) + const of a distribution on whole numbers, such as a latent count's
 * full conditional.
 *
 * <p>Used by {@link DiscreteAdaptiveRejection}, the discrete analogue of the tangent hull: the
 * sampler only ever asks for whole {@code k} inside the range it was given.
 */
@FunctionalInterface
public interface LogMass {

  /** Returns h(k); {@code -inf} where p(k) = 0. */
  double value(long k);
}

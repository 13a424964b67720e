package org.hullbound.sampling;

import java.util.random.RandomGenerator;

/**
 * One transition of a Markov chain on the real line that leaves a target distribution invariant.
 *
 * <p>The Gibbs driver holds one per unknown whose full conditional has no exact sampler (slice,
 * random-walk Metropolis, adaptive rejection Metropolis) and calls {@link #next} once per sweep.
 */
public interface MarkovTransition {
  /**
   * The chain's next state given the current one.
   *
   * @param current the current state: inside the support, with a finite log-density
   * @param rng the source of randomness; the same seed gives the same sequence
   * @throws IllegalArgumentException when {@code current} is outside the support or has density 0
   * @throws DensityEvaluationException when the log-density returns NaN or +Infinity
   */
  double next(double current, RandomGenerator rng);
}

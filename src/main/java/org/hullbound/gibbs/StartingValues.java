package org.hullbound.gibbs;

import java.util.random.RandomGenerator;

/**
 * Fills a chain's state with its starting values, drawing from the chain's own generator.
 *
 * <p>Dispersed starts (a prior draw where the prior is proper, else uniform(-2, 2) on the
 * unconstrained scale, common practice) let split R-hat see chains that have not forgotten where
 * they began.
 */
@FunctionalInterface
public interface StartingValues {

  /** Writes natural-scale starting values into {@code state}. */
  void fill(double[] state, RandomGenerator rng);
}

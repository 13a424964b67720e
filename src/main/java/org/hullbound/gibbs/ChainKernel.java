package org.hullbound.gibbs;

import java.util.function.BooleanSupplier;
import java.util.random.RandomGenerator;

/**
 * One chain's Markov transition and the values it reports; each chain has its own kernel.
 *
 * <p>The runner only sweeps and records, so that the same driver (seeding, threads, stop, progress)
 * serves the model's Gibbs sampler, the baselines of the benchmark and the tests. A kernel is used
 * by one thread at a time and may keep mutable per-chain state (warm starts, counters).
 */
public interface ChainKernel {

  /** Number of values {@link #record} writes: the columns of a draw. */
  int width();

  /** Advances the chain by one full sweep, taking every random number from {@code rng}. */
  void sweep(RandomGenerator rng);

  /**
   * Like {@link #sweep(RandomGenerator)}, but asks {@code giveUp} between two updates and gives
   * the sweep up when it says so: returns false then, with the state partly updated (the caller
   * goes back to a state it saved). A kernel of one indivisible step never gives up.
   */
  default boolean sweep(RandomGenerator rng, BooleanSupplier giveUp) {
    sweep(rng);
    return true;
  }

  /** Writes the current values of the reported quantities (natural scale) into {@code out}. */
  void record(double[] out);
}

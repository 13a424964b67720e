package org.hullbound.gibbs;

import java.util.random.RandomGenerator;

/**
 * Makes the kernel of one chain, drawing its starting values from that chain's generator.
 *
 * <p>Called once per chain, in chain order, before any thread starts, so that starting values too
 * depend only on the seed.
 */
@FunctionalInterface
public interface KernelFactory {

  /**
   * @param chain the chain's index, from 0
   * @param rng the chain's own generator, which the runner then passes to every sweep
   */
  ChainKernel newChain(int chain, RandomGenerator rng);
}

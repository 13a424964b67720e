package org.hullbound.gibbs;

/**
 * A chain kernel whose state can be saved between sweeps and restored, so that an interrupted run
 * can be continued with exactly the draws it would have made.
 *
 * <p>Separate from {@link ChainKernel} so that kernels that need no checkpoint (the benchmark's
 * baselines) stay as they are; the runner saves only kernels of this kind.
 */
public interface ResumableKernel extends ChainKernel {

  /** The state after the last whole sweep. */
  KernelState save();

  /**
   * Replaces this kernel's state by {@code saved} (from a kernel of the same sampler).
   *
   * @throws IllegalArgumentException when {@code saved} does not fit this kernel's updaters
   */
  void restore(KernelState saved);
}

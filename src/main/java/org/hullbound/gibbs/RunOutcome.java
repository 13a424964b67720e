package org.hullbound.gibbs;

import java.util.List;

/**
 * What a run left: each chain's kernel (for its counters) and kept draws, and whether it was
 * stopped before the end.
 *
 * @param kernels the kernels of chains 0, 1, ..., in chain order
 * @param drawsKept kept draws per chain
 * @param stoppedEarly whether a stop request ended the run before every draw was made
 * @param chainStates where each chain stood at the end, in chain order, for a checkpoint; empty
 *     when the kernels are not {@link ResumableKernel}s
 */
public record RunOutcome(
    List<ChainKernel> kernels, int[] drawsKept, boolean stoppedEarly, List<ChainState> chainStates) {

  public RunOutcome {
    kernels = List.copyOf(kernels);
    drawsKept = drawsKept.clone();
    chainStates = List.copyOf(chainStates);
  }

  @Override
  public int[] drawsKept() {
    return drawsKept.clone();
  }

  /** The fewest kept draws of any chain: the length every chain has in common. */
  public int commonDraws() {
    int fewest = Integer.MAX_VALUE;
    for (int kept : drawsKept) {
      fewest = Math.min(fewest, kept);
    }
    return fewest;
  }
}

package org.hullbound.gibbs;

import java.time.Duration;

/**
 * Where one chain stands: sweeps done out of all it will make, its speed and the time it still
 * needs at that speed.
 *
 * @param chain the chain's index, from 0
 * @param sweepsDone sweeps made so far, burn-in included
 * @param sweepsTotal sweeps the chain makes in all
 * @param drawsDone kept draws so far
 * @param drawsTotal kept draws the chain makes in all
 * @param sweepsPerSecond speed since the chain started
 * @param timeLeft the time the remaining sweeps take at that speed
 * @param finished whether the chain has stopped (done, interrupted or failed)
 */
public record ChainProgress(
    int chain,
    long sweepsDone,
    long sweepsTotal,
    long drawsDone,
    long drawsTotal,
    double sweepsPerSecond,
    Duration timeLeft,
    boolean finished) {

  /** Whether the chain is still in burn-in. */
  public boolean inBurnIn() {
    return drawsDone == 0 && !finished;
  }

  /** The fraction of sweeps done, in [0, 1]. */
  public double fractionDone() {
    return sweepsTotal == 0 ? 1.0 : (double) sweepsDone / sweepsTotal;
  }
}

package org.hullbound.gibbs;

import java.time.Duration;

/**
 * Where one chain stands: sweeps and kept draws done, its speed and the time it still needs at that
 * speed.
 *
 * @param chain the chain's index, from 0
 * @param sweepsDone sweeps made so far, burn-in included
 * @param burnIn burn-in sweeps of the run
 * @param sweepsTotal sweeps the chain makes in all
 * @param drawsDone kept draws so far
 * @param drawsTotal kept draws the chain makes in all
 * @param drawsPerSecond kept draws per second at the speed since the chain started (sweeps per
 *     second over the thinning)
 * @param timeLeft the time the remaining sweeps take at that speed
 * @param finished whether the chain has stopped (done, interrupted or failed)
 */
public record ChainProgress(
    int chain,
    long sweepsDone,
    long burnIn,
    long sweepsTotal,
    long drawsDone,
    long drawsTotal,
    double drawsPerSecond,
    Duration timeLeft,
    boolean finished) {

  /** Whether the chain is still in burn-in. */
  public boolean inBurnIn() {
    return sweepsDone < burnIn && !finished;
  }

  /** The fraction of sweeps done, in [0, 1]. */
  public double fractionDone() {
    return sweepsTotal == 0 ? 1.0 : (double) sweepsDone / sweepsTotal;
  }
}

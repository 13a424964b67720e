package org.hullbound.anchor;

/**
 * What the No-U-Turn sampler did after its warm-up: iterations, gradient evaluations (one per
 * leapfrog step), iterations with a divergent step (energy error above 1000) and the sum of the
 * trajectories' depths (doublings), with the step size in use.
 */
public record NoUTurnStatistics(
    long iterations, long gradients, long divergences, long depths, double stepSize) {

  /** Gradient evaluations per iteration (NaN before the first). */
  public double gradientsPerIteration() {
    return iterations == 0 ? Double.NaN : (double) gradients / iterations;
  }

  /** The mean number of doublings per iteration (NaN before the first). */
  public double meanDepth() {
    return iterations == 0 ? Double.NaN : (double) depths / iterations;
  }
}

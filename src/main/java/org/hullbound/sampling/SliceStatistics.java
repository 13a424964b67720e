package org.hullbound.sampling;

/**
 * Counts kept by {@link SliceSampler}.
 *
 * @param transitions calls of {@code next}
 * @param evaluations calls of the log-density
 * @param stepsOut widenings of the interval by {@code w} while stepping out
 * @param shrinks points rejected during shrinkage (each shrinks the interval)
 */
public record SliceStatistics(long transitions, long evaluations, long stepsOut, long shrinks) {
  /** Mean log-density evaluations per transition, NaN before the first. */
  public double evaluationsPerTransition() {
    return transitions == 0 ? Double.NaN : (double) evaluations / transitions;
  }
}

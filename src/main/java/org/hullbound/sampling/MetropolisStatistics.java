package org.hullbound.sampling;

/**
 * Counts kept by {@link RandomWalkMetropolis}.
 *
 * @param transitions calls of {@code next}
 * @param accepted proposals accepted
 * @param evaluations calls of the log-density
 * @param stepSize the proposal standard deviation now in use
 * @param adapting whether the step size is still being tuned
 */
public record MetropolisStatistics(
    long transitions, long accepted, long evaluations, double stepSize, boolean adapting) {
  /** Observed acceptance rate, NaN before the first transition. */
  public double acceptanceRate() {
    return transitions == 0 ? Double.NaN : (double) accepted / transitions;
  }
}

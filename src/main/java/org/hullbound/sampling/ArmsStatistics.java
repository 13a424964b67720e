package org.hullbound.sampling;

/**
 * Counts kept by {@link AdaptiveRejectionMetropolis}.
 *
 * @param transitions calls of {@code next}
 * @param evaluations calls of the log-density
 * @param adaptiveRejections candidates rejected in the rejection step (each may add a point)
 * @param metropolisRejections Metropolis-Hastings steps that kept the current state
 * @param largestEnvelope the most abscissae any one call's envelope reached
 */
public record ArmsStatistics(long transitions, long evaluations, long adaptiveRejections,
    long metropolisRejections, int largestEnvelope) {
  /** Mean log-density evaluations per transition, NaN before the first. */
  public double evaluationsPerTransition() {
    return transitions == 0 ? Double.NaN : (double) evaluations / transitions;
  }
}

package org.hullbound.sampling;

/**
 * Counts kept by {@link FixedEnvelopeRejection}: draws returned, proposals made, log-density
 * evaluations.
 *
 * @param draws accepted draws returned so far
 * @param proposals proposals made so far (accepted or not)
 * @param evaluations calls of the target log-density
 */
public record RejectionStatistics(long draws, long proposals, long evaluations) {
  /** Observed acceptance rate {@code draws / proposals}, NaN before the first proposal. */
  public double acceptanceRate() {
    return proposals == 0 ? Double.NaN : (double) draws / proposals;
  }
}

package org.hullbound.app;

/**
 * Whether a fit runs posterior predictive checks, and whether it also writes every replicated data
 * set to a file of its own ({@link FitRun#REPLICATES_FILE}); the replicates can be far larger than
 * the draws, so they are written only when asked.
 *
 * @param checks replicate the modelled data each kept sweep and report p-values
 * @param writeReplicates also write the replicated data; implies {@code checks}
 */
public record PredictiveOptions(boolean checks, boolean writeReplicates) {

  /** No checks. */
  public static PredictiveOptions none() {
    return new PredictiveOptions(false, false);
  }

  /** Checks, with the replicated data written when {@code writeReplicates}. */
  public static PredictiveOptions of(boolean checks, boolean writeReplicates) {
    return new PredictiveOptions(checks || writeReplicates, writeReplicates);
  }
}

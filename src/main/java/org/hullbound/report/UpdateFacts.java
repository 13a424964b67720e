package org.hullbound.report;

/**
 * What the sampler did for one unknown: which update drew it, how many density evaluations a
 * draw cost on average, and whether a fallback was used.
 *
 * <p>The diagnostics package cannot know these facts, so the caller (the Gibbs driver, via the
 * CLI) supplies them for the summary table's {@code update} and {@code evals per draw} columns and
 * for the fallback verdicts.
 *
 * @param update the update's name as a user reads it, e.g. {@code conjugate}, {@code adaptive
 *     rejection}, {@code ARMS fallback}
 * @param evaluationsPerDraw mean log-density evaluations per draw, at least 0 (0 for a conjugate
 *     draw); NaN when not known
 * @param fallback whether the update is a fallback, and since when
 * @param switchSweep for {@link Fallback#SWITCHED_DURING_RUN}, the 1-based sweep at which the
 *     switch happened, or 0 when not known; 0 otherwise
 */
public record UpdateFacts(
    String update, double evaluationsPerDraw, Fallback fallback, long switchSweep) {

  /** How a fallback update (one that is not exact adaptive rejection or a direct draw) came in. */
  public enum Fallback {
    /** No fallback: a direct (conjugate) draw or adaptive rejection throughout. */
    NONE,
    /** The fallback was chosen before the run, the conditional not being known log-concave. */
    CHOSEN,
    /** The run began with adaptive rejection and switched to the fallback part way. */
    SWITCHED_DURING_RUN
  }

  /** Validates the fields. */
  public UpdateFacts {
    if (update == null || update.isBlank()) {
      throw new IllegalArgumentException("update must be a non-blank name, got '" + update + "'");
    }
    if (!Double.isNaN(evaluationsPerDraw)
        && !(evaluationsPerDraw >= 0 && evaluationsPerDraw < Double.POSITIVE_INFINITY)) {
      throw new IllegalArgumentException(
          "evaluationsPerDraw must be finite and >= 0, or NaN (unknown), got "
              + evaluationsPerDraw);
    }
    if (fallback == null) {
      throw new IllegalArgumentException("fallback must not be null");
    }
    if (switchSweep < 0 || (fallback != Fallback.SWITCHED_DURING_RUN && switchSweep != 0)) {
      throw new IllegalArgumentException(
          "switchSweep must be >= 0, and 0 unless the fallback was switched to during the run, got "
              + switchSweep
              + " with fallback "
              + fallback);
    }
  }

  /** The update name of a {@code let} quantity kept with the draws: computed, not drawn. */
  public static final String DERIVED = "derived";

  /** A {@code let} quantity computed from each kept draw of the unknowns. */
  public static UpdateFacts derived() {
    return new UpdateFacts(DERIVED, Double.NaN, Fallback.NONE, 0);
  }

  /** Whether these are the facts of a derived quantity rather than of an unknown. */
  public boolean isDerived() {
    return DERIVED.equals(update);
  }

  /** An exact update (direct draw or adaptive rejection) used throughout. */
  public static UpdateFacts exact(String update, double evaluationsPerDraw) {
    return new UpdateFacts(update, evaluationsPerDraw, Fallback.NONE, 0);
  }

  /** A fallback update chosen before the run. */
  public static UpdateFacts fallback(String update, double evaluationsPerDraw) {
    return new UpdateFacts(update, evaluationsPerDraw, Fallback.CHOSEN, 0);
  }

  /** A switch to the fallback {@code update} at 1-based sweep {@code sweep} (0 if unknown). */
  public static UpdateFacts switchedToFallback(String update, double evaluationsPerDraw, long sweep) {
    return new UpdateFacts(update, evaluationsPerDraw, Fallback.SWITCHED_DURING_RUN, sweep);
  }
}

package org.hullbound.report;

/**
 * One plain-language finding about one unknown: what is off, what it means and what to do.
 *
 * @param unknown the unknown's name
 * @param kind which rule fired
 * @param text the sentence shown to the user, starting with the unknown's name
 */
public record Verdict(String unknown, Kind kind, String text) {

  /** The rules of {@link Verdicts}, one per kind of finding. */
  public enum Kind {
    /** Some draws are NaN or infinite. */
    NON_FINITE,
    /** Every draw is equal. */
    CONSTANT,
    /** Too few draws per chain to judge. */
    TOO_SHORT,
    /** R-hat above the threshold: chains disagree. */
    CHAINS_DISAGREE,
    /** R-hat undefined although the draws vary. */
    RHAT_UNDEFINED,
    /** Bulk effective sample size below the threshold. */
    FEW_BULK_DRAWS,
    /** Tail effective sample size below the threshold, or undefined. */
    FEW_TAIL_DRAWS,
    /** A fallback update was chosen before the run. */
    FALLBACK_USED,
    /** The run switched to a fallback part way. */
    SWITCHED_TO_FALLBACK,
    /**
     * Chains order a mixture's components differently: R-hat's disagreement comes from the
     * labels ({@link LabelSwitching}).
     */
    LABEL_SWITCHING
  }
}

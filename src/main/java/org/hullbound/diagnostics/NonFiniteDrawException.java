package org.hullbound.diagnostics;

/**
 * Thrown when a diagnostic is asked of draws that contain NaN or an infinity.
 *
 * <p>No R-hat, effective sample size or autocorrelation has a meaning for such draws, so the
 * low-level functions refuse them with the place of the first offender; {@link PosteriorSummary}
 * checks first and returns a summary marked {@link VariableSummary.State#NON_FINITE} instead.
 */
public final class NonFiniteDrawException extends IllegalArgumentException {
  private final int chain;
  private final int iteration;
  private final double value;

  NonFiniteDrawException(int chain, int iteration, double value, long count) {
    super(
        "draws must be finite, got "
            + value
            + " at chain "
            + chain
            + ", iteration "
            + iteration
            + " (0-based; "
            + count
            + " non-finite draw"
            + (count == 1 ? "" : "s")
            + " in all)");
    this.chain = chain;
    this.iteration = iteration;
    this.value = value;
  }

  /** The 0-based chain of the first non-finite draw. */
  public int chain() {
    return chain;
  }

  /** The 0-based iteration of the first non-finite draw within its chain. */
  public int iteration() {
    return iteration;
  }

  /** The offending value: NaN, +Infinity or -Infinity. */
  public double value() {
    return value;
  }
}

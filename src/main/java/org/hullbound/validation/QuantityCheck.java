package org.hullbound.validation;

/**
 * The verdict on one quantity of one case.
 *
 * @param quantity as written in the case, e.g. {@code sd(tau)}
 * @param reference the reference value
 * @param estimate the estimate from the draws
 * @param mcse its Monte Carlo standard error (NaN when undefined: then the check fails)
 * @param tolerance {@code k * mcse + floor}
 * @param update how the unknown was updated (for example "adaptive rejection")
 * @param pass whether {@code |estimate - reference| <= tolerance}
 */
public record QuantityCheck(
    String quantity, double reference, double estimate, double mcse, double tolerance,
    String update, boolean pass) {

  /** {@code (estimate - reference) / mcse}: how many MCSEs off the estimate is. */
  public double standardisedError() {
    return (estimate - reference) / mcse;
  }
}

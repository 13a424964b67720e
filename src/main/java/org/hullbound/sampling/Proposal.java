package org.hullbound.sampling;

import java.util.random.RandomGenerator;

/**
 * A proposal distribution for {@link FixedEnvelopeRejection}: independent draws and the normalised
 * log-density of those draws.
 *
 * <p>Rejection sampling needs only these two things of a proposal (von Neumann 1951); the support
 * lets the envelope search avoid points the proposal can never produce.
 *
 * <table>
 *   <caption>Factories</caption>
 *   <tr><td>{@link #exponentialTail(double, double)}</td><td>{@code shift + Exp(rate)}, support
 *   {@code [shift, inf)}: the classic proposal for a normal tail beyond {@code shift}</td></tr>
 * </table>
 */
public interface Proposal {
  /** One independent draw from the proposal. */
  double draw(RandomGenerator rng);

  /**
   * The proposal's normalised log-density at {@code x}; {@code -Infinity} outside its support.
   * Normalised, so that {@code 1 / M} is the acceptance rate for a normalised target.
   */
  double logDensity(double x);

  /** Lower end of the support; defaults to {@code -Infinity}. */
  default double lower() {
    return Double.NEGATIVE_INFINITY;
  }

  /** Upper end of the support; defaults to {@code +Infinity}. */
  default double upper() {
    return Double.POSITIVE_INFINITY;
  }

  /**
   * The shifted exponential {@code shift + Exp(rate)}, density {@code rate exp(-rate (x - shift))}
   * on {@code [shift, inf)}: the proposal Robert (1995, "Simulation of truncated normal
   * variables", Statistics and Computing 5) uses for a normal tail beyond {@code shift}, there
   * with rate {@code (shift + sqrt(shift^2 + 4)) / 2} (recalled from memory); rate 1 is the
   * simplest choice.
   *
   * @param shift the left end of the support, finite
   * @param rate the exponential rate, finite and {@code > 0}
   */
  static Proposal exponentialTail(double shift, double rate) {
    return new ExponentialTailProposal(
        Arguments.finite("shift", shift), Arguments.positive("rate", rate));
  }
}

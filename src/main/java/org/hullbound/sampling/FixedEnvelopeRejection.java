package org.hullbound.sampling;

import java.util.function.DoubleUnaryOperator;
import java.util.random.RandomGenerator;

/**
 * Rejection sampling from a target log-density {@code log f} under one fixed envelope {@code M g}
 * (von Neumann 1951): propose {@code x ~ g}, accept with probability {@code f(x) / (M g(x))}.
 *
 * <p>It is the baseline that adaptive rejection improves on, and the exact sampler of choice when
 * a good proposal and its bound are known in closed form (a normal tail beyond 5 under a shifted
 * exponential). Each proposal costs one proposal draw, one uniform and one target evaluation.
 *
 * <table>
 *   <caption>Factories</caption>
 *   <tr><td>{@link #of(DoubleUnaryOperator, double, double, Proposal, double)}</td>
 *   <td>{@code log M} given</td></tr>
 *   <tr><td>{@link #withComputedBound(DoubleUnaryOperator, double, double, Proposal)}</td>
 *   <td>{@code log M} found as {@code sup (log f - log g)} by a grid scan and Brent's method</td>
 *   </tr>
 * </table>
 *
 * <p>Every proposal is checked against the bound: if {@code log f - log g} exceeds {@code log M}
 * by more than 1e-9 plus two ulps of the values compared (their rounding, whatever constant
 * {@code log f} carries), {@link EnvelopeViolationException} is thrown rather than a wrong draw
 * returned. The support is the open interval {@code (lower, upper)}: draws never land on a finite
 * end (where a density may be infinite); the bound search does look at the ends, as limits. The
 * configuration is immutable; the counters behind {@link #statistics()} are not
 * synchronised, so use one instance per thread.
 */
public final class FixedEnvelopeRejection {
  /**
   * Excess of the log ratio over log M that is put down to rounding: this much in log units, plus
   * {@value #ROUNDING_ULPS} ulps of the largest of log f, log g and log M, the rounding of the
   * values compared. Neither grows with a constant added to log f beyond the rounding that
   * constant causes (a tolerance relative to |log M| did: 1e-9 of a constant of 1e12 let the
   * ratio pass the bound by 1000).
   */
  private static final double ROUNDING = 1e-9;
  private static final int ROUNDING_ULPS = 2;

  private final DoubleUnaryOperator logDensity;
  private final double lower;
  private final double upper;
  private final Proposal proposal;
  private final double logBound;
  /**
   * Proposals one draw may make: 100 times the expected M of a normalised target, at least
   * 100000, so that a correct envelope needs more with probability (1 - 1/M)^(100 M) &lt; e^-100.
   */
  private final long proposalCap;

  private long draws;
  private long proposals;
  private long evaluations;

  private FixedEnvelopeRejection(
      DoubleUnaryOperator logDensity, double lower, double upper, Proposal proposal,
      double logBound) {
    this.logDensity = logDensity;
    this.lower = lower;
    this.upper = upper;
    this.proposal = proposal;
    this.logBound = logBound;
    // a cast saturates at Long.MAX_VALUE for a huge M: such an envelope is useless, never capped
    this.proposalCap = (long) Math.max(100_000.0, 100.0 * Math.exp(logBound));
  }

  /**
   * Rejection with a known bound: {@code f(x) <= M g(x)} for all {@code x} in the support.
   *
   * @param logDensity {@code log f} up to a constant; {@code -Infinity} where {@code f = 0}
   * @param lower lower end of the support, may be {@code -Infinity}
   * @param upper upper end of the support, may be {@code +Infinity}
   * @param proposal the proposal {@code g}, normalised
   * @param logBound {@code log M}, finite
   */
  public static FixedEnvelopeRejection of(
      DoubleUnaryOperator logDensity, double lower, double upper, Proposal proposal,
      double logBound) {
    Arguments.notNull("logDensity", logDensity);
    Arguments.notNull("proposal", proposal);
    Arguments.support(lower, upper);
    Arguments.finite("logBound", logBound);
    return new FixedEnvelopeRejection(logDensity, lower, upper, proposal, logBound);
  }

  /**
   * Rejection with {@code log M = sup (log f - log g)} over the support, found by a grid scan of a
   * bounded transform of the support polished with Brent's method.
   *
   * @throws IllegalArgumentException when the ratio {@code f / g} is unbounded (it grows toward an
   *     end of the support, or {@code g = 0} where {@code f > 0}), or {@code f} has no mass
   * @throws DensityEvaluationException when {@code log f} or {@code log g} returns NaN or
   *     {@code +Infinity}
   */
  public static FixedEnvelopeRejection withComputedBound(
      DoubleUnaryOperator logDensity, double lower, double upper, Proposal proposal) {
    Arguments.notNull("logDensity", logDensity);
    Arguments.notNull("proposal", proposal);
    Arguments.support(lower, upper);
    double logBound = EnvelopeBound.logSupremum(logDensity, lower, upper, proposal);
    return new FixedEnvelopeRejection(logDensity, lower, upper, proposal, logBound);
  }

  /** One exact, independent draw from the target. */
  public double sample(RandomGenerator rng) {
    for (long made = 0; made < proposalCap; made++) {
      proposals++;
      // Step 1: x ~ g.
      double x = proposal.draw(rng);
      if (!(x > lower && x < upper)) {
        continue; // f = 0 outside the open support: rejected with certainty.
      }
      // Step 2: accept with probability f(x) / (M g(x)).
      evaluations++;
      double logTarget = Arguments.evaluate(logDensity, x);
      if (logTarget == Double.NEGATIVE_INFINITY) {
        continue;
      }
      double logProposal = proposal.logDensity(x);
      if (!Double.isFinite(logProposal)) {
        throw new DensityEvaluationException("proposal log-density at its own draw", x,
            logProposal);
      }
      double logRatio = logTarget - logProposal;
      double magnitude =
          Math.max(Math.abs(logBound), Math.max(Math.abs(logTarget), Math.abs(logProposal)));
      if (logRatio - logBound > ROUNDING + ROUNDING_ULPS * Math.ulp(magnitude)) {
        throw new EnvelopeViolationException(x, logRatio, logBound);
      }
      if (Math.log(rng.nextDouble()) < logRatio - logBound) {
        draws++;
        return x;
      }
    }
    throw new RejectionLimitException("fixed-envelope rejection", proposalCap);
  }

  /** {@code log M}, the envelope's log scale. */
  public double logBound() {
    return logBound;
  }

  /** {@code M = exp(log M)}. */
  public double bound() {
    return Math.exp(logBound);
  }

  /**
   * {@code 1 / M}: the probability that one proposal is accepted when both {@code f} and {@code g}
   * are normalised (for an unnormalised {@code f} the rate is {@code Z_f / M}).
   */
  public double expectedAcceptance() {
    return Math.exp(-logBound);
  }

  /** The counts so far: draws, proposals, target evaluations. */
  public RejectionStatistics statistics() {
    return new RejectionStatistics(draws, proposals, evaluations);
  }
}

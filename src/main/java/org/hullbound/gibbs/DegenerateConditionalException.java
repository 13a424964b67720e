package org.hullbound.gibbs;

import org.hullbound.hull.HullException;
import org.hullbound.hull.ProposalLimitException;
import org.hullbound.sampling.ArmsFailureException;

/**
 * One unknown's full conditional is numerically degenerate: its adaptive rejection draw gave up
 * after its cap of proposals ({@link ProposalLimitException}), because the hull could not follow a
 * conditional far narrower than where it started (extreme data such as 1e15 binomial trials) or
 * rounding kept the density far under it, and a new hull started around the highest point of the
 * first failed as well.
 *
 * <p>The message names the values a practitioner needs to see the degeneracy: the unknown's
 * current value, its support, and where the hull's abscissae lay with the log-density at the
 * highest of them, all on the sampling scale.
 *
 * <p>The fallback (adaptive rejection Metropolis) fails in the same way when the conditional it
 * took over is degenerate too ({@link ArmsFailureException}): that failure is reported as this
 * type with the fallback's own values.
 */
public final class DegenerateConditionalException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  DegenerateConditionalException(
      double current, double lower, double upper, ProposalLimitException stuck,
      HullException restartFailed) {
    super(describe(current, lower, upper, stuck, restartFailed), stuck);
    addSuppressed(restartFailed);
  }

  DegenerateConditionalException(ArmsFailureException fallbackFailed) {
    super("the full conditional is numerically degenerate for the fallback: "
        + fallbackFailed.getMessage() + " (sampling scale); check the data for extreme values"
        + " (such as a count of 1e15) or rescale", fallbackFailed);
  }

  private static String describe(
      double current, double lower, double upper, ProposalLimitException stuck,
      HullException restartFailed) {
    double[] xs = stuck.abscissae();
    double[] hs = stuck.values();
    int top = 0;
    for (int i = 1; i < hs.length; i++) {
      if (hs[i] > hs[top]) {
        top = i;
      }
    }
    StringBuilder around = new StringBuilder();
    for (int i = Math.max(0, top - 1); i <= Math.min(hs.length - 1, top + 1); i++) {
      around.append(around.length() == 0 ? "" : ", ")
          .append("h(").append(xs[i]).append(") = ").append(hs[i]);
    }
    return "the full conditional is numerically degenerate: no proposal accepted in "
        + stuck.proposals() + " proposals of one draw from current value " + current
        + " on support (" + lower + ", " + upper + ") (sampling scale); the hull's "
        + xs.length + " abscissae run from " + xs[0] + " to " + xs[xs.length - 1]
        + ", near its highest point " + around
        + "; a new hull started there failed too (" + restartFailed.getMessage() + ")"
        + "; check the data for extreme values (such as a count of 1e15) or rescale";
  }
}

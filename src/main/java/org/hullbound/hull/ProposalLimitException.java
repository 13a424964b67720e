package org.hullbound.hull;

/**
 * One draw made {@link HullOptions#maximumProposals()} proposals without accepting any: the hull
 * and the density disagree so much that the draw would, in practice, never end.
 *
 * <p>A correct envelope accepts a proposal with a probability that is rarely below a few percent
 * (Gilks and Wild 1992 report about three evaluations per draw); the cap turns a draw that would
 * spin for hours (a conditional far narrower than the hull could follow once its abscissae ran
 * out, or rounding that keeps the density far under the hull) into this typed error, so that a
 * caller can name the unknown and stop. Giving up never biases a draw: an accepted proposal is
 * distributed as the target whatever happened before it, so a draw that is returned is exact.
 */
public final class ProposalLimitException extends HullException {
  private final long proposals;
  private final double[] abscissae;
  private final double[] values;

  ProposalLimitException(long proposals, double[] abscissae, double[] values, double x) {
    super(
        "no proposal accepted in " + proposals + " proposals of one draw (hull of "
            + abscissae.length + " abscissae from " + abscissae[0] + " to "
            + abscissae[abscissae.length - 1] + ", highest log-density at an abscissa "
            + highest(values) + ")",
        x);
    this.proposals = proposals;
    this.abscissae = abscissae.clone();
    this.values = values.clone();
  }

  private static double highest(double[] values) {
    double top = Double.NEGATIVE_INFINITY;
    for (double value : values) {
      top = Math.max(top, value);
    }
    return top;
  }

  /** The proposals made by the draw that gave up. */
  public long proposals() {
    return proposals;
  }

  /** The hull's abscissae when the draw gave up (a copy, ascending). */
  public double[] abscissae() {
    return abscissae.clone();
  }

  /** The log-density at each abscissa (a copy). */
  public double[] values() {
    return values.clone();
  }
}

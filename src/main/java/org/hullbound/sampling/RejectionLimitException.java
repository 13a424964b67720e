package org.hullbound.sampling;

/**
 * A rejection sampler made its cap of proposals for one draw without accepting any: the target
 * has, in practice, no mass where the envelope proposes, and the draw would otherwise never end.
 *
 * <p>The cap is set so that a correct sampler meets it with probability e^-100 or less; giving
 * up biases nothing, since an accepted proposal is distributed as the target whatever came
 * before it.
 */
public final class RejectionLimitException extends RuntimeException {
  private static final long serialVersionUID = 1L;
  private final long proposals;

  RejectionLimitException(String sampler, long proposals) {
    super(sampler + ": no proposal accepted in " + proposals + " proposals of one draw; the"
        + " target has almost no mass where the envelope proposes");
    this.proposals = proposals;
  }

  /** The proposals the draw made. */
  public long proposals() {
    return proposals;
  }
}

package org.hullbound.sampling;

import java.util.Arrays;

/**
 * Adaptive rejection Metropolis ({@link AdaptiveRejectionMetropolis}) could not make a transition:
 * no candidate accepted within its cap of tries, an envelope whose mass is not finite, a log f
 * that does not fall toward an infinite end of the support, or zero density at the current value
 * or at an initial point.
 *
 * <p>The message names the values a practitioner needs to see why: the current value, the support,
 * and the abscissae of the envelope with log f at the highest of them and at the ends, on the
 * sampler's own scale. Typed, so that the caller can tell it from a programming error and name the
 * unknown it was updating.
 */
public final class ArmsFailureException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  private final double current;
  private final double[] abscissae;
  private final double[] values;

  ArmsFailureException(String what, double current, double lower, double upper, double[] xs,
      double[] hs, int size) {
    super(describe(what, current, lower, upper, xs, hs, size));
    this.current = current;
    this.abscissae = Arrays.copyOf(xs, size);
    this.values = Arrays.copyOf(hs, size);
  }

  /** The chain's value the transition started from. */
  public double current() {
    return current;
  }

  /** The envelope's abscissae when it failed, ascending (a copy). */
  public double[] abscissae() {
    return abscissae.clone();
  }

  /** log f at the {@link #abscissae()} (floored where it was lower; a copy). */
  public double[] values() {
    return values.clone();
  }

  private static String describe(String what, double current, double lower, double upper,
      double[] xs, double[] hs, int size) {
    StringBuilder text = new StringBuilder("adaptive rejection Metropolis from current value ")
        .append(current).append(" on support (").append(number(lower)).append(", ")
        .append(number(upper)).append(") ").append(what);
    if (size > 0) {
      int top = 0;
      for (int i = 1; i < size; i++) {
        if (hs[i] > hs[top]) {
          top = i;
        }
      }
      text.append("; its ").append(size).append(" abscissae run from ").append(xs[0])
          .append(" to ").append(xs[size - 1]).append(", log f = ").append(hs[0]).append(" and ")
          .append(hs[size - 1]).append(" there and highest ").append(hs[top]).append(" at ")
          .append(xs[top]);
    }
    return text.toString();
  }

  /** Infinite ends as the model language writes them. */
  private static String number(double value) {
    return value == Double.POSITIVE_INFINITY ? "inf"
        : value == Double.NEGATIVE_INFINITY ? "-inf" : Double.toString(value);
  }
}

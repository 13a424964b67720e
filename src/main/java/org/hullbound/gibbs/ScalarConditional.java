package org.hullbound.gibbs;

/**
 * The full conditional log-density of one unknown, up to a constant, on its sampling scale
 * {@code u}, as the Gibbs driver draws from it; the state holds natural-scale values.
 *
 * <p>The driver's own narrow view of a model's conditional (it mirrors the compiled model's
 * conditional density), so that the updaters serve compiled models, hand-written targets in tests
 * and the benchmark alike.
 */
public interface ScalarConditional {

  /**
   * The log-density at {@code u} given the other unknowns in {@code state} (natural scale; this
   * unknown's own entry is ignored), Jacobian of the scale included; when {@code slope} is not
   * {@code null} its entry 0 receives the derivative in {@code u}. Returns {@code -inf} outside the
   * support.
   */
  double logDensity(double u, double[] state, double[] slope);

  /** The natural value of sampling-scale point {@code u}. */
  default double toNatural(double u) {
    return u;
  }

  /** The sampling-scale point of natural value {@code v}. */
  default double toSamplingScale(double v) {
    return v;
  }

  /** Lower end of the support on the sampling scale at {@code state} ({@code -inf} for none). */
  default double lowerBound(double[] state) {
    return Double.NEGATIVE_INFINITY;
  }

  /** Upper end of the support on the sampling scale at {@code state} ({@code +inf} for none). */
  default double upperBound(double[] state) {
    return Double.POSITIVE_INFINITY;
  }

  /** Whether the derivative is available and continuous, so that tangents can be used. */
  default boolean smooth() {
    return true;
  }

  /** Whether the unknown takes whole values only (a missing count): no hull, no derivative. */
  default boolean discrete() {
    return false;
  }

  /**
   * This conditional for one chain's updater (the model's {@link
   * org.hullbound.model.ConditionalDensity#forOneChain}): the same values; this itself by default.
   */
  default ScalarConditional forOneChain() {
    return this;
  }
}

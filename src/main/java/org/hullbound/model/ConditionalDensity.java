package org.hullbound.model;

import org.hullbound.model.family.Scale;

/**
 * The full conditional log-density of one scalar unknown, compiled once from its Markov blanket
 * (its own prior term and the terms of exactly the nodes that depend on it), evaluated with its
 * derivative in one call.
 *
 * <p>Evaluated on the sampling scale {@code u}: the natural value is {@code exp(u)} on the log
 * scale and {@code expit(u)} on the logit scale, and the log-Jacobian of that map is
 * included, so that adaptive rejection sampling (Gilks and Wild 1992) can work on {@code u}
 * directly. Constants that do not depend on the unknown may be dropped; normalisers that do
 * (lgamma terms, truncation normalisers) are kept. Instances are immutable and may be shared by
 * chains running in parallel: each call uses only its arguments.
 */
public interface ConditionalDensity {

  /** The unknown this is the conditional of. */
  Unknown unknown();

  /** The scale {@code u} is on. */
  Scale scale();

  /**
   * The conditional log-density at {@code u} (sampling scale), up to a constant.
   *
   * @param u the point on the sampling scale
   * @param state natural-scale values of all unknowns (this unknown's own entry is ignored)
   * @param slope if not {@code null}, receives in {@code slope[0]} the derivative with respect to
   *     {@code u}
   * @return the log-density, {@code -inf} outside the support
   */
  double logDensity(double u, double[] state, double[] slope);

  /** The natural value of sampling-scale point {@code u}. */
  double toNatural(double u);

  /** The sampling-scale point of natural value {@code v}. */
  double toSamplingScale(double v);

  /** The lower end of the support on the sampling scale at {@code state} ({@code -inf} if open). */
  double lowerBound(double[] state);

  /** The upper end of the support on the sampling scale at {@code state} ({@code inf} if open). */
  double upperBound(double[] state);

  /** False when a term is not differentiable in the unknown (laplace, abs, min, max). */
  boolean smooth();

  /** How many likelihood and prior terms the conditional sums (its Markov blanket's size). */
  int termCount();

  /**
   * This conditional for the updater of one chain: the same values, bit for bit, from scratch
   * space of its own rather than its thread's, so that a draw need not look that up (a sweep of
   * grown {@code clinics} draws 3,600 conditionals, each once). Not for two threads at once: a
   * chain's updates run one after another (on whichever thread), which is all it needs; this
   * conditional itself where it keeps no scratch space.
   */
  default ConditionalDensity forOneChain() {
    return this;
  }
}

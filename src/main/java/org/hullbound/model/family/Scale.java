package org.hullbound.model.family;

/**
 * The scale on which a quantity is sampled or on which concavity is asked: the quantity itself, its
 * logarithm, or its logit.
 *
 * <p>A positive unknown is often sampled as {@code u = log(value)} and a unit-interval unknown as
 * {@code u = logit(value)}; a density that is not log-concave in the value can be log-concave in
 * {@code u}, which is what adaptive rejection sampling needs (Gilks and Wild 1992).
 */
public enum Scale {
  /** The quantity itself. */
  NATURAL,
  /** {@code u} with {@code quantity = exp(u)}. */
  LOG,
  /** {@code u} with {@code quantity = expit(u) = 1 / (1 + exp(-u))}. */
  LOGIT
}

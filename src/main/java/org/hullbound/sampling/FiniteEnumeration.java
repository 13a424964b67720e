package org.hullbound.sampling;

import java.util.random.RandomGenerator;

/**
 * An exact draw from a mass on finitely many points given by its log weights, by enumeration:
 * normalise in log space (log-sum-exp with the largest weight subtracted, so that weights of
 * {@code -1e5} or spread over 10^4 points neither underflow to an all-zero sum nor overflow), then
 * invert the cumulative sum with one uniform.
 *
 * <p>The weights need no normalising constant; {@code -inf} means mass 0. Inversion of a finite
 * cumulative distribution is exact up to the rounding of the sums (common practice; Devroye,
 * Non-Uniform Random Variate Generation, 1986, section III.2, the sequential search).
 */
public final class FiniteEnumeration {
  private FiniteEnumeration() {}

  /**
   * The position of one draw among {@code logWeights[0 .. count - 1]}, with probability {@code
   * exp(logWeights[i]) / sum exp(logWeights)}; uses one uniform of {@code rng}.
   *
   * @throws DensityEvaluationException when a weight is NaN or +inf, or every weight is -inf
   */
  public static int draw(double[] logWeights, int count, RandomGenerator rng) {
    Arguments.notNull("logWeights", logWeights);
    Arguments.notNull("rng", rng);
    if (count < 1 || count > logWeights.length) {
      throw new IllegalArgumentException(
          "count must be in 1 .. " + logWeights.length + ", got " + count);
    }
    double top = Double.NEGATIVE_INFINITY;
    for (int i = 0; i < count; i++) {
      double w = logWeights[i];
      if (Double.isNaN(w) || w == Double.POSITIVE_INFINITY) {
        throw new DensityEvaluationException("the log mass", i, w);
      }
      top = Math.max(top, w);
    }
    if (top == Double.NEGATIVE_INFINITY) {
      throw new DensityEvaluationException("the log mass (every point)", 0, top);
    }
    double sum = 0;
    for (int i = 0; i < count; i++) {
      sum += Math.exp(logWeights[i] - top);
    }
    double target = rng.nextDouble() * sum;
    double running = 0;
    int last = 0;
    for (int i = 0; i < count; i++) {
      double p = Math.exp(logWeights[i] - top);
      if (p > 0) {
        running += p;
        last = i;
        if (target < running) {
          return i;
        }
      }
    }
    return last; // rounding left the target at the very top of the sum
  }
}

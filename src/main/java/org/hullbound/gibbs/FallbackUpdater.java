package org.hullbound.gibbs;

import java.util.random.RandomGenerator;

/**
 * A Markov transition that leaves the full conditional invariant where log-concavity is not
 * established, so that exact adaptive rejection cannot be used.
 *
 * <p>Interim: slice sampling with stepping out and shrinkage (Neal 2003, Annals of Statistics 31,
 * figures 3 and 5) until the sampling package's adaptive rejection Metropolis is merged.
 */
final class FallbackUpdater implements Updater {
  private static final int MAX_STEPS = 32;

  private final int index;
  private final ScalarConditional conditional;
  /** A fixed step (changing it from the chain's own history would break invariance). */
  private static final double WIDTH = 1.0;

  private long draws;
  private long evaluations;

  FallbackUpdater(UpdateRule.Fallback rule) {
    this.index = rule.index();
    this.conditional = rule.conditional();
  }

  @Override
  public void update(double[] state, RandomGenerator rng) {
    if (conditional.discrete()) {
      wholeStep(state, rng);
      return;
    }
    double lower = conditional.lowerBound(state);
    double upper = conditional.upperBound(state);
    double x0 = conditional.toSamplingScale(state[index]);
    double h0 = log(x0, state, lower, upper);
    // Neal 2003, figure 3: the slice level, then an interval stepped out around x0.
    double level = h0 - (-Math.log1p(-rng.nextDouble()));
    double left = x0 - WIDTH * rng.nextDouble();
    double right = left + WIDTH;
    int j = (int) Math.floor(MAX_STEPS * rng.nextDouble());
    int k = MAX_STEPS - 1 - j;
    while (j-- > 0 && left > lower && log(left, state, lower, upper) > level) {
      left -= WIDTH;
    }
    while (k-- > 0 && right < upper && log(right, state, lower, upper) > level) {
      right += WIDTH;
    }
    left = Math.max(left, lower);
    right = Math.min(right, upper);
    // Figure 5: shrink towards x0 until a point in the slice is drawn.
    double x1;
    while (true) {
      x1 = left + rng.nextDouble() * (right - left);
      if (x1 > lower && x1 < upper && log(x1, state, lower, upper) >= level) {
        break;
      }
      if (x1 < x0) {
        left = x1;
      } else {
        right = x1;
      }
    }
    state[index] = conditional.toNatural(x1);
    draws++;
  }

  /**
   * A whole-valued unknown: Metropolis (Metropolis et al. 1953) with the symmetric proposal
   * x +- 1, rejected outside the support.
   */
  private void wholeStep(double[] state, RandomGenerator rng) {
    double lower = conditional.lowerBound(state);
    double upper = conditional.upperBound(state);
    double x0 = state[index];
    double x1 = x0 + (rng.nextBoolean() ? 1 : -1);
    double u = rng.nextDouble();
    if (x1 >= lower && x1 <= upper) {
      evaluations += 2;
      double h0 = conditional.logDensity(conditional.toSamplingScale(x0), state, null);
      double h1 = conditional.logDensity(conditional.toSamplingScale(x1), state, null);
      if (Math.log(u) < h1 - h0) {
        state[index] = x1;
      }
    }
    draws++;
  }

  private double log(double u, double[] state, double lower, double upper) {
    if (!(u > lower && u < upper)) {
      return Double.NEGATIVE_INFINITY;
    }
    evaluations++;
    return conditional.logDensity(u, state, null);
  }

  @Override
  public int[] indices() {
    return new int[] {index};
  }

  @Override
  public String method() {
    return conditional.discrete() ? "whole-step Metropolis (fallback)" : "slice (fallback)";
  }

  @Override
  public long draws() {
    return draws;
  }

  @Override
  public long evaluations() {
    return evaluations;
  }
}

package org.hullbound.gibbs;

import java.util.random.RandomGenerator;
import org.hullbound.hull.DiscreteAdaptiveRejection;
import org.hullbound.hull.HullOptions;
import org.hullbound.hull.SamplerStatistics;
import org.hullbound.sampling.FiniteEnumeration;

/**
 * An exact draw of a whole-valued unknown from its full conditional, each sweep afresh: by
 * enumeration of the log mass over the support at the current state ({@link FiniteEnumeration},
 * log-sum-exp, no underflow), or, for a conditional proved discretely log-concave whose support
 * is unbounded or larger than {@link #HULL_ABOVE} values, by the integer hull ({@link
 * DiscreteAdaptiveRejection}, Gilks and Wild 1992 on the integers).
 *
 * <p>Nothing carries over between sweeps but the counters: each draw is exact given the state,
 * so the kernel is the Gibbs update itself (Geman and Geman 1984). A finite support wider than
 * {@link #ENUMERATION_LIMIT} values without a log-concavity proof is refused with a typed error
 * rather than sampled approximately.
 */
final class DiscreteUpdater implements Updater {
  /** Above this many values a log-concave conditional is drawn by the hull, not enumerated. */
  static final double HULL_ABOVE = 1000;
  /** The most values enumerated in one draw (about 10^6 conditional evaluations). */
  static final double ENUMERATION_LIMIT = 1_000_000;

  private final int index;
  private final ScalarConditional conditional;
  private final boolean finite;
  private final boolean logConcave;
  private double[] weights = new double[16];
  private long draws;
  private long evaluations;
  private long hullDraws;

  DiscreteUpdater(UpdateRule.Discrete rule) {
    this.index = rule.index();
    this.conditional = rule.conditional();
    this.finite = rule.finite();
    this.logConcave = rule.logConcave();
  }

  @Override
  public void update(double[] state, RandomGenerator rng) {
    double lower = Math.ceil(conditional.lowerBound(state));
    double upper = Math.floor(conditional.upperBound(state));
    double count = upper - lower + 1;
    if (!(count >= 1)) {
      throw new IllegalStateException(
          "the support " + lower + " .. " + upper + " at this state holds no whole number");
    }
    if (logConcave && !(count <= HULL_ABOVE)) {
      state[index] = hullDraw(state, lower, upper, rng);
      hullDraws++;
    } else if (count <= ENUMERATION_LIMIT) {
      state[index] = lower + enumerate(state, lower, (int) count, rng);
    } else {
      throw new IllegalStateException(
          "the support " + (long) lower + " .. " + (long) upper + " holds more than "
              + (long) ENUMERATION_LIMIT + " values to enumerate, and the conditional is not"
              + " proved log-concave for the integer hull");
    }
    draws++;
  }

  private int enumerate(double[] state, double lower, int count, RandomGenerator rng) {
    if (weights.length < count) {
      weights = new double[Math.max(count, 2 * weights.length)];
    }
    for (int i = 0; i < count; i++) {
      weights[i] = conditional.logDensity(lower + i, state, null);
    }
    evaluations += count;
    return FiniteEnumeration.draw(weights, count, rng);
  }

  /**
   * The hull on the run of integers where the mass is positive: a log-concave mass is positive on
   * one run, which holds the current value (the chain's state has a positive density), so each
   * finite end of the support where the mass is 0 is moved in by bisection towards it.
   */
  private double hullDraw(double[] state, double lower, double upper, RandomGenerator rng) {
    double current = state[index];
    double from = Double.isFinite(lower) ? firstPositive(state, lower, current, true) : lower;
    double to = Double.isFinite(upper) ? firstPositive(state, upper, current, false) : upper;
    double spread = Math.max(1, Math.sqrt(Math.abs(current) + 1));
    DiscreteAdaptiveRejection sampler = DiscreteAdaptiveRejection.of(
        k -> conditional.logDensity(k, state, null), from, to,
        HullOptions.defaults().withAutomaticStart(current, spread));
    long value = sampler.next(rng);
    SamplerStatistics statistics = sampler.statistics();
    evaluations += statistics.evaluations();
    return value;
  }

  /** The whole number nearest {@code end} towards {@code current} with a positive mass. */
  private double firstPositive(double[] state, double end, double current, boolean fromBelow) {
    evaluations++;
    if (conditional.logDensity(end, state, null) > Double.NEGATIVE_INFINITY) {
      return end;
    }
    double outside = end;
    double inside = current;
    while (Math.abs(inside - outside) > 1) {
      double middle = Math.floor(outside + (inside - outside) / 2);
      evaluations++;
      if (conditional.logDensity(middle, state, null) > Double.NEGATIVE_INFINITY) {
        inside = middle;
      } else {
        outside = middle;
      }
    }
    return inside;
  }

  @Override
  public int[] indices() {
    return new int[] {index};
  }

  @Override
  public String method() {
    return !finite ? "integer hull" : logConcave ? "enumeration or integer hull" : "enumeration";
  }

  @Override
  public long draws() {
    return draws;
  }

  @Override
  public long evaluations() {
    return evaluations;
  }

  @Override
  public UpdaterState save() {
    return new UpdaterState.Writer().put(draws).put(evaluations).put(hullDraws).done();
  }

  @Override
  public void restore(UpdaterState saved) {
    UpdaterState.Reader in = new UpdaterState.Reader(saved, method());
    long restoredDraws = in.nextLong();
    long restoredEvaluations = in.nextLong();
    long restoredHullDraws = in.nextLong();
    in.end();
    draws = restoredDraws;
    evaluations = restoredEvaluations;
    hullDraws = restoredHullDraws;
  }
}

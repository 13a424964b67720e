package org.hullbound.gibbs;

import java.util.random.RandomGenerator;
import org.hullbound.sampling.AdaptiveRejectionMetropolis;
import org.hullbound.sampling.ArmsFailureException;

/**
 * A Markov transition that leaves the full conditional invariant where log-concavity is not
 * established: adaptive rejection Metropolis (Gilks, Best and Tan 1995), or for a whole-valued
 * unknown a +-1 Metropolis step.
 *
 * <p>ARMS needs initial abscissae that do not depend on the unknown's current value. They are set
 * from the chain's own draws during burn-in (mean and sd of the visited values on the sampling
 * scale, points at mean - sd, mean, mean + sd; adapting during burn-in only, then fixed, is
 * common practice), and are fixed from then on, so that every kept draw comes from one fixed
 * reversible kernel. A fallback that starts after burn-in (a run-time switch) fixes its points at
 * once, from what the adaptive rejection updater had learnt.
 */
final class FallbackUpdater implements Updater {
  private static final int MAX_POINTS = 24;

  private final int index;
  private final ScalarConditional conditional;
  private final long adaptationSweeps;
  private double[] state;
  private double centre;
  private double spread;
  private long sweeps;
  private long draws;
  private long evaluations;
  private double mean;
  private double sumSquares;
  private long seen;

  FallbackUpdater(UpdateRule.Fallback rule, long adaptationSweeps, double centre, double spread) {
    this.index = rule.index();
    this.conditional = rule.conditional();
    this.adaptationSweeps = adaptationSweeps;
    this.centre = centre;
    this.spread = spread > 0 && Double.isFinite(spread) ? spread : 1.0;
  }

  @Override
  public void update(double[] state, RandomGenerator rng) {
    sweeps++;
    if (conditional.discrete()) {
      wholeStep(state, rng);
      return;
    }
    this.state = state;
    double lower = conditional.lowerBound(state);
    double upper = conditional.upperBound(state);
    double current = conditional.toSamplingScale(state[index]);
    if (!Double.isFinite(centre)) {
      centre = current;
    }
    AdaptiveRejectionMetropolis arms =
        AdaptiveRejectionMetropolis.of(
            this::logDensity, lower, upper, initialPoints(lower, upper), MAX_POINTS);
    double next;
    try {
      next = arms.next(current, rng);
    } catch (ArmsFailureException degenerate) {
      throw new DegenerateConditionalException(degenerate);
    }
    state[index] = conditional.toNatural(next);
    draws++;
    if (sweeps <= adaptationSweeps) {
      learn(next);
    }
  }

  /** Welford's running mean and variance of the visited values (Welford 1962). */
  private void learn(double value) {
    seen++;
    double delta = value - mean;
    mean += delta / seen;
    sumSquares += delta * (value - mean);
    if (seen >= 10) {
      centre = mean;
      double sd = Math.sqrt(sumSquares / (seen - 1));
      if (sd > 0 && Double.isFinite(sd)) {
        spread = sd;
      }
    }
  }

  private double[] initialPoints(double lower, double upper) {
    double[] points = {centre - spread, centre, centre + spread};
    if (points[0] > lower && points[2] < upper && points[0] < points[1] && points[1] < points[2]) {
      return points;
    }
    double lo = Double.isFinite(lower) ? lower : Math.min(centre, upper) - 3 * spread;
    double hi = Double.isFinite(upper) ? upper : Math.max(centre, lower) + 3 * spread;
    double width = hi - lo;
    return new double[] {lo + width / 4, lo + width / 2, lo + 3 * width / 4};
  }

  private double logDensity(double u) {
    evaluations++;
    return conditional.logDensity(u, state, null);
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

  @Override
  public int[] indices() {
    return new int[] {index};
  }

  @Override
  public String method() {
    return conditional.discrete() ? "whole-step Metropolis" : "ARMS fallback";
  }

  @Override
  public long draws() {
    return draws;
  }

  @Override
  public UpdaterState save() {
    UpdaterState.Writer out = new UpdaterState.Writer();
    write(out);
    return out.done();
  }

  /** The words of this updater, appended to {@code out} (also used inside a switched updater). */
  void write(UpdaterState.Writer out) {
    out.put(adaptationSweeps).put(sweeps).put(draws).put(evaluations).put(seen)
        .put(centre).put(spread).put(mean).put(sumSquares);
  }

  @Override
  public void restore(UpdaterState saved) {
    UpdaterState.Reader in = new UpdaterState.Reader(saved, method());
    read(in);
    in.end();
  }

  /** Reads what {@link #write} wrote; the adaptation length must be this updater's own. */
  void read(UpdaterState.Reader in) {
    long savedAdaptation = in.nextLong();
    if (savedAdaptation != adaptationSweeps) {
      throw new IllegalArgumentException(
          "the saved state of " + method() + " adapts for " + savedAdaptation
              + " sweeps, this run for " + adaptationSweeps);
    }
    long restoredSweeps = in.nextLong();
    long restoredDraws = in.nextLong();
    long restoredEvaluations = in.nextLong();
    long restoredSeen = in.nextLong();
    double restoredCentre = in.nextDouble();
    double restoredSpread = in.nextDouble();
    double restoredMean = in.nextDouble();
    double restoredSumSquares = in.nextDouble();
    sweeps = restoredSweeps;
    draws = restoredDraws;
    evaluations = restoredEvaluations;
    seen = restoredSeen;
    centre = restoredCentre;
    spread = restoredSpread;
    mean = restoredMean;
    sumSquares = restoredSumSquares;
  }

  @Override
  public long evaluations() {
    return evaluations;
  }
}

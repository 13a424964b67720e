package org.hullbound.gibbs;

import java.util.Map;
import java.util.random.RandomGenerator;
import org.hullbound.model.BoundModel;
import org.hullbound.model.ConditionalDensity;
import org.hullbound.model.PriorSimulation;
import org.hullbound.model.SimulationException;
import org.hullbound.model.Unknown;

/**
 * A bound model's dispersed starting values: a draw from the joint prior (every family of the
 * language is proper for valid arguments), then the values given with {@code --init}.
 *
 * <p>Why: chains that begin spread over the prior let split R-hat see whether they have forgotten
 * where they began (Gelman and Rubin 1992 recommend starts overdispersed relative to the
 * posterior). When the prior cannot be drawn (an argument drawn from its own prior is invalid), or
 * the drawn start has zero density or a non-finite value anywhere, the start falls back to the
 * model's valid start moved by uniform(-2, 2) on each sampling scale (common practice), and
 * finally to the undispersed start. A whole-number unknown whose conditional is zero at its start
 * (a latent count drawn below the count observed of it) is first moved to the nearest whole number
 * above, else below, where its conditional is positive. Every random number comes from the chain's
 * own generator, so a seed reproduces the starts.
 */
final class ModelStartingValues implements StartingValues {
  private final BoundModel model;
  private final PriorSimulation prior;
  private final double[] base;
  private final Map<String, Double> given;
  /** How far a whole-number start is searched each way for a positive conditional. */
  private static final int DISCRETE_SEARCH = 10_000;

  private ModelStartingValues(BoundModel model, double[] base, Map<String, Double> given) {
    this.model = model;
    PriorSimulation simulation;
    try {
      simulation = PriorSimulation.of(model);
    } catch (SimulationException unordered) {
      simulation = null;
    }
    this.prior = simulation;
    this.base = base.clone();
    this.given = Map.copyOf(given);
  }

  /**
   * The starts of {@code model} around the valid state {@code base}, with {@code given} values.
   *
   * @throws StartingValueException when a given value (or the model's start) has zero density
   */
  static ModelStartingValues of(BoundModel model, double[] base, Map<String, Double> given) {
    ModelStartingValues starts = new ModelStartingValues(model, base, given);
    // Fail before sampling when a given value is outside its support.
    starts.undispersed(base.clone());
    return starts;
  }

  @Override
  public void fill(double[] state, RandomGenerator rng) {
    if (priorDraw(state, rng)) {
      return;
    }
    disperse(state, rng, true);
    if (zeroDensityAt(state) != null) {
      undispersed(state);
    }
  }

  /** Writes a prior draw with the given values into {@code state}; false when it is unusable. */
  private boolean priorDraw(double[] state, RandomGenerator rng) {
    if (prior == null) {
      return false;
    }
    double[] draw;
    try {
      draw = prior.drawUnknowns(rng);
    } catch (SimulationException invalid) {
      return false;
    }
    for (Unknown unknown : model.unknowns()) {
      Double value = given.get(unknown.label());
      if (value != null) {
        draw[unknown.index()] = value;
      }
      if (!Double.isFinite(draw[unknown.index()])) {
        return false;
      }
    }
    moveDiscreteIntoSupport(draw);
    if (zeroDensityAt(draw) != null) {
      return false;
    }
    System.arraycopy(draw, 0, state, 0, draw.length);
    return true;
  }

  private void undispersed(double[] state) {
    disperse(state, null, false);
    moveDiscreteIntoSupport(state);
    Unknown fault = zeroDensityAt(state);
    if (fault != null) {
      String origin = given.containsKey(fault.label()) ? "given" : "model's";
      String term = model.termWithoutDensity(fault.index(), state);
      throw new StartingValueException(
          "the " + origin + " starting value " + fault.label() + " = "
              + Unknown.shown(state[fault.index()])
              + " has zero density (support " + fault.support() + ")"
              + (term == null ? "" : ": " + term));
    }
  }

  private void disperse(double[] state, RandomGenerator rng, boolean dispersed) {
    System.arraycopy(base, 0, state, 0, base.length);
    for (Unknown unknown : model.unknowns()) {
      int index = unknown.index();
      ConditionalDensity density = model.conditional(index);
      Double value = given.get(unknown.label());
      if (value != null) {
        state[index] = value;
        continue;
      }
      if (unknown.discrete() || !dispersed) {
        continue;
      }
      double shift = rng.nextDouble(-2, 2);
      double u0 = density.toSamplingScale(base[index]);
      double u = Double.isFinite(u0) ? u0 + shift : shift;
      double lower = density.lowerBound(state);
      double upper = density.upperBound(state);
      if (!(u > lower && u < upper)) {
        u = Double.isFinite(u0) && u0 > lower && u0 < upper ? u0 : middle(lower, upper);
      }
      state[index] = density.toNatural(u);
    }
  }

  /**
   * Moves each whole-number unknown not given with --init, whose conditional is zero at its value,
   * to the nearest whole number with a positive conditional: first upwards, then downwards, at
   * most {@link #DISCRETE_SEARCH} steps each way. A few passes, as one move can change another's
   * conditional; what stays at zero density is reported by the caller.
   */
  private void moveDiscreteIntoSupport(double[] state) {
    for (int pass = 0; pass < 3; pass++) {
      boolean moved = false;
      for (Unknown unknown : model.unknowns()) {
        if (!unknown.discrete() || given.containsKey(unknown.label())) {
          continue;
        }
        int index = unknown.index();
        if (positiveAt(unknown, state, state[index])) {
          continue;
        }
        double found = nearestPositive(unknown, state);
        if (!Double.isNaN(found)) {
          state[index] = found;
          moved = true;
        }
      }
      if (!moved) {
        return;
      }
    }
  }

  /** The nearest whole number above, else below, with a positive conditional; NaN if none. */
  private double nearestPositive(Unknown unknown, double[] state) {
    double start = state[unknown.index()];
    for (int step = 1; step <= DISCRETE_SEARCH; step++) {
      if (positiveAt(unknown, state, start + step)) {
        return start + step;
      }
    }
    for (int step = 1; step <= DISCRETE_SEARCH; step++) {
      if (positiveAt(unknown, state, start - step)) {
        return start - step;
      }
    }
    return Double.NaN;
  }

  /** Whether {@code unknown}'s conditional is positive and finite at the natural value {@code value}. */
  private boolean positiveAt(Unknown unknown, double[] state, double value) {
    ConditionalDensity density = model.conditional(unknown.index());
    double u = density.toSamplingScale(value);
    if (!(u >= density.lowerBound(state) && u <= density.upperBound(state))) {
      return false;
    }
    return positive(density.logDensity(u, state, null));
  }

  /** Whether a log-density is that of a positive, finite density (not -inf, +inf or NaN). */
  private static boolean positive(double logDensity) {
    return logDensity > Double.NEGATIVE_INFINITY && logDensity < Double.POSITIVE_INFINITY;
  }

  /** The first unknown whose conditional is zero (or undefined) at {@code state}, else null. */
  private Unknown zeroDensityAt(double[] state) {
    for (Unknown unknown : model.unknowns()) {
      ConditionalDensity density = model.conditional(unknown.index());
      double u = density.toSamplingScale(state[unknown.index()]);
      if (!positive(density.logDensity(u, state, null))) {
        return unknown;
      }
    }
    return null;
  }

  private static double middle(double lower, double upper) {
    if (Double.isFinite(lower) && Double.isFinite(upper)) {
      return lower + (upper - lower) / 2;
    }
    if (Double.isFinite(lower)) {
      return lower + 1;
    }
    if (Double.isFinite(upper)) {
      return upper - 1;
    }
    return 0;
  }
}

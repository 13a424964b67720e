package org.hullbound.anchor;

import java.util.List;
import org.hullbound.model.BoundModel;
import org.hullbound.model.ConditionalDensity;
import org.hullbound.model.Unknown;

/**
 * The joint posterior of a bound model on the scales its Gibbs updates sample on (the log of a
 * positive unknown, the logit of a unit-interval one, the value itself otherwise), with the
 * log-Jacobian of each change of variable: the target that the No-U-Turn anchor samples, so that it
 * and {@code hullbound} draw from the same density on the same coordinates.
 *
 * <p>Nothing of the model is evaluated here. The value is the model's joint log-density ({@link
 * BoundModel#logDensity}, every term once) plus the log-Jacobians. The gradient is the vector of
 * the full conditionals' derivatives ({@link ConditionalDensity#logDensity} with a slope): the joint
 * is the conditional of {@code u_i} times factors free of {@code u_i}, so its derivative in {@code
 * u_i} is the conditional's, Jacobian included. That costs one evaluation of every conditional, the
 * sum of the Markov blankets' sizes in terms (about three passes over the data for {@code
 * clinics}), where reverse-mode differentiation of the joint would take about one: the anchor's
 * gradients are dearer than a dedicated implementation's (docs/fit.md says by how much).
 *
 * <p>Change of variable (any textbook on densities of transformed variables): for {@code x =
 * exp(u)}, {@code log |dx/du| = u}; for {@code x = expit(u)}, {@code log |dx/du| = log expit(u) +
 * log expit(-u) = -|u| - 2 log(1 + exp(-|u|))}, written so that it neither overflows nor cancels.
 * Keeps scratch space: one instance per chain.
 */
public final class ModelTarget implements Target {
  private final BoundModel model;
  private final ConditionalDensity[] conditionals;
  private final double[] natural;
  private final double[] slope = new double[1];

  private ModelTarget(BoundModel model, ConditionalDensity[] conditionals) {
    this.model = model;
    this.conditionals = conditionals;
    this.natural = new double[conditionals.length];
  }

  /**
   * The target of {@code model}'s posterior.
   *
   * @throws IllegalArgumentException when an unknown takes whole values only (a gradient-based
   *     sampler needs every unknown continuous)
   */
  public static ModelTarget of(BoundModel model) {
    if (model == null) {
      throw new IllegalArgumentException("model must not be null");
    }
    model.requireUnknowns();
    List<Unknown> unknowns = model.unknowns();
    ConditionalDensity[] conditionals = new ConditionalDensity[unknowns.size()];
    for (Unknown unknown : unknowns) {
      if (unknown.discrete()) {
        throw new IllegalArgumentException(
            "unknowns must be continuous for a gradient-based sampler, got " + unknown.label()
                + " (whole values only)");
      }
      conditionals[unknown.index()] = model.conditional(unknown.index());
    }
    return new ModelTarget(model, conditionals);
  }

  @Override
  public int dimension() {
    return conditionals.length;
  }

  @Override
  public double logDensity(double[] position, double[] gradient) {
    double logJacobian = 0;
    for (int i = 0; i < natural.length; i++) {
      double u = position[i];
      natural[i] = conditionals[i].toNatural(u);
      logJacobian += switch (conditionals[i].scale()) {
        case LOG -> u;
        case LOGIT -> -Math.abs(u) - 2 * Math.log1p(Math.exp(-Math.abs(u)));
        case NATURAL -> 0;
      };
    }
    double value = model.logDensity(natural) + logJacobian;
    if (!(value > Double.NEGATIVE_INFINITY) || value == Double.POSITIVE_INFINITY) {
      return Double.NEGATIVE_INFINITY;
    }
    for (int i = 0; i < natural.length; i++) {
      double conditional = conditionals[i].logDensity(position[i], natural, slope);
      if (!(conditional > Double.NEGATIVE_INFINITY) || !Double.isFinite(slope[0])) {
        // outside a support the joint did not see (a cut of an argument's range): no density
        return Double.NEGATIVE_INFINITY;
      }
      gradient[i] = slope[0];
    }
    return value;
  }

  /** Writes the natural values of the unknowns at {@code position} into {@code out}. */
  public void toNatural(double[] position, double[] out) {
    for (int i = 0; i < conditionals.length; i++) {
      out[i] = conditionals[i].toNatural(position[i]);
    }
  }

  /** The sampling-scale position of the natural-scale {@code state}. */
  public double[] toSamplingScale(double[] state) {
    double[] position = new double[conditionals.length];
    for (int i = 0; i < conditionals.length; i++) {
      position[i] = conditionals[i].toSamplingScale(state[i]);
    }
    return position;
  }
}

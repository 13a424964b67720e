package org.hullbound.anchor;

import java.util.random.RandomGenerator;
import org.hullbound.gibbs.ChainKernel;
import org.hullbound.model.BoundModel;

/**
 * The No-U-Turn sampler on a bound model as a {@link ChainKernel}: one iteration per sweep, the
 * unknowns recorded on the natural scale, so that the benchmark and the tests handle it as they
 * handle the Gibbs samplers.
 */
public final class AnchorKernel implements ChainKernel {
  /** The coordinates (natural and sampling scales); the sampler may move on another target. */
  private final ModelTarget target;
  private final NoUTurnSampler sampler;

  private AnchorKernel(ModelTarget target, NoUTurnSampler sampler) {
    this.target = target;
    this.sampler = sampler;
  }

  /**
   * The anchor on {@code model}'s posterior from the natural-scale {@code start} (the model's
   * {@link BoundModel#initialState} when null); the first {@code settings.warmup()} sweeps adapt.
   */
  public static AnchorKernel of(BoundModel model, double[] start, NoUTurnSampler.Settings settings) {
    ModelTarget target = ModelTarget.of(model);
    return of(model, target, start, settings);
  }

  /**
   * As {@link #of(BoundModel, double[], NoUTurnSampler.Settings)}, the sampler moving on {@code
   * sampled}: a target on {@link ModelTarget}'s coordinates of {@code model} and equal to it up to
   * a constant, such as {@link FusedClinicsTarget}.
   */
  public static AnchorKernel of(BoundModel model, Target sampled, double[] start,
      NoUTurnSampler.Settings settings) {
    ModelTarget coordinates = ModelTarget.of(model);
    if (sampled.dimension() != coordinates.dimension()) {
      throw new IllegalArgumentException("the target has " + sampled.dimension()
          + " coordinates, the model " + coordinates.dimension());
    }
    double[] natural = start == null ? model.initialState() : start;
    return new AnchorKernel(coordinates,
        NoUTurnSampler.of(sampled, coordinates.toSamplingScale(natural), settings));
  }

  @Override
  public int width() {
    return target.dimension();
  }

  @Override
  public void sweep(RandomGenerator rng) {
    sampler.iterate(rng);
  }

  @Override
  public void record(double[] out) {
    target.toNatural(sampler.position(), out);
  }

  /** The step size in use (adapted during the warm-up, fixed after it). */
  public double stepSize() {
    return sampler.stepSize();
  }

  /** Gradient evaluations so far, warm-up included. */
  public long gradientsSoFar() {
    return sampler.gradientsSoFar();
  }

  /** The sampler's counts after warm-up. */
  public NoUTurnStatistics statistics() {
    return sampler.statistics();
  }
}

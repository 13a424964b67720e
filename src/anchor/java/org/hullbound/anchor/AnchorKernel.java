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
    double[] natural = start == null ? model.initialState() : start;
    return new AnchorKernel(
        target, NoUTurnSampler.of(target, target.toSamplingScale(natural), settings));
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

package org.hullbound.gibbs;

import java.util.List;
import java.util.random.RandomGenerator;

/**
 * One chain of a Gibbs sampler: the state and one updater per unknown (or block), applied in
 * order once per sweep (systematic scan, Geman and Geman 1984).
 */
public final class GibbsKernel implements ChainKernel {
  private final double[] state;
  private final Updater[] updaters;

  GibbsKernel(double[] state, Updater[] updaters) {
    this.state = state;
    this.updaters = updaters;
  }

  @Override
  public int width() {
    return state.length;
  }

  @Override
  public void sweep(RandomGenerator rng) {
    for (Updater updater : updaters) {
      updater.update(state, rng);
    }
  }

  @Override
  public void record(double[] out) {
    System.arraycopy(state, 0, out, 0, state.length);
  }

  /** The updaters in sweep order. */
  public List<Updater> updaters() {
    return List.of(updaters);
  }

  /** A copy of the current state (natural scale). */
  public double[] state() {
    return state.clone();
  }
}

package org.hullbound.validation;

import org.hullbound.app.InMemoryFit;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.model.BoundModel;

/**
 * Fits a bound model and returns posterior draws of every unknown: the sampler under test in
 * simulation-based calibration.
 *
 * <p>An interface so that tests can hand in a deliberately wrong sampler and see calibration catch
 * it; {@link #gibbs()} is the real one.
 */
@FunctionalInterface
public interface PosteriorFitter {

  /**
   * @param draws posterior draws kept, L
   * @param thin sweeps per kept draw
   * @param burnIn sweeps discarded first
   * @return {@code [column][draw]}, {@code draws} each: the unknowns in state order, then the
   *     model's kept derived quantities (its {@code let}s, as {@code fit} keeps them)
   */
  double[][] fit(BoundModel model, int draws, int thin, int burnIn, long seed);

  /** hullbound's Gibbs driver, one chain. */
  static PosteriorFitter gibbs() {
    return (model, draws, thin, burnIn, seed) -> {
      InMemoryFit fit = InMemoryFit.of(model, new RunSettings(1, burnIn, draws, thin, seed, 1));
      double[][] out = new double[fit.labels().size()][];
      for (int i = 0; i < out.length; i++) {
        out[i] = fit.draws(i)[0];
      }
      return out;
    };
  }
}

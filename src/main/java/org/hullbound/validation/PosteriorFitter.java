package org.hullbound.validation;

import java.util.Map;
import org.hullbound.gibbs.ChainRunner;
import org.hullbound.gibbs.DrawStore;
import org.hullbound.gibbs.ModelSampler;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.gibbs.StopSignal;
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
   * @return {@code [unknown][draw]}, unknowns in state order, {@code draws} each
   */
  double[][] fit(BoundModel model, int draws, int thin, int burnIn, long seed);

  /** hullbound's Gibbs driver, one chain. */
  static PosteriorFitter gibbs() {
    return (model, draws, thin, burnIn, seed) -> {
      ModelSampler sampler = ModelSampler.of(model, Map.of());
      RunSettings settings = new RunSettings(1, burnIn, draws, thin, seed, 1);
      DrawStore store = DrawStore.create(1, draws, sampler.labels().size());
      ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
          .run(sampler.sampler().withAdaptation(burnIn), store);
      double[][] out = new double[sampler.labels().size()][];
      for (int i = 0; i < out.length; i++) {
        out[i] = store.draws(i)[0];
      }
      return out;
    };
  }
}

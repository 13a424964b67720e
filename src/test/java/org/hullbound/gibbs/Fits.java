package org.hullbound.gibbs;

import java.util.List;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;

/** Runs a sampler in a test and summarises its draws with the diagnostics package. */
final class Fits {
  private Fits() {}

  record Fit(DrawStore store, RunOutcome outcome, List<UpdateReport> reports) {
    VariableSummary summary(int index) {
      return PosteriorSummary.of("x" + index, store.draws(index));
    }
  }

  static Fit run(GibbsSampler sampler, RunSettings settings) {
    DrawStore store = DrawStore.create(settings.chains(), settings.draws(), sampler.dimension());
    RunOutcome outcome =
        ChainRunner.of(settings, ProgressListener.none(), StopSignal.create())
            .run(sampler.withAdaptation(settings.burnIn()), store);
    return new Fit(store, outcome, UpdateReport.of(sampler.dimension(), outcome.kernels()));
  }
}

package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertTrue;

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

    /**
     * Asserts that the mean and sd of each of the first {@code truth.length / 2} unknowns lie
     * within 4 MCSE of {@code truth} (means first, then sds).
     */
    void assertMomentsWithinFourMcse(double[] truth) {
      int unknowns = truth.length / 2;
      for (int k = 0; k < unknowns; k++) {
        VariableSummary summary = summary(k);
        assertTrue(
            Math.abs(summary.mean() - truth[k]) < 4 * summary.mcseMean(),
            "mean " + k + ": " + summary.mean() + " vs " + truth[k] + ", mcse "
                + summary.mcseMean());
        // The sd's MCSE: for near-normal draws about sd / sqrt(2 ess) (common practice).
        double mcseSd = summary.sd() / Math.sqrt(2 * summary.essBulk());
        assertTrue(
            Math.abs(summary.sd() - truth[unknowns + k]) < 4 * mcseSd,
            "sd " + k + ": " + summary.sd() + " vs " + truth[unknowns + k] + ", mcse " + mcseSd);
      }
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

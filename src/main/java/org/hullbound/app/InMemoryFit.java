package org.hullbound.app;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.hullbound.gibbs.ChainRunner;
import org.hullbound.gibbs.ChainState;
import org.hullbound.gibbs.DrawSink;
import org.hullbound.gibbs.DrawStore;
import org.hullbound.gibbs.ModelSampler;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.RunOutcome;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.gibbs.UpdateReport;
import org.hullbound.model.BoundModel;

/**
 * A fit whose draws are kept in memory only: the validation suite and simulation-based
 * calibration fit many small models and compare draws with references, without files.
 *
 * <p>The chains run exactly as in {@link FitRun} (the same sampler, adaptation over the burn-in,
 * seeds split per chain), so what validation checks is what {@code fit} runs; the kept {@code let}
 * quantities are computed from each kept state as {@code fit} computes them ({@link
 * DerivedColumns}), so a validation case or a calibration can check them like unknowns.
 */
public final class InMemoryFit {
  private final ModelSampler sampler;
  private final List<String> columns;
  private final DrawStore store;
  private final RunOutcome outcome;

  private InMemoryFit(
      ModelSampler sampler, List<String> columns, DrawStore store, RunOutcome outcome) {
    this.sampler = sampler;
    this.columns = columns;
    this.store = store;
    this.outcome = outcome;
  }

  /**
   * Fits {@code model} from dispersed starting values with {@code settings}, to the end.
   *
   * @throws org.hullbound.gibbs.ChainFailedException when a chain fails
   */
  public static InMemoryFit of(BoundModel model, RunSettings settings) {
    if (model == null || settings == null) {
      throw new IllegalArgumentException("model and settings must not be null");
    }
    ModelSampler sampler = ModelSampler.of(model, Map.of());
    List<String> columns = new ArrayList<>(sampler.labels());
    columns.addAll(model.derived().labels());
    DrawStore store = DrawStore.create(settings.chains(), settings.draws(), columns.size());
    DrawSink sink =
        DerivedColumns.of(store, model.derived(), sampler.labels().size(), settings.chains());
    RunOutcome outcome =
        runChains(sampler, settings, sink, ProgressListener.none(), StopSignal.create(), List.of());
    return new InMemoryFit(sampler, List.copyOf(columns), store, outcome);
  }

  /** The one way every fit runs its chains: adaptation over the burn-in, then the kept draws. */
  static RunOutcome runChains(
      ModelSampler sampler, RunSettings settings, DrawSink sink, ProgressListener listener,
      StopSignal stop, List<ChainState> from) {
    return ChainRunner.of(settings, listener, stop)
        .resume(sampler.sampler().withAdaptation(settings.burnIn()), sink, from);
  }

  /**
   * The unknowns' labels, in state order, then the kept derived quantities' ({@code fit}'s
   * columns).
   */
  public List<String> labels() {
    return columns;
  }

  /** The number of unknowns: the first labels; the derived quantities follow. */
  public int unknownCount() {
    return sampler.labels().size();
  }

  /** The draws of column {@code index} of {@link #labels()}: {@code [chain][draw]}. */
  public double[][] draws(int index) {
    return store.draws(index);
  }

  /** What each unknown's update did, in state order (derived quantities have no update). */
  public List<UpdateReport> updates() {
    return UpdateReport.of(sampler.labels().size(), outcome.kernels());
  }
}

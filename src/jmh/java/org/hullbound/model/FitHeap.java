package org.hullbound.model;

import java.util.List;
import org.hullbound.io.CsvData;
import org.hullbound.io.HeapMeasurement;

/**
 * Heap that {@code fit}'s compiled conditionals hold, in bytes per data row per used column:
 * reads {@code FILE} for {@code MODEL}, binds it, measures the used heap after full collections
 * (as {@link CheckHeap}), then compiles every unknown's conditional and evaluates each once on
 * this thread (so one workspace of each exists, as one chain's thread makes them), and measures
 * again. The difference is what the conditionals hold; a fit's other chains add one workspace
 * each (the per-draw parts of the forms that read another unknown: 8 bytes a row, or a group
 * where a run's rows are collapsed, and varying form). Then it compiles the moves' lines (each at its first draw in a fit) by evaluating each
 * once, and measures a third time: what the lines add. Last it builds the sampler around them
 * ({@code gibbs.ModelSampler}: updaters, starting values) and measures what that adds.
 *
 * <p>Issue 14: {@code fit} of the 23-million-row clinics file in the default heap; the goal is a
 * fit's live heap once compiled at most what {@code check} holds ({@link CheckHeap}: 18.7 bytes
 * per row per used column), so conditionals, lines and sampler near nothing per row.
 *
 * <p>{@code java -cp target/benchmarks.jar org.hullbound.model.FitHeap MODEL FILE}
 */
public final class FitHeap {
  private FitHeap() {}

  public static void main(String[] args) throws Exception {
    HeapMeasurement run = HeapMeasurement.begin(args, FitHeap.class.getName());
    DataTable table = CsvData.read(run.dataFile(), BoundModel.readsColumn(run.model()));
    int rows = table.rowCount();
    int columns = table.heldColumnCount();
    BoundModel bound = BoundModel.bind(run.model(), List.of(table));
    table = null;
    long bound0 = run.held();
    double[] state = bound.initialState();
    ConditionalDensity[] conditionals = new ConditionalDensity[state.length];
    long terms = 0;
    for (Unknown unknown : bound.unknowns()) {
      ConditionalDensity c = bound.conditional(unknown.index());
      c.logDensity(c.toSamplingScale(state[unknown.index()]), state, null);
      conditionals[unknown.index()] = c;
      terms += c.termCount();
    }
    long compiled = run.held();
    long held = compiled - bound0;
    List<LineDensity> lines = new java.util.ArrayList<>();
    for (Update move : bound.moves()) {
      LineDensity line = move instanceof Update.GroupMove g ? g.line()
          : move instanceof Update.DirectionBlock d ? d.line() : null;
      if (line == null) {
        continue;
      }
      double[] frame = new double[line.frameLength()];
      line.load(state, frame);
      if (line.learned()) {
        double[] direction = new double[line.members().length];
        direction[0] = 1;
        line.direct(direction, frame);
      }
      line.logDensity(line.identity(), frame, null);
      lines.add(line);
    }
    long withLines = run.held() - compiled;
    // What the sampler adds once built around them: updaters, starting values (which drew from
    // the priors through a simulation that made a term per observed row before issue 14's fix).
    org.hullbound.gibbs.ModelSampler sampler =
        org.hullbound.gibbs.ModelSampler.of(bound, java.util.Map.of());
    long withSampler = run.held() - compiled - withLines;
    System.out.printf(
        "%s: %d rows, %d used columns, %d unknowns, %d terms in all conditionals; bound model"
            + " %.1f MB (%.1f bytes per row per used column); compiled conditionals with one"
            + " workspace each %.1f MB, %.1f bytes per row per used column, %.1f bytes per"
            + " term; the %d moves' lines %.1f MB, %.1f bytes per row per used column; the"
            + " sampler built around them %.1f MB, %.1f bytes per row per used column; pools'"
            + " peaks summed %.1f MB; %.1f s (wall clock, load not controlled)%n",
        run.dataFile(), rows, columns, state.length, terms, bound0 / 1e6,
        (double) bound0 / rows / columns, held / 1e6, (double) held / rows / columns,
        (double) held / terms, lines.size(), withLines / 1e6,
        (double) withLines / rows / columns, withSampler / 1e6,
        (double) withSampler / rows / columns, HeapMeasurement.peak() / 1e6, run.seconds());
    // Keeps the model and the conditionals reachable until after the measurement.
    if (conditionals.length < lines.size() - 1_000_000) {
      System.out.println(bound + " " + sampler);
    }
  }
}

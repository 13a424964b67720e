package org.hullbound.app;

import java.nio.file.Path;
import java.util.List;
import org.hullbound.model.EmptyCells;

/**
 * What a batch of fits is asked to do: one model, its units, the {@code fit} settings every unit
 * gets (null: the default), and where the files go.
 *
 * @param modelFile the model (.hbm)
 * @param units the units, in the order of the output tables ({@link BatchUnits})
 * @param chains chains per unit, or null
 * @param burnIn sweeps discarded first, or null
 * @param draws kept draws per chain, or null
 * @param thin sweeps per kept draw, or null
 * @param seed the run's seed, or null for a drawn one
 * @param out the output folder, or null for {@code fit-units-out/<model name>}
 * @param overwrite whether an earlier batch's files in the folder may be replaced
 * @param level the probability inside the central intervals, or null for the default
 * @param emptyCells whether an empty cell of a modelled column is imputed or refused
 * @param keepDraws whether each unit's folder (draws, summary, report, inputs) is kept
 * @param resume the folder of a stopped batch to continue, or null: its settings are kept, an
 *     option given must agree with them, and {@code emptyCells} {@code IMPUTED} and {@code
 *     keepDraws} false then mean "as the batch was started"
 */
public record BatchRequest(
    Path modelFile, List<UnitData> units, Integer chains, Integer burnIn, Integer draws,
    Integer thin, Long seed, Path out, boolean overwrite, Double level, EmptyCells emptyCells,
    boolean keepDraws, Path resume) {
  public BatchRequest {
    if (modelFile == null || units == null || emptyCells == null) {
      throw new IllegalArgumentException("modelFile, units and emptyCells must not be null");
    }
    units = List.copyOf(units);
  }

  /** A new batch (not a resumed one). */
  public BatchRequest(
      Path modelFile, List<UnitData> units, Integer chains, Integer burnIn, Integer draws,
      Integer thin, Long seed, Path out, boolean overwrite, Double level, EmptyCells emptyCells,
      boolean keepDraws) {
    this(modelFile, units, chains, burnIn, draws, thin, seed, out, overwrite, level, emptyCells,
        keepDraws, null);
  }

  /** This request continuing the stopped batch in {@code folder}. */
  public BatchRequest resuming(Path folder) {
    return new BatchRequest(
        modelFile, units, chains, burnIn, draws, thin, seed, out, overwrite, level, emptyCells,
        keepDraws, folder);
  }
}

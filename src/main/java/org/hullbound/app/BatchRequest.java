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
 * @param level the probability inside the central intervals
 * @param emptyCells whether an empty cell of a modelled column is imputed or refused
 * @param keepDraws whether each unit's folder (draws, summary, report, inputs) is kept
 */
public record BatchRequest(
    Path modelFile, List<UnitData> units, Integer chains, Integer burnIn, Integer draws,
    Integer thin, Long seed, Path out, boolean overwrite, double level, EmptyCells emptyCells,
    boolean keepDraws) {
  public BatchRequest {
    if (modelFile == null || units == null || emptyCells == null) {
      throw new IllegalArgumentException("modelFile, units and emptyCells must not be null");
    }
    units = List.copyOf(units);
  }
}

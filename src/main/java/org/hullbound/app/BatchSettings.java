package org.hullbound.app;

import java.io.Serializable;
import org.hullbound.model.EmptyCells;

/**
 * How every unit of a batch is fitted: the {@code fit} settings shared by all units, and where
 * their folders go. Serializable, so that a task carries it to another machine.
 *
 * @param chains chains per unit, or null for the default
 * @param burnIn sweeps discarded first, or null
 * @param draws kept draws per chain, or null
 * @param thin sweeps per kept draw, or null
 * @param seed the run's seed, from which each unit's is derived ({@link UnitSeeds})
 * @param level the probability inside the summary's central intervals
 * @param emptyCells whether an empty cell of a modelled column is imputed or refused
 * @param folder the batch's output folder, as text (units go to {@code folder/units/<unit>})
 * @param keepDraws whether each unit's folder (draws, summary, report, its inputs) is kept
 */
public record BatchSettings(
    Integer chains, Integer burnIn, Integer draws, Integer thin, long seed, double level,
    EmptyCells emptyCells, String folder, boolean keepDraws) implements Serializable {
  public BatchSettings {
    if (emptyCells == null || folder == null) {
      throw new IllegalArgumentException("emptyCells and folder must not be null");
    }
  }
}

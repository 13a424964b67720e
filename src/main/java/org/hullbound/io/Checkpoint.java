package org.hullbound.io;

import java.util.List;
import org.hullbound.gibbs.ChainState;

/**
 * What {@code hullbound fit} saves when interrupted, to continue later with exactly the draws an
 * uninterrupted run would have made: the run's settings, a hash of its model and data, the draws
 * file's columns, and every chain's {@link ChainState}.
 *
 * <p>Read and written by {@link CheckpointFile}; a run that reached its end marks its checkpoint
 * complete, so that a finished run is not resumed.
 *
 * @param complete whether the run reached its end after this checkpoint
 * @param modelFile the model file as given on the command line (for messages)
 * @param inputHash {@link CheckpointFile#inputHash} of the model and data texts
 * @param seed the run's seed
 * @param burnIn burn-in sweeps
 * @param draws kept draws per chain
 * @param thin sweeps per kept draw
 * @param columns the labels of the unknowns, as in the draws file's header
 * @param chains every chain's state, in chain order (the chain count is their number)
 */
public record Checkpoint(
    boolean complete, String modelFile, String inputHash, long seed, int burnIn, int draws,
    int thin, List<String> columns, List<ChainState> chains) {

  public Checkpoint {
    if (modelFile == null || inputHash == null || columns == null || chains == null) {
      throw new IllegalArgumentException(
          "modelFile, inputHash, columns and chains must not be null");
    }
    if (chains.isEmpty()) {
      throw new IllegalArgumentException("a checkpoint needs at least one chain");
    }
    columns = List.copyOf(columns);
    chains = List.copyOf(chains);
  }

  /** The same checkpoint marked as the state of a run that reached its end. */
  public Checkpoint completed() {
    return new Checkpoint(true, modelFile, inputHash, seed, burnIn, draws, thin, columns, chains);
  }
}

package org.hullbound.app;

import java.nio.file.Path;

/**
 * What a fit is asked to do, as given: a null setting was not given and takes its default (or,
 * when resuming, the interrupted run's value).
 *
 * @param inputs the model and its data
 * @param initFile starting values (name,value rows), or null
 * @param chains chains, or null
 * @param burnIn sweeps discarded first, or null
 * @param draws kept draws per chain, or null
 * @param thin sweeps per kept draw, or null
 * @param seed the generators' seed, or null for a drawn one
 * @param threads worker threads, or null for one per chain up to the processors
 * @param out the output folder, or null for {@code fit-out/<model name>}
 * @param resume the folder of an interrupted run to continue, or null
 * @param overwrite whether an earlier run's files in the folder may be replaced
 * @param level the probability inside the central intervals of the summary and report
 * @param moves whether the sweep adds the model's moves along lines ({@code
 *     BoundModel.moves()}); true unless turned off for a comparison
 */
public record FitRequest(
    ModelInputs inputs, Path initFile, Integer chains, Integer burnIn, Integer draws,
    Integer thin, Long seed, Integer threads, Path out, Path resume, boolean overwrite,
    double level, boolean moves) {

  /** A request with the moves along lines on, as by default. */
  public FitRequest(
      ModelInputs inputs, Path initFile, Integer chains, Integer burnIn, Integer draws,
      Integer thin, Long seed, Integer threads, Path out, Path resume, boolean overwrite,
      double level) {
    this(inputs, initFile, chains, burnIn, draws, thin, seed, threads, out, resume, overwrite,
        level, true);
  }

  /** The same request with the moves along lines on or off. */
  public FitRequest withMoves(boolean on) {
    return new FitRequest(inputs, initFile, chains, burnIn, draws, thin, seed, threads, out,
        resume, overwrite, level, on);
  }

  public FitRequest {
    if (inputs == null) {
      throw new IllegalArgumentException("inputs must not be null");
    }
    if (!(level > 0 && level < 1)) {
      throw new IllegalArgumentException("level must lie strictly between 0 and 1, got " + level);
    }
  }
}

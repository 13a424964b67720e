package org.hullbound.report;

import java.time.Duration;
import java.time.OffsetDateTime;

/**
 * The facts about a run that head the report: which model, when, how many chains and draws, the
 * burn-in, the seed and how long it took.
 *
 * <p>Passed in by the caller, so the report never reads a clock and is reproducible from its
 * inputs.
 *
 * @param modelName the model's name; an empty name shows as "unnamed model"
 * @param startedAt when the run started
 * @param chains the number of chains
 * @param drawsPerChain draws kept per chain, after burn-in
 * @param burnIn draws discarded at the start of every chain
 * @param seed the seed the chains were split from
 * @param runTime the wall-clock time of the run
 */
public record RunHeader(
    String modelName,
    OffsetDateTime startedAt,
    int chains,
    int drawsPerChain,
    int burnIn,
    long seed,
    Duration runTime) {

  /** Checks the counts and that nothing is null. */
  public RunHeader {
    if (modelName == null) {
      throw new IllegalArgumentException("modelName must not be null (use \"\" for none)");
    }
    if (startedAt == null) {
      throw new IllegalArgumentException("startedAt must not be null");
    }
    if (chains < 1) {
      throw new IllegalArgumentException("chains must be >= 1, got " + chains);
    }
    if (drawsPerChain < 0) {
      throw new IllegalArgumentException("drawsPerChain must be >= 0, got " + drawsPerChain);
    }
    if (burnIn < 0) {
      throw new IllegalArgumentException("burnIn must be >= 0, got " + burnIn);
    }
    if (runTime == null || runTime.isNegative()) {
      throw new IllegalArgumentException("runTime must be a non-negative duration, got " + runTime);
    }
  }
}

package org.hullbound.model;

/**
 * What one call of a compiled conditional or line evaluates (terms, or groups of rows of one linear
 * predictor summed once): the deterministic cost figures of {@code gibbs.SweepCounts}, read from
 * package-private accessors.
 */
public final class EvaluationCounts {
  private EvaluationCounts() {}

  /** Terms or groups one evaluation of unknown {@code index}'s conditional sums. */
  public static int ofConditional(BoundModel model, int index) {
    return model.compiled(index).evaluationsPerCall();
  }

  /** Terms or groups one evaluation of a move's line sums. */
  public static int ofMove(Update move) {
    if (move instanceof Update.GroupMove group) {
      return group.line().evaluationsPerCall();
    }
    if (move instanceof Update.DirectionBlock block) {
      return block.line().evaluationsPerCall();
    }
    throw new IllegalArgumentException("not a move: " + move);
  }

  /** A short name of a move's kind. */
  public static String kindOf(Update move) {
    if (move instanceof Update.GroupMove group) {
      return group.kind().word() + " move";
    }
    return "direction block";
  }
}

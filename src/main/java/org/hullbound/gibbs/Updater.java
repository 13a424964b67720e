package org.hullbound.gibbs;

import java.util.random.RandomGenerator;

/**
 * One chain's updater of one unknown (or one block): draws it anew from its full conditional given
 * the rest of the state, in place.
 *
 * <p>A closed set of kinds, from exact to approximate; each keeps its chain's warm-start state and
 * counts the density evaluations it spends, which the summary reports per draw.
 */
public sealed interface Updater
    permits ConjugateUpdater, BlockNormalUpdater, AdaptiveRejectionUpdater, FallbackUpdater,
        LineMoveUpdater, DiscreteUpdater {

  /** Draws the unknown(s) anew; {@code state} holds natural-scale values. */
  void update(double[] state, RandomGenerator rng);

  /** The state entries this updater changes. */
  int[] indices();

  /** The method in a few words, such as {@code adaptive rejection (tangents)}. */
  String method();

  /** Conditional draws made so far. */
  long draws();

  /** Density evaluations spent so far. */
  long evaluations();

  /**
   * Everything of this updater that influences its future draws and is not a function of the
   * chain's state (warm starts, tuning, switches), with its counts: what a checkpoint keeps.
   * An updater whose draws depend on anything it does not save here breaks exact resumption.
   */
  UpdaterState save();

  /**
   * Continues from {@code saved}, made by {@link #save} of an updater of the same rule and run
   * settings.
   *
   * @throws IllegalArgumentException when {@code saved} does not fit this updater
   */
  void restore(UpdaterState saved);

  /** True for an extra move ({@link UpdateRule#extra()}): its draws are not draws of one unknown. */
  default boolean extra() {
    return false;
  }

  /** A note for the report when the updater changed method during the run, else {@code null}. */
  default String switchNote() {
    return null;
  }

  /** The 1-based sweep of this chain at which the updater changed method, 0 when it did not. */
  default long switchSweep() {
    return 0;
  }
}

package org.hullbound.gibbs;

import java.util.List;
import java.util.function.BooleanSupplier;
import java.util.random.RandomGenerator;

/**
 * One chain of a Gibbs sampler: the state and one updater per unknown (or block), applied in
 * order once per sweep (systematic scan, Geman and Geman 1984).
 *
 * <p>An unknown's own draw is left out of the sweep while a direction block that holds it draws
 * the whole block along directions fitted to its conditional covariance ({@link
 * LineMoveUpdater#replacesMembers()}: only after burn-in, so the kept sweeps are one fixed
 * composition of kernels that each leave the posterior invariant, and the block's directions span
 * its members, so every unknown still moves).
 */
public final class GibbsKernel implements ResumableKernel {
  private final double[] state;
  private final Updater[] updaters;
  private final List<String> labels;

  /** For each updater, the direction block whose draws may replace it, else null. */
  private final LineMoveUpdater[] coveredBy;

  GibbsKernel(double[] state, Updater[] updaters, List<String> labels) {
    this.state = state;
    this.updaters = updaters;
    this.labels = labels;
    this.coveredBy = new LineMoveUpdater[updaters.length];
    for (int k = 0; k < updaters.length; k++) {
      int[] own = updaters[k].indices();
      if (updaters[k].extra() || own.length != 1) {
        continue;
      }
      for (Updater other : updaters) {
        if (other instanceof LineMoveUpdater block && block.learnsDirections()
            && contains(block.indices(), own[0])) {
          coveredBy[k] = block;
        }
      }
    }
  }

  private static boolean contains(int[] indices, int index) {
    for (int i : indices) {
      if (i == index) {
        return true;
      }
    }
    return false;
  }

  @Override
  public int width() {
    return state.length;
  }

  @Override
  public void sweep(RandomGenerator rng) {
    sweep(rng, () -> false);
  }

  /** Asks {@code giveUp} before each update, so that a stop need not wait for a slow sweep. */
  @Override
  public boolean sweep(RandomGenerator rng, BooleanSupplier giveUp) {
    for (int k = 0; k < updaters.length; k++) {
      Updater updater = updaters[k];
      if (giveUp.getAsBoolean()) {
        return false;
      }
      if (coveredBy[k] != null && coveredBy[k].replacesMembers()) {
        continue;
      }
      try {
        updater.update(state, rng);
      } catch (UpdateFailedException already) {
        throw already;
      } catch (RuntimeException failure) {
        throw new UpdateFailedException(nameOf(updater), updater.method(), failure);
      }
    }
    return true;
  }

  @Override
  public void record(double[] out) {
    System.arraycopy(state, 0, out, 0, state.length);
  }

  private String nameOf(Updater updater) {
    int[] indices = updater.indices();
    if (labels == null) {
      return indices.length == 1 ? "state entry " + indices[0] : "state entries " + java.util.Arrays.toString(indices);
    }
    StringBuilder names = new StringBuilder();
    for (int index : indices) {
      names.append(names.length() == 0 ? "" : ", ").append(labels.get(index));
    }
    return names.toString();
  }

  @Override
  public KernelState save() {
    List<UpdaterState> saved = new java.util.ArrayList<>();
    for (Updater updater : updaters) {
      saved.add(updater.save());
    }
    return new KernelState(state, saved);
  }

  @Override
  public void restore(KernelState saved) {
    double[] values = saved.values();
    if (values.length != state.length || saved.updaters().size() != updaters.length) {
      throw new IllegalArgumentException(
          "the saved chain has " + values.length + " values and " + saved.updaters().size()
              + " updaters, this sampler " + state.length + " and " + updaters.length);
    }
    for (int k = 0; k < updaters.length; k++) {
      updaters[k].restore(saved.updaters().get(k));
    }
    System.arraycopy(values, 0, state, 0, state.length);
  }

  /** The updaters in sweep order. */
  public List<Updater> updaters() {
    return List.of(updaters);
  }

  /** A copy of the current state (natural scale). */
  public double[] state() {
    return state.clone();
  }
}

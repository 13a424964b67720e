package org.hullbound.gibbs;

import java.util.List;

/**
 * A Gibbs kernel's whole state between two sweeps: the values of the unknowns and each updater's
 * {@link UpdaterState}, in sweep order.
 *
 * <p>With the generator's state and the sweep count this is all a chain needs to continue exactly
 * as if it had never stopped.
 *
 * @param values the state vector, natural scale
 * @param updaters one saved state per updater, in sweep order
 */
public record KernelState(double[] values, List<UpdaterState> updaters) {

  public KernelState {
    if (values == null || updaters == null) {
      throw new IllegalArgumentException("values and updaters must not be null");
    }
    values = values.clone();
    updaters = List.copyOf(updaters);
  }

  @Override
  public double[] values() {
    return values.clone();
  }

  /** Equal when every value has the same bits and every updater state is equal. */
  @Override
  public boolean equals(Object other) {
    return other instanceof KernelState that
        && java.util.Arrays.equals(values, that.values)
        && updaters.equals(that.updaters);
  }

  @Override
  public int hashCode() {
    return 31 * java.util.Arrays.hashCode(values) + updaters.hashCode();
  }
}

package org.hullbound.app;

import org.hullbound.gibbs.DrawSink;
import org.hullbound.model.DerivedQuantities;

/**
 * A {@link DrawSink} that appends the kept {@code let} quantities, computed from the draw's state,
 * to each draw before handing it on: the draws file and the summary then treat them as columns
 * like the unknowns.
 *
 * <p>Computed, not stored in the chain: a resumed run recomputes them from the restored state,
 * so its rows equal an uninterrupted run's bit for bit. One row buffer per chain, as a chain hands
 * over its draws from one thread at a time.
 */
final class DerivedColumns implements DrawSink {
  private final DrawSink target;
  private final DerivedQuantities derived;
  private final double[][] rows;

  private DerivedColumns(DrawSink target, DerivedQuantities derived, double[][] rows) {
    this.target = target;
    this.derived = derived;
    this.rows = rows;
  }

  /**
   * {@code target} fed with rows of {@code unknowns} state values followed by the derived values;
   * {@code target} itself when nothing is derived.
   */
  static DrawSink of(DrawSink target, DerivedQuantities derived, int unknowns, int chains) {
    if (derived.size() == 0) {
      return target;
    }
    return new DerivedColumns(target, derived, new double[chains][unknowns + derived.size()]);
  }

  @Override
  public void accept(int chain, int draw, double[] values) {
    double[] row = rows[chain];
    System.arraycopy(values, 0, row, 0, values.length);
    derived.evaluate(values, row, values.length);
    target.accept(chain, draw, row);
  }
}

package org.hullbound.model;

/**
 * The scratch space of one conditional evaluation: the unknown's natural value {@code x}, the
 * state vector, the derivative register that every {@link Evaluator} writes its d/dx into, and
 * argument buffers for the family calls, one set per arity used.
 *
 * <p>Formulas evaluated once get a frame of their own; a compiled conditional keeps one per thread
 * and points it at each call's value and state ({@link #at}), so that an evaluation allocates
 * nothing and chains on other threads never share it.
 */
final class Frame {
  double x;
  double[] state;
  /** d/dx of the value the last evaluator returned (forward-mode dual number, tangent part). */
  double slope;
  /** The row a template's per-row leaves read ({@link Evaluator#rowNumber}). */
  int row;

  /** Indexed by arity: argument values, their slopes, the family's gradient, the normaliser's. */
  final double[][] args;
  final double[][] argSlopes;
  final double[][] gradient;
  final double[][] argGradient;

  /** A frame without family buffers, for evaluating formulas only. */
  Frame(double x, double[] state) {
    this(x, state, new boolean[0]);
  }

  /** This frame, now at natural value {@code x} and {@code state}. */
  Frame at(double x, double[] state) {
    this.x = x;
    this.state = state;
    return this;
  }

  Frame(double x, double[] state, boolean[] aritiesUsed) {
    this.x = x;
    this.state = state;
    int n = aritiesUsed.length;
    this.args = new double[n][];
    this.argSlopes = new double[n][];
    this.gradient = new double[n][];
    this.argGradient = new double[n][];
    for (int a = 0; a < n; a++) {
      if (aritiesUsed[a]) {
        args[a] = new double[a];
        argSlopes[a] = new double[a];
        gradient[a] = new double[a + 1];
        argGradient[a] = new double[a];
      }
    }
  }
}

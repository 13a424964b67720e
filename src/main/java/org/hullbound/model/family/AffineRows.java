package org.hullbound.model.family;

/**
 * A run of observation terms of one parametrisation, summed by one loop over primitive arrays:
 * the fast path of a compiled conditional's likelihood (issue 12), where each term's value and
 * arguments are numbers for the whole draw but for one argument, affine in the unknown {@code x}.
 *
 * <p>Term {@code j} of the run has its parts (the value, then the arguments in the order of
 * {@link Parametrisation#argumentNames()}) at {@code first + j (1 + arity) + p} of the two arrays:
 * part {@code p} is {@code intercepts[..]} when it does not read {@code x}, and {@code
 * intercepts[..] + slopes[..] x} (or the intercept alone where the slope is 0) for the moving
 * argument. The loop is a family's own arithmetic written once for all rows, with no call through
 * an interface a term: what the hand-fused floor of {@code ConditionalBenchmark} does.
 *
 * <p>Exactness: the sums equal, bit for bit, adding term after term in order {@link
 * Parametrisation#logDensity(double, double[], double[])} to {@code sums[0]} and its gradient in
 * the moving argument times that argument's slope to {@code sums[1]}, as the conditional does a
 * term at a time; so the path a conditional takes never changes a seeded draw.
 */
public interface AffineRows {
  /**
   * How many numbers a row keeps that depend on its parts that do not move alone (a binomial's
   * log binomial coefficient), worked out by {@link #keep} when those parts change, not at every
   * evaluation; 0 when none.
   */
  default int keptPerRow() {
    return 0;
  }

  /**
   * Works out the kept numbers of {@code count} rows (parts as in {@link #accumulate}) into {@code
   * kept[keptFirst ..]}, {@link #keptPerRow} a row.
   */
  default void keep(double[] intercepts, int first, int count, double[] kept, int keptFirst) {}

  /**
   * Adds the run's log-densities to {@code sums[0]} and their slopes in {@code x} to {@code
   * sums[1]}, in term order.
   *
   * @param kept what {@link #keep} wrote for these rows at their present parts (unused when
   *     {@link #keptPerRow} is 0)
   * @param args scratch of the parametrisation's arity, for rows off the fast path
   * @param gradient scratch of length {@code 1 + arity}
   */
  void accumulate(double x, double[] intercepts, double[] slopes, int first, int count,
      double[] kept, int keptFirst, double[] sums, double[] args, double[] gradient);
}

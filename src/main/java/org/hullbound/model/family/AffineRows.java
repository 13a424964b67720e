package org.hullbound.model.family;

/**
 * A run of observation terms of one parametrisation, summed by one loop over primitive arrays:
 * the fast path of a compiled conditional's likelihood (issue 12), where each term's value and
 * arguments are numbers for the whole draw but for one argument, affine in the unknown {@code x}.
 *
 * <p>Row {@code r} of the run has its parts (the value, then the arguments in the order of {@link
 * Parametrisation#argumentNames()}) in columns: part {@code p} is {@code intercepts[p][r *
 * interceptStrides[p]]} when it does not read {@code x}, and that plus {@code slopes[p][r *
 * slopeStrides[p]] x} (or the intercept alone where the slope is 0) for the moving argument. A
 * stride is 0 where every row has the same number (one value held), 1 otherwise. The columns
 * hold primitive numbers per row and no object a row (issue 14), and the loop is a family's own
 * arithmetic written once for all rows, with no call through an interface a term: what the
 * hand-fused floor of {@code ConditionalBenchmark} does.
 *
 * <p>Exactness: the sums equal, bit for bit, adding term after term in order {@link
 * Parametrisation#logDensity(double, double[], double[])} to {@code sums[0]} and its gradient in
 * the moving argument times that argument's slope to {@code sums[1]}, as the conditional does a
 * term at a time; so the path a conditional takes never changes a seeded draw. Groups of rows
 * with one linear predictor ({@link #accumulateGroups}) are the exception: equal to rounding.
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
   * Works out the kept numbers of rows {@code from .. from + count - 1} (parts as in {@link
   * #accumulate}) into {@code kept[keptFirst ..]}, {@link #keptPerRow} a row.
   */
  default void keep(double[][] intercepts, int[] interceptStrides, int from, int count,
      double[] kept, int keptFirst) {}

  /**
   * Adds the log-densities of rows {@code from .. from + count - 1} to {@code sums[0]} and their
   * slopes in {@code x} to {@code sums[1]}, in row order.
   *
   * @param kept what {@link #keep} wrote for these rows at their present parts (unused when
   *     {@link #keptPerRow} is 0)
   * @param args scratch of the parametrisation's arity, for rows off the fast path
   * @param gradient scratch of length {@code 1 + arity}
   */
  void accumulate(double x, double[][] intercepts, int[] interceptStrides, double[][] slopes,
      int[] slopeStrides, int from, int count, double[] kept, int keptFirst, double[] sums,
      double[] args, double[] gradient);

  /**
   * How many sufficient statistics a group of rows keeps, or 0 when rows of this family are never
   * collapsed. Rows of a run whose moving argument is the same affine function of {@code x} for
   * every state (bit-equal intercept and slope forms: the five trays of a bench in {@code
   * logit_p = effect[bench]}) have one linear predictor {@code eta}; where the family's
   * log-density is linear in the response's statistics given {@code eta} (common practice:
   * sufficient statistics of an exponential family, e.g. {@code sum(y) eta - sum(trials)
   * softplus(eta)} for the logit binomial), the group is evaluated once from the sums, plus its
   * rows' constants summed once. The sums change the order of additions, so results move in the
   * last bits against the rows one by one (equal to a relative 1e-12, not bit for bit).
   */
  default int statisticsPerGroup() {
    return 0;
  }

  /**
   * Whether row {@code row} (its parts read as in {@link #accumulate}, every part but the moving
   * argument a number fixed for the fit) may join a group: inside the family's support and small
   * enough that the summed form does not lose precision to cancellation.
   */
  default boolean groupable(double[][] intercepts, int[] interceptStrides, int row) {
    return false;
  }

  /** Adds row {@code row}'s statistics to {@code statistics[at ..]} (zeros for a new group). */
  default void addToGroup(double[][] intercepts, int[] interceptStrides, int row,
      double[] statistics, int at) {}

  /**
   * Adds the log-densities of groups {@code 0 .. count - 1} to {@code sums[0]} and their slopes
   * in {@code x} to {@code sums[1]}: group {@code g} reads its linear predictor from row {@code
   * rows[g]} (as {@link #accumulate} does) and its statistics from {@code statistics[g *}
   * {@link #statisticsPerGroup}{@code ..]}. Allocates nothing.
   */
  default void accumulateGroups(double x, double[][] intercepts, int[] interceptStrides,
      double[][] slopes, int[] slopeStrides, int[] rows, int count, double[] statistics,
      double[] sums) {
    throw new UnsupportedOperationException("no groups");
  }

  /**
   * Whether {@link #accumulateFactoredGroups} may stand for {@link #accumulateGroups}: the family's
   * group needs no transcendental of {@code eta} but {@code exp(-|eta|)} (or {@code exp(eta)}) and
   * what follows from it by arithmetic and one log.
   */
  default boolean factorsGroups() {
    return false;
  }

  /**
   * As {@link #accumulateGroups}, with each group's exponential taken as a product of factors
   * worked out by the caller: {@code exp(a)} and {@code exp(-a)} of group {@code g}'s intercept at
   * {@code groupExponentials[2 g]}, {@code [2 g + 1]} (once per draw), {@code exp(b x)}, {@code
   * exp(-b x)} and {@code b} itself of its class {@code k = classOf[g]} at {@code
   * classExponentials[3 k .. 3 k + 2]} (once per call; every group of a class has that {@code b},
   * which is read from there rather than from the slopes' column), each exponent at most 700 in
   * size; so {@code exp(-|eta|)} is {@code exp(-a) exp(-b x)} where {@code eta > 0}, else {@code
   * exp(a) exp(b x)}: within a few ulps of the exact, with no exponential per group. Equal to
   * {@link #accumulateGroups} to rounding.
   */
  default void accumulateFactoredGroups(double x, double[][] intercepts, int[] interceptStrides,
      double[][] slopes, int[] slopeStrides, int[] rows, int count, double[] statistics,
      double[] groupExponentials, int[] classOf, double[] classExponentials, double[] sums) {
    throw new UnsupportedOperationException("no factored groups");
  }
}

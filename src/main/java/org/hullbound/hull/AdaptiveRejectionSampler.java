package org.hullbound.hull;

import java.util.random.RandomGenerator;

/**
 * An exact sampler for a log-concave density of one variable by adaptive rejection sampling: a
 * piecewise-exponential upper hull, a squeeze below, and every evaluated rejection point added to
 * both.
 *
 * <p>Exact for any log-concave density and needs no normalising constant; after a few draws almost
 * every proposal is accepted by the squeeze alone, so the density is rarely evaluated. Gilks and
 * Wild (1992), Adaptive rejection sampling for Gibbs sampling, Applied Statistics 41, 337-348
 * (tangent hull); Gilks (1992), Derivative-free adaptive rejection sampling for Gibbs sampling,
 * Bayesian Statistics 4, 641-649 (secant hull).
 *
 * <table>
 *   <caption>Factories</caption>
 *   <tr><td>{@link #withDerivatives(DifferentiableLogDensity, Support, HullOptions)}</td>
 *       <td>tangent hull from h and h'</td></tr>
 *   <tr><td>{@link #derivativeFree(LogDensity, Support, HullOptions)}</td>
 *       <td>secant hull from h alone</td></tr>
 * </table>
 *
 * <p>While the hull still changes, each proposal uses three uniforms of the given generator (piece,
 * point in the piece, acceptance); once it has settled, most draws use one random long (see {@code
 * docs/hull.md}). Either way a seeded generator gives a reproducible sequence. Instances are not thread-safe;
 * they are cheap, make one per density (or per thread), or {@link #restart(double...)} one for
 * each new density.
 */
public interface AdaptiveRejectionSampler {

  /**
   * A sampler with the tangent hull (Gilks and Wild 1992). The starting hull is built, and its
   * density evaluations made, here.
   *
   * @param density h and h', log-concave on {@code support}
   * @param support where the density is positive
   * @param options start, cap and tolerance
   * @throws NotLogConcaveException when the starting points already show h is not concave
   * @throws InvalidDensityException when h is NaN, +inf or -inf at a starting point
   * @throws NonIntegrableHullException when no falling slope is found on an unbounded side
   */
  static AdaptiveRejectionSampler withDerivatives(
      DifferentiableLogDensity density, Support support, HullOptions options) {
    return new TangentSampler(requireNonNull(density, "density"), support, options);
  }

  /** {@link #withDerivatives(DifferentiableLogDensity, Support, HullOptions)} with defaults. */
  static AdaptiveRejectionSampler withDerivatives(
      DifferentiableLogDensity density, Support support) {
    return withDerivatives(density, support, HullOptions.defaults());
  }

  /**
   * A sampler with the secant hull (Gilks 1992), for densities without a derivative. It needs
   * about twice the evaluations of the tangent form to adapt.
   *
   * @param density h, log-concave on {@code support}
   * @param support where the density is positive
   * @param options start, cap and tolerance
   * @throws NotLogConcaveException when the starting points already show h is not concave
   * @throws InvalidDensityException when h is NaN, +inf or -inf at a starting point
   * @throws NonIntegrableHullException when no falling chord is found on an unbounded side
   */
  static AdaptiveRejectionSampler derivativeFree(
      LogDensity density, Support support, HullOptions options) {
    return new SecantSampler(requireNonNull(density, "density"), support, options);
  }

  /** {@link #derivativeFree(LogDensity, Support, HullOptions)} with defaults. */
  static AdaptiveRejectionSampler derivativeFree(LogDensity density, Support support) {
    return derivativeFree(density, support, HullOptions.defaults());
  }

  /**
   * One exact draw.
   *
   * @throws NotLogConcaveException when an evaluation shows h is not concave
   * @throws InvalidDensityException when h returns NaN or +inf
   * @throws ImpreciseDensityException when the values of h are rounded more coarsely than the
   *     log-concavity tolerance (a large constant in h)
   * @throws IllegalStateException while the last {@link #restart(double...)} has failed
   */
  double sample(RandomGenerator rng);

  /**
   * Starts the hull over from {@code abscissae}, for the same density object standing now for
   * another log-concave function on the same support (a Gibbs full conditional at the chain's next
   * state). Every earlier point is forgotten; the starting points are evaluated, checked and
   * searched outward as by the factories; the arrays are kept, so that one sampler serves a draw
   * per sweep without allocating. The draws that follow are those of a new sampler made with
   * {@link HullOptions#withStartingAbscissae(double...)} and this sampler's other options, bit for
   * bit; the counters of {@link #statistics()} keep counting.
   *
   * <p>After a restart that throws, the sampler refuses to draw (and to give its abscissae or
   * snapshot) with an {@link IllegalStateException} naming the failure, until a restart succeeds:
   * the old hull belongs to the old density and never serves a draw of the new one.
   *
   * @param abscissae finite and strictly inside the support, in any order, duplicates ignored
   * @throws IllegalArgumentException when {@code abscissae} is empty or a point lies outside
   * @throws NotLogConcaveException when the starting points already show h is not concave
   * @throws InvalidDensityException when h is NaN, +inf or -inf at a starting point
   * @throws NonIntegrableHullException when no falling slope is found on an unbounded side (a hull
   *     of no finite mass is found at the next draw)
   * @throws ImpreciseDensityException when the values of h are rounded more coarsely than the
   *     log-concavity tolerance
   */
  void restart(double... abscissae);

  /** Fills {@code draws} with independent draws. */
  default void sample(RandomGenerator rng, double[] draws) {
    for (int i = 0; i < draws.length; i++) {
      draws[i] = sample(rng);
    }
  }

  /** Counters since the sampler was made. */
  SamplerStatistics statistics();

  /**
   * A copy of the current abscissae, sorted: pass (some of) them to {@link
   * HullOptions#withStartingAbscissae(double...)} to warm-start the next sampler.
   */
  double[] abscissae();

  /** A read-only copy of the current hull and squeeze, for tests and plots. */
  HullSnapshot snapshot();

  /** The support the sampler draws on. */
  Support support();

  private static <T> T requireNonNull(T value, String name) {
    if (value == null) {
      throw new IllegalArgumentException(name + " must not be null");
    }
    return value;
  }
}

package org.hullbound.sampling;

import java.util.function.DoubleSupplier;
import java.util.function.DoubleUnaryOperator;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;

/**
 * Checks shared by the Markov-transition tests.
 *
 * <p>The exact check: draw n independent starts from the target itself (with commons-math3's own
 * samplers, or an exact mixture draw), apply ONE transition to each, and KS-test the n results
 * against the target CDF. If the transition leaves the target invariant the results are n
 * independent exact draws, so the KS level is exactly the stated one (1e-5) with no thinning or
 * burn-in argument; power >= 0.99 against a CDF error of 3.64 / sqrt(n) (see {@link GoodnessOfFit}).
 * It cannot see a lazy transition (staying put is invariant too), so each test also checks that
 * the chain moves, and the long-chain tests check convergence from a fixed start.
 *
 * <p>The sign test uses reversibility: if the transition satisfies detailed balance, then
 * (x0, x1) and (x1, x0) have the same law at stationarity, so x1 > x0 and x1 < x0 are equally
 * likely; the count of moves up among n independent pairs is Binomial(moves, 1/2). Two-sided at
 * level 1e-5: |count - moves/2| <= 4.42 sqrt(moves) / 2. Power 0.99 against an up-probability
 * off 1/2 by (4.42 + 2.33) / (2 sqrt(moves)).
 */
final class MarkovChecks {
  private MarkovChecks() {}

  static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  /** Pairs (start, next) from exact starts. */
  record Pairs(double[] starts, double[] nexts) {
    int moves() {
      int moves = 0;
      for (int i = 0; i < starts.length; i++) {
        if (nexts[i] != starts[i]) {
          moves++;
        }
      }
      return moves;
    }

    int movesUp() {
      int up = 0;
      for (int i = 0; i < starts.length; i++) {
        if (nexts[i] > starts[i]) {
          up++;
        }
      }
      return up;
    }

    /** True when the up/down split of the moves passes the two-sided sign test at 1e-5. */
    boolean signTestPasses() {
      int moves = moves();
      return Math.abs(movesUp() - moves / 2.0) <= 4.417 * Math.sqrt(moves) / 2;
    }
  }

  static Pairs oneStepFromExactStarts(
      MarkovTransition transition, DoubleSupplier exactDraw, int n, RandomGenerator rng) {
    double[] starts = new double[n];
    double[] nexts = new double[n];
    for (int i = 0; i < n; i++) {
      starts[i] = exactDraw.getAsDouble();
      nexts[i] = transition.next(starts[i], rng);
    }
    return new Pairs(starts, nexts);
  }

  /** Every {@code thin}-th state of one chain after {@code burnIn} transitions. */
  static double[] thinnedChain(
      MarkovTransition transition, double start, int burnIn, int thin, int n,
      RandomGenerator rng) {
    double x = start;
    for (int i = 0; i < burnIn; i++) {
      x = transition.next(x, rng);
    }
    double[] draws = new double[n];
    for (int i = 0; i < n; i++) {
      for (int j = 0; j < thin; j++) {
        x = transition.next(x, rng);
      }
      draws[i] = x;
    }
    return draws;
  }

  /** Lag-one sample autocorrelation. */
  static double lagOneAutocorrelation(double[] xs) {
    double mean = 0;
    for (double x : xs) {
      mean += x;
    }
    mean /= xs.length;
    double numerator = 0;
    double denominator = 0;
    for (int i = 0; i < xs.length; i++) {
      double d = xs[i] - mean;
      denominator += d * d;
      if (i > 0) {
        numerator += d * (xs[i - 1] - mean);
      }
    }
    return numerator / denominator;
  }

  /** KS p-value of the one-step results against the target CDF. */
  static double pValue(Pairs pairs, DoubleUnaryOperator cdf) {
    return GoodnessOfFit.ksPValue(pairs.nexts(), cdf);
  }
}

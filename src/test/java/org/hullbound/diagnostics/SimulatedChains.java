package org.hullbound.diagnostics;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;

/** Seeded test chains with known properties: iid normal and stationary Gaussian AR(1). */
final class SimulatedChains {
  private SimulatedChains() {}

  static RandomGenerator random(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  /** {@code chains} chains of {@code n} iid draws from N(location, scale^2). */
  static double[][] normal(long seed, int chains, int n, double location, double scale) {
    RandomGenerator random = random(seed);
    double[][] draws = new double[chains][n];
    for (int c = 0; c < chains; c++) {
      for (int i = 0; i < n; i++) {
        draws[c][i] = location + scale * random.nextGaussian();
      }
    }
    return draws;
  }

  /**
   * Stationary AR(1) chains {@code x_i = rho x_{i-1} + e_i}, e_i ~ N(0, 1), each started from the
   * stationary law N(0, 1 / (1 - rho^2)) so that no burn-in bias enters the checks.
   */
  static double[][] ar1(long seed, int chains, int n, double rho) {
    RandomGenerator random = random(seed);
    double stationarySd = 1 / Math.sqrt(1 - rho * rho);
    double[][] draws = new double[chains][n];
    for (int c = 0; c < chains; c++) {
      double x = stationarySd * random.nextGaussian();
      for (int i = 0; i < n; i++) {
        x = rho * x + random.nextGaussian();
        draws[c][i] = x;
      }
    }
    return draws;
  }
}

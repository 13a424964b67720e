package org.hullbound.validation;

import java.util.List;

/**
 * What a simulation-based calibration run gave: every replicate's rank of every unknown and kept
 * derived quantity, and the uniformity test of each.
 *
 * @param modelName the model's name
 * @param labels the unknowns in state order, then the kept derived quantities
 * @param ranks {@code [replicate][label]}, each in 0 .. settings.draws()
 * @param tests one per label, in the labels' order
 * @param settings the run's settings
 */
public record CalibrationResult(
    String modelName, List<String> labels, int[][] ranks, List<RankUniformity> tests,
    CalibrationSettings settings) {
  public CalibrationResult {
    labels = List.copyOf(labels);
    tests = List.copyOf(tests);
    int[][] copy = new int[ranks.length][];
    for (int r = 0; r < ranks.length; r++) {
      copy[r] = ranks[r].clone();
    }
    ranks = copy;
  }

  @Override
  public int[][] ranks() {
    int[][] copy = new int[ranks.length][];
    for (int r = 0; r < ranks.length; r++) {
      copy[r] = ranks[r].clone();
    }
    return copy;
  }

  /** The smallest p-value over the unknowns. */
  public double smallestPValue() {
    return tests.stream().mapToDouble(RankUniformity::pValue).min().orElse(Double.NaN);
  }

  /**
   * Whether the smallest p-value stays above {@code level / m} for m unknowns (Bonferroni 1936):
   * a family-wise test at {@code level}.
   */
  public boolean passes(double level) {
    return smallestPValue() > level / tests.size();
  }
}

package org.hullbound.gibbs;

import java.lang.management.ManagementFactory;
import java.util.Arrays;
import java.util.List;
import java.util.random.RandomGenerator;
import org.hullbound.diagnostics.PosteriorSummary;

/**
 * The draws one benchmarked chain keeps while JMH measures it, and the CPU time they took: what
 * turns sweeps per second into effective draws per CPU-second.
 *
 * <p>CPU time of the benchmark thread is steadier than wall time on a shared machine; ess is the
 * bulk ess of one chain (Vehtari et al. 2021).
 */
final class SweepRecord {
  private final List<String> labels;
  private final double[][] kept;
  private final double[] row;
  private final long cpuStart;
  private int count;
  private long sweeps;

  private SweepRecord(List<String> labels, int maxKept) {
    this.labels = labels;
    this.kept = new double[labels.size()][maxKept];
    this.row = new double[labels.size()];
    this.cpuStart = ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime();
  }

  /** Starts recording now, keeping at most {@code maxKept} draws of each of {@code labels}. */
  static SweepRecord start(List<String> labels, int maxKept) {
    return new SweepRecord(labels, maxKept);
  }

  /** One sweep of {@code kernel}, its draw kept while there is room; returns a value for JMH. */
  double sweep(ChainKernel kernel, RandomGenerator rng) {
    sweeps++;
    kernel.sweep(rng);
    kernel.record(row);
    if (count < kept[0].length) {
      for (int i = 0; i < row.length; i++) {
        kept[i][count] = row[i];
      }
      count++;
    }
    return row[0];
  }

  int keptDraws() {
    return count;
  }

  double sweepsPerCpuSecond() {
    double cpuSeconds =
        (ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime() - cpuStart) / 1e9;
    return sweeps / cpuSeconds;
  }

  /** Bulk ess per kept sweep of {@code label}. */
  double essPerSweep(String label) {
    return essPerSweep(labels.indexOf(label));
  }

  /** The unknown with the smallest bulk ess per kept sweep. */
  String weakest() {
    int weakest = 0;
    double smallest = Double.POSITIVE_INFINITY;
    for (int i = 0; i < labels.size(); i++) {
      double ess = essPerSweep(i);
      if (ess < smallest) {
        smallest = ess;
        weakest = i;
      }
    }
    return labels.get(weakest);
  }

  private double essPerSweep(int index) {
    double[] draws = Arrays.copyOf(kept[index], count);
    return PosteriorSummary.of(labels.get(index), new double[][] {draws}).essBulk() / count;
  }
}

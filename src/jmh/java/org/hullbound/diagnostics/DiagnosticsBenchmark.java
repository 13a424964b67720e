package org.hullbound.diagnostics;

import java.util.concurrent.TimeUnit;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;

/**
 * FFT autocovariance against the direct O(N^2) sum (the baseline), and a whole posterior summary
 * of 4 chains, so that the cost of the diagnostics can be set against the sampling itself.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
public class DiagnosticsBenchmark {
  @Param({"1000", "10000"})
  int length;

  double[] chain;
  double[][] chains;

  @Setup
  public void makeDraws() {
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(42);
    chains = new double[4][length];
    for (double[] c : chains) {
      double x = 0;
      for (int i = 0; i < length; i++) {
        x = 0.7 * x + random.nextGaussian();
        c[i] = x;
      }
    }
    chain = chains[0];
  }

  @Benchmark
  public double[] autocovarianceByFft() {
    return Autocorrelation.autocovariance(chain);
  }

  /** Baseline: the textbook double loop over lags and draws. */
  @Benchmark
  public double[] autocovarianceDirect() {
    int n = chain.length;
    double mean = 0;
    for (double v : chain) {
      mean += v;
    }
    mean /= n;
    double[] gamma = new double[n];
    for (int t = 0; t < n; t++) {
      double sum = 0;
      for (int i = 0; i + t < n; i++) {
        sum += (chain[i] - mean) * (chain[i + t] - mean);
      }
      gamma[t] = sum / n;
    }
    return gamma;
  }

  @Benchmark
  public VariableSummary posteriorSummaryOfFourChains() {
    return PosteriorSummary.of("x", chains);
  }
}

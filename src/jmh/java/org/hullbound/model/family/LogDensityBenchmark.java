package org.hullbound.model.family;

import java.util.Set;
import java.util.concurrent.TimeUnit;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;

/**
 * Cost of one log-density evaluation (with gradient) against commons-math3's {@code logDensity}
 * as the baseline, both with the distribution object kept and rebuilt per call (in a Gibbs sweep the
 * arguments change at every update). Report ratios to the baselines of the same run.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.NANOSECONDS)
public class LogDensityBenchmark {
  private Parametrisation normal;
  private Parametrisation gamma;
  private NormalDistribution commonsNormal;
  private GammaDistribution commonsGamma;
  private final double[] normalArgs = {0.3, 1.7};
  private final double[] gammaArgs = {2.5, 1.5};
  private final double[] gradient = new double[3];
  private double x = 0.9;

  @Setup
  public void setUp() {
    normal = Families.lookup("normal").orElseThrow().match(Set.of("mean", "sd")).orElseThrow();
    gamma = Families.lookup("gamma").orElseThrow().match(Set.of("shape", "rate")).orElseThrow();
    commonsNormal = new NormalDistribution(null, 0.3, 1.7);
    commonsGamma = new GammaDistribution(null, 2.5, 1 / 1.5);
  }

  @Benchmark
  public double normalWithGradient() {
    return normal.logDensity(x, normalArgs, gradient) + gradient[2];
  }

  @Benchmark
  public double normalValueOnly() {
    return normal.logDensity(x, normalArgs);
  }

  @Benchmark
  public double baselineCommonsNormalKept() {
    return commonsNormal.logDensity(x);
  }

  @Benchmark
  public double baselineCommonsNormalRebuilt() {
    return new NormalDistribution(null, normalArgs[0], normalArgs[1]).logDensity(x);
  }

  @Benchmark
  public double gammaWithGradient() {
    return gamma.logDensity(x, gammaArgs, gradient) + gradient[2];
  }

  @Benchmark
  public double baselineCommonsGammaKept() {
    return commonsGamma.logDensity(x);
  }

  @Benchmark
  public double baselineCommonsGammaRebuilt() {
    return new GammaDistribution(null, gammaArgs[0], 1 / gammaArgs[1]).logDensity(x);
  }

  @Benchmark
  public double normalTruncationNormaliser() {
    return normal.logProbabilityBetween(0.0, Double.POSITIVE_INFINITY, normalArgs, gradient);
  }
}

package org.hullbound.hull;

import java.util.concurrent.TimeUnit;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.random.Well19937c;
import org.hullbound.sampling.FixedEnvelopeRejection;
import org.hullbound.sampling.Proposal;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;

/**
 * Nanoseconds per draw of adaptive rejection sampling (Gilks and Wild 1992) beside baselines
 * measured in the same run: the JDK normal, commons-math3's gamma, inversion and a fixed envelope
 * for a far normal tail, and a fresh hull per draw as inside a Gibbs sweep.
 *
 * <p>Evaluations per draw are counted by the densities themselves and printed at the end of each
 * trial ("evaluations per draw ..."), so the timed path carries no counting beyond one increment.
 *
 * <p>Run: {@code mvn -B -o -P bench -DskipTests package && java -jar target/benchmarks.jar
 * AdaptiveRejectionBenchmark -f 1 -wi 3 -i 5 -w 1 -r 1}
 */
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.NANOSECONDS)
@State(Scope.Thread)
public class AdaptiveRejectionBenchmark {

  /** Draws made in setup so that the retained hulls are adapted (the goal is stated after 10^5). */
  private static final int ADAPTATION_DRAWS = 100_000;

  private static final double TAIL = 5.0;
  private static final double GAMMA_SHAPE = 2.5;

  private RandomGenerator rng;
  private AdaptiveRejectionSampler normal;
  private AdaptiveRejectionSampler gamma;
  private AdaptiveRejectionSampler tail;
  private GammaDistribution commonsGamma;
  private NormalDistribution standardNormal;
  private double tailStart;
  private double tailWidth;
  private FixedEnvelopeRejection fixedEnvelope;

  private long normalEvaluations;
  private long gammaEvaluations;
  private long tailEvaluations;
  private long[] afterAdaptation;

  private long freshEvaluations;
  private long freshDraws;
  private double freshState;

  @Setup(Level.Trial)
  public void setUp() {
    rng = RandomGeneratorFactory.of("L64X128MixRandom").create(20240611L);
    normal =
        AdaptiveRejectionSampler.withDerivatives(
            x -> {
              normalEvaluations++;
              return new Evaluation(-0.5 * x * x, -x);
            },
            Support.real());
    gamma =
        AdaptiveRejectionSampler.withDerivatives(
            x -> {
              gammaEvaluations++;
              return new Evaluation((GAMMA_SHAPE - 1) * Math.log(x) - x, (GAMMA_SHAPE - 1) / x - 1);
            },
            Support.above(0));
    tail =
        AdaptiveRejectionSampler.withDerivatives(
            x -> {
              tailEvaluations++;
              return new Evaluation(-0.5 * x * x, -x);
            },
            Support.above(TAIL));
    for (int i = 0; i < ADAPTATION_DRAWS; i++) {
      normal.sample(rng);
      gamma.sample(rng);
      tail.sample(rng);
    }
    afterAdaptation = new long[] {normalEvaluations, gammaEvaluations, tailEvaluations};

    // commons-math3 with its default generator (Well19937c), as a caller would construct it
    commonsGamma = new GammaDistribution(new Well19937c(20240611L), GAMMA_SHAPE, 1.0);
    standardNormal = new NormalDistribution(null, 0, 1);
    tailStart = standardNormal.cumulativeProbability(TAIL);
    tailWidth = 1 - tailStart;
    // x > 5 under 5 + Exp(1): log f - log g = -x^2/2 + (x - 5) is largest at x = 5, -12.5
    fixedEnvelope =
        FixedEnvelopeRejection.of(
            x -> -0.5 * x * x,
            TAIL,
            Double.POSITIVE_INFINITY,
            Proposal.exponentialTail(TAIL, 1.0),
            -0.5 * TAIL * TAIL);
    freshState = 0;
  }

  @TearDown(Level.Trial)
  public void report() {
    long draws = ADAPTATION_DRAWS;
    System.out.printf(
        "%nevaluations per draw after %d draws: normal %.5f, gamma %.5f, tail %.5f%n",
        draws,
        afterAdaptation[0] / (double) draws,
        afterAdaptation[1] / (double) draws,
        afterAdaptation[2] / (double) draws);
    report("normal", normal, afterAdaptation[0], normalEvaluations);
    report("gamma", gamma, afterAdaptation[1], gammaEvaluations);
    report("tail", tail, afterAdaptation[2], tailEvaluations);
    if (freshDraws > 0) {
      System.out.printf(
          "evaluations per draw, fresh hull per draw: %.4f over %d draws%n",
          freshEvaluations / (double) freshDraws, freshDraws);
    }
  }

  private static void report(String name, AdaptiveRejectionSampler s, long before, long total) {
    SamplerStatistics stats = s.statistics();
    long measured = stats.draws() - ADAPTATION_DRAWS;
    if (measured > 0) {
      System.out.printf(
          "evaluations per draw during measurement, %s: %.6f over %d draws (hull size %d)%n",
          name, (total - before) / (double) measured, measured, stats.hullSize());
    }
  }

  @Benchmark
  public double standardNormalHull() {
    return normal.sample(rng);
  }

  @Benchmark
  public double standardNormalJdk() {
    return rng.nextGaussian();
  }

  @Benchmark
  public double gammaHull() {
    return gamma.sample(rng);
  }

  @Benchmark
  public double gammaCommonsMath() {
    return commonsGamma.sample();
  }

  @Benchmark
  public double tailHull() {
    return tail.sample(rng);
  }

  /** commons-math3 inverse CDF on (Phi(5), 1); loses digits as 1 - Phi(5) = 2.9e-7 is tiny. */
  @Benchmark
  public double tailInversion() {
    return standardNormal.inverseCumulativeProbability(tailStart + tailWidth * rng.nextDouble());
  }

  @Benchmark
  public double tailFixedEnvelope() {
    return fixedEnvelope.sample(rng);
  }

  /**
   * A new normal density with a random mean every draw, as a Gibbs full conditional; the sampler
   * starts automatically from the previous draw as its guess, with spread 1.
   */
  @Benchmark
  public double freshHullPerDraw() {
    double mean = rng.nextGaussian();
    AdaptiveRejectionSampler fresh =
        AdaptiveRejectionSampler.withDerivatives(
            x -> {
              freshEvaluations++;
              double z = x - mean;
              return new Evaluation(-0.5 * z * z, -z);
            },
            Support.real(),
            HullOptions.defaults().withAutomaticStart(freshState, 1.0));
    freshDraws++;
    freshState = fresh.sample(rng);
    return freshState;
  }
}

package org.hullbound.gibbs;

import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;

/**
 * The cost of blankets that follow an allocation: Gibbs sweeps per second of a two-component
 * normal mixture whose allocations are unknowns ({@code centre[cohort_of[shell]]}, each centre's
 * blanket the shells currently assigned to it, its member list kept up to date as shells move,
 * {@code model.AllocationMembers}) against
 * the same model with the allocation given as data (a fixed-allocation model of the same size,
 * each centre's blanket fixed at binding). The centres have logistic priors, so both models draw
 * them by adaptive rejection from compiled conditionals; the mixture also enumerates each shell's
 * allocation every sweep. The shells are invented: a share 0.4 around 30, the rest around 50, sd
 * 4, from a fixed seed. At tear-down each run prints the sweeps per second of the benchmark
 * thread's CPU time and the ess per sweep of {@code centre[1]}.
 * Run from the project folder: {@code java -jar target/benchmarks.jar MixtureSweepBenchmark -f 1
 * -wi 3 -i 5}; report the ratio unknown / fixed within one run.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
public class MixtureSweepBenchmark {
  private static final int BURN_IN = 200;
  private static final int MAX_KEPT = 50_000;

  @Param({"unknown", "fixed"})
  public String allocation;

  @Param({"1000", "3000", "10000"})
  public int shells;

  private ChainKernel kernel;
  private RandomGenerator rng;
  private SweepRecord record;

  /** The model text: the mixture, or with {@code cohorts} given as data. */
  static String model(double[] lengths, int[] cohorts) {
    StringBuilder values = new StringBuilder();
    StringBuilder groups = new StringBuilder();
    for (int i = 0; i < lengths.length; i++) {
      values.append(i == 0 ? "" : ", ").append(String.format(Locale.ROOT, "%.2f", lengths[i]));
      if (cohorts != null) {
        groups.append(i == 0 ? "" : ", ").append(cohorts[i]);
      }
    }
    return String.join("\n",
        "model shells",
        "index shell = 1 .. " + lengths.length,
        "index cohort = 1 .. 2",
        "data  share[cohort] = [0.4, 0.6]",
        "data  guess[cohort] = [30, 50]",
        "param centre[cohort] ~ logistic(location = guess[cohort], scale = 3)",
        cohorts == null ? "param cohort_of[shell] ~ categorical(p = share)"
            : "data  cohort_of[shell] = [" + groups + "]",
        "data  length[shell] = [" + values + "] ~ normal(mean = centre[cohort_of[shell]],"
            + " sd = 4)",
        "");
  }

  @Setup(Level.Trial)
  public void setUp() {
    RandomGenerator data = RandomGeneratorFactory.of("L64X128MixRandom").create(20261204L);
    double[] lengths = new double[shells];
    int[] cohorts = new int[shells];
    for (int i = 0; i < shells; i++) {
      cohorts[i] = data.nextDouble() < 0.4 ? 1 : 2;
      lengths[i] = (cohorts[i] == 1 ? 30 : 50) + 4 * data.nextGaussian();
    }
    String text = model(lengths, allocation.equals("fixed") ? cohorts : null);
    BoundModel model = BoundModel.bind(Parser.parse(SourceText.of("shells.hbm", text)), List.of());
    ModelSampler gibbs = ModelSampler.withoutMoves(model, Map.of());
    rng = ChainSeeds.split(20261205L, 1)[0];
    kernel = gibbs.sampler().withAdaptation(BURN_IN).newChain(0, rng);
    for (int sweep = 0; sweep < BURN_IN; sweep++) {
      kernel.sweep(rng);
    }
    record = SweepRecord.start(gibbs.labels(), MAX_KEPT);
  }

  @Benchmark
  public double sweep() {
    return record.sweep(kernel, rng);
  }

  @TearDown(Level.Trial)
  public void report() {
    System.out.printf(
        Locale.ROOT,
        "%n[%s allocation, %d shells] sweeps kept %d; ess/sweep centre[1] %.4f;"
            + " sweeps per cpu-second %.1f%n",
        allocation, shells, record.keptDraws(), record.essPerSweep("centre[1]"),
        record.sweepsPerCpuSecond());
  }
}

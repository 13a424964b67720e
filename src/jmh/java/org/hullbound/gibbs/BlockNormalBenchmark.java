package org.hullbound.gibbs;

import java.io.IOException;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.random.RandomGenerator;
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
 * Gibbs sweeps per second on the invented regression demo ({@code models/orchard.hbm}: 60 trees,
 * intercept and three coefficients, two of them correlated 0.95), with the linear-normal block
 * (one joint draw of 4, Rue 2001) side by side with the baseline of one conjugate normal draw per
 * coefficient ({@link ModelSampler#withoutBlocks}). At tear-down each run prints the bulk ess per
 * sweep of {@code beta[1]} and the smallest over all unknowns (one chain, from the sweeps made
 * while measuring), so that ess per second = sweeps per second x ess per sweep. Run from the
 * project folder: {@code java -jar target/benchmarks.jar BlockNormalBenchmark -f 1 -wi 3 -i 5}.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
public class BlockNormalBenchmark {
  private static final int BURN_IN = 500;
  private static final int MAX_KEPT = 100_000;

  @Param({"block", "one-at-a-time"})
  public String update;

  private ChainKernel kernel;
  private RandomGenerator rng;
  private List<String> labels;
  private SweepRecord record;

  @Setup(Level.Trial)
  public void setUp() throws IOException {
    BoundModel model = DemoModel.load("orchard");
    ModelSampler gibbs = update.equals("block")
        ? ModelSampler.of(model, Map.of())
        : ModelSampler.withoutBlocks(model, Map.of());
    labels = gibbs.labels();
    rng = ChainSeeds.split(20261202L, 1)[0];
    kernel = gibbs.sampler().withAdaptation(BURN_IN).newChain(0, rng);
    for (int sweep = 0; sweep < BURN_IN; sweep++) {
      kernel.sweep(rng);
    }
    record = SweepRecord.start(labels, MAX_KEPT);
  }

  @Benchmark
  public double sweep() {
    return record.sweep(kernel, rng);
  }

  @TearDown(Level.Trial)
  public void report() {
    String weakest = record.weakest();
    System.out.printf(
        Locale.ROOT,
        "%n[%s] sweeps kept %d; ess/sweep beta[1] %.4f; min ess/sweep %.4f (%s);"
            + " sweeps per cpu-second %.1f%n",
        update, record.keptDraws(), record.essPerSweep("beta[1]"), record.essPerSweep(weakest), weakest, record.sweepsPerCpuSecond());
  }
}

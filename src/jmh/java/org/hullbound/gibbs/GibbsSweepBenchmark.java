package org.hullbound.gibbs;

import java.io.IOException;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.random.RandomGenerator;
import org.hullbound.diagnostics.PosteriorSummary;
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
 * Gibbs sweeps per second on the bundled logistic random-effects demo ({@code models/clinics.hbm}:
 * 36 clinics, 1200 patients, invented data) and on it grown to 3,600 clinics and 120,000 patients
 * ({@link GrownClinics}), for hullbound's updates (adaptive rejection with warm
 * starts) side by side with slice-within-Gibbs and random-walk-Metropolis-within-Gibbs baselines
 * on the same conditionals.
 *
 * <p>JMH measures sweeps per second; at tear-down each run prints the effective sample size per
 * sweep of {@code effect[1]} and the smallest over all unknowns (bulk ess, one chain, from the
 * sweeps made while measuring), the density evaluations per conditional draw, and the sweeps per
 * second of the benchmark thread's own CPU time (steadier than wall time on a shared machine), so
 * that ess per second = sweeps per second x ess per sweep. Run from the project folder:
 * {@code java -jar target/benchmarks.jar GibbsSweepBenchmark -f 1 -wi 3 -i 5}.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
public class GibbsSweepBenchmark {
  private static final int BURN_IN = 1000;
  private static final int MAX_KEPT = 50_000;

  @Param({"adaptive-rejection", "slice", "random-walk-metropolis"})
  public String sampler;

  /**
   * {@code clinics} (the demo) or {@code clinics-grown} ({@link GrownClinics}: 3,600 clinics,
   * 120,000 patients, with a tenth of the pilot and burn-in sweeps, as each sweep costs a hundred
   * times more).
   */
  @Param({"clinics", "clinics-grown"})
  public String model;

  private ChainKernel kernel;
  private RandomGenerator rng;
  private List<String> labels;
  private SweepRecord record;

  @Setup(Level.Trial)
  public void setUp() throws IOException {
    boolean grown = this.model.equals("clinics-grown");
    BoundModel model = grown ? GrownClinics.load() : DemoModel.load(this.model);
    int shorter = grown ? 10 : 1;
    ModelSampler gibbs = ModelSampler.of(model, Map.of());
    labels = gibbs.labels();
    RandomGenerator[] generators = ChainSeeds.split(20261201L, 2);
    // A pilot run of hullbound's sampler gives each baseline its scale: the slice width w is twice
    // the unknown's posterior sd on its sampling scale, the random walk's first step that sd
    // (then tuned toward 44% acceptance during burn-in).
    GibbsKernel pilot = gibbs.sampler().newChain(0, generators[0]);
    int n = labels.size();
    int pilotBurnIn = 200 / shorter;
    double[][] pilotDraws = new double[n][400 / shorter];
    double[] state = new double[n];
    for (int sweep = 0; sweep < pilotBurnIn + 400 / shorter; sweep++) {
      pilot.sweep(generators[0]);
      if (sweep >= pilotBurnIn) {
        pilot.record(state);
        for (int i = 0; i < n; i++) {
          pilotDraws[i][sweep - pilotBurnIn] = model.conditional(i).toSamplingScale(state[i]);
        }
      }
    }
    double[] sd = new double[n];
    for (int i = 0; i < n; i++) {
      sd[i] = PosteriorSummary.of(labels.get(i), new double[][] {pilotDraws[i]}).sd();
    }
    double[] start = model.initialState();
    rng = generators[1];
    switch (sampler) {
      case "adaptive-rejection":
        kernel = gibbs.sampler().newChain(1, rng);
        break;
      case "slice": {
        double[] widths = Arrays.stream(sd).map(s -> 2 * s).toArray();
        kernel = WithinGibbsBaseline.of(model, WithinGibbsBaseline.Kind.SLICE, start, widths, 0);
        break;
      }
      case "random-walk-metropolis":
        kernel =
            WithinGibbsBaseline.of(
                model, WithinGibbsBaseline.Kind.RANDOM_WALK, start, sd, BURN_IN / shorter);
        break;
      default:
        throw new IllegalArgumentException("sampler must be one of the @Param values, got " + sampler);
    }
    for (int sweep = 0; sweep < BURN_IN / shorter; sweep++) {
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
    double evaluations;
    if (kernel instanceof GibbsKernel gibbs) {
      long evaluationCount = 0;
      long draws = 0;
      for (Updater updater : gibbs.updaters()) {
        evaluationCount += updater.evaluations();
        draws += updater.draws();
      }
      evaluations = (double) evaluationCount / draws;
    } else {
      evaluations = ((WithinGibbsBaseline) kernel).evaluationsPerDraw();
    }
    System.out.printf(
        Locale.ROOT,
        "%n[%s, " + model + "] sweeps kept %d; ess/sweep effect[1] %.4f; min ess/sweep %.4f (%s);"
            + " evaluations per conditional draw %.2f; sweeps per cpu-second %.1f%s%n",
        sampler, record.keptDraws(), record.essPerSweep("effect[1]"), record.essPerSweep(weakest), weakest, evaluations,
        record.sweepsPerCpuSecond(),
        kernel instanceof WithinGibbsBaseline baseline
                && sampler.equals("random-walk-metropolis")
            ? String.format(Locale.ROOT, "; acceptance %.3f", baseline.acceptanceRate())
            : "");
  }
}

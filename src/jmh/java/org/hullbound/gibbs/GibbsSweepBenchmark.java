package org.hullbound.gibbs;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.random.RandomGenerator;
import org.hullbound.anchor.AnchorKernel;
import org.hullbound.anchor.NoUTurnSampler;
import org.hullbound.anchor.NoUTurnStatistics;
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
 * Effective draws per CPU-second of five samplers on the same compiled model, side by side in one
 * run (issue 12): hullbound's Gibbs driver with its moves along lines and without them ({@code
 * --no-moves}), slice within Gibbs, random-walk Metropolis within Gibbs, and the No-U-Turn sampler
 * ({@code org.hullbound.anchor}, the gradient-based sampler a practitioner would pick instead), on
 * the logistic random-effects demo {@code clinics} (36 clinics, 1200 patients), {@code seedlings}
 * (binomial, 8 benches), the uncentred dose-response demo {@code extract} and {@code clinics} grown
 * to 3,600 clinics and 120,000 patients ({@link GrownClinics}); all invented data.
 *
 * <p>JMH measures sweeps per second (for the No-U-Turn sampler an iteration is a sweep); at
 * tear-down each run prints, and appends to a CSV file ({@code target/sweep-comparison.csv}, or
 * {@code -Dhullbound.comparison=FILE}), the bulk ess per sweep of the model's named unknown and of
 * its weakest (one chain, the sweeps made while JMH warmed up and measured), the sweeps per second
 * of the benchmark thread's CPU time (steadier than wall time on a shared machine) and their
 * products, effective draws per CPU-second. Gibbs runs add the density evaluations per
 * conditional draw; the No-U-Turn sampler its gradients per iteration, divergent iterations, step
 * size and what one gradient costs in passes over the model's terms (the joint's value plus every
 * conditional, {@code org.hullbound.anchor.ModelTarget}). {@code -p sampler=no-u-turn-fused} (not
 * in the default list; {@code clinics} and {@code clinics-grown} only) runs the anchor on the
 * hand-fused target, {@code org.hullbound.anchor.FusedClinicsTarget}. Run from the project
 * folder: {@code java -jar target/benchmarks.jar GibbsSweepBenchmark -f 1 -wi 3 -i 5 -w 5s -r
 * 5s}; the grown model needs longer iterations for the anchor (docs/fit.md).
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
public class GibbsSweepBenchmark {
  private static final int BURN_IN = 1000;
  private static final int MAX_KEPT = 50_000;
  /** The named unknown of each model, besides the weakest. */
  private static final Map<String, String> NAMED = Map.of(
      "clinics", "effect[1]", "clinics-grown", "effect[1]", "seedlings", "effect[1]",
      "extract", "slope");

  @Param({"hullbound", "hullbound-no-moves", "slice", "random-walk-metropolis", "no-u-turn"})
  public String sampler;

  /**
   * A bundled demo ({@code models/NAME.hbm} with its data) or {@code clinics-grown} (a tenth of the
   * pilot and burn-in sweeps, as each sweep costs a hundred times more; the anchor's warm-up 150
   * iterations, the shortest with the full schedule of windows, unless {@code
   * -Dhullbound.anchorWarmup=N} says otherwise).
   */
  @Param({"clinics", "seedlings", "extract", "clinics-grown"})
  public String model;

  private BoundModel bound;
  private ChainKernel kernel;
  private RandomGenerator rng;
  private List<String> labels;
  private SweepRecord record;

  @Setup(Level.Trial)
  public void setUp() throws IOException {
    boolean grown = this.model.equals("clinics-grown");
    LoadedModel loaded = LoadedModel.load(this.model);
    bound = loaded.bound();
    int shorter = grown ? 10 : 1;
    int burnIn = BURN_IN / shorter;
    ModelSampler gibbs = ModelSampler.of(bound, Map.of());
    labels = gibbs.labels();
    RandomGenerator[] generators = ChainSeeds.split(20261201L, 2);
    rng = generators[1];
    double[] start = bound.initialState();
    switch (sampler) {
      case "hullbound" -> kernel = gibbs.sampler().withAdaptation(burnIn).newChain(1, rng);
      case "hullbound-no-moves" -> kernel = ModelSampler.withoutMoves(bound, Map.of()).sampler()
          .withAdaptation(burnIn).newChain(1, rng);
      case "slice" -> {
        double[] widths = Arrays.stream(pilotSds(gibbs, generators[0], shorter))
            .map(s -> 2 * s).toArray();
        kernel = WithinGibbsBaseline.of(bound, WithinGibbsBaseline.Kind.SLICE, start, widths, 0);
      }
      case "random-walk-metropolis" -> kernel = WithinGibbsBaseline.of(bound,
          WithinGibbsBaseline.Kind.RANDOM_WALK, start, pilotSds(gibbs, generators[0], shorter),
          burnIn);
      case "no-u-turn" -> {
        burnIn = Integer.getInteger("hullbound.anchorWarmup", grown ? 150 : BURN_IN);
        kernel = AnchorKernel.of(bound, start, NoUTurnSampler.Settings.of(burnIn));
      }
      case "no-u-turn-fused" -> {
        burnIn = Integer.getInteger("hullbound.anchorWarmup", grown ? 150 : BURN_IN);
        kernel = AnchorKernel.of(bound, loaded.fusedClinics(), start,
            NoUTurnSampler.Settings.of(burnIn));
      }
      default ->
          throw new IllegalArgumentException("sampler must be one of the @Param values, got " + sampler);
    }
    for (int sweep = 0; sweep < burnIn; sweep++) {
      kernel.sweep(rng);
    }
    record = SweepRecord.start(labels, MAX_KEPT);
  }

  /**
   * A pilot run of hullbound's sampler gives each within-Gibbs baseline its scale: the slice width
   * w is twice the unknown's posterior sd on its sampling scale, the random walk's first step that
   * sd (then tuned toward 44% acceptance during burn-in).
   */
  private double[] pilotSds(ModelSampler gibbs, RandomGenerator pilotRng, int shorter) {
    GibbsKernel pilot = gibbs.sampler().newChain(0, pilotRng);
    int n = labels.size();
    int pilotBurnIn = 200 / shorter;
    double[][] pilotDraws = new double[n][400 / shorter];
    double[] state = new double[n];
    for (int sweep = 0; sweep < pilotBurnIn + 400 / shorter; sweep++) {
      pilot.sweep(pilotRng);
      if (sweep >= pilotBurnIn) {
        pilot.record(state);
        for (int i = 0; i < n; i++) {
          pilotDraws[i][sweep - pilotBurnIn] = bound.conditional(i).toSamplingScale(state[i]);
        }
      }
    }
    double[] sd = new double[n];
    for (int i = 0; i < n; i++) {
      sd[i] = PosteriorSummary.of(labels.get(i), new double[][] {pilotDraws[i]}).sd();
    }
    return sd;
  }

  @Benchmark
  public double sweep() {
    return record.sweep(kernel, rng);
  }

  @TearDown(Level.Trial)
  public void report() throws IOException {
    if (record.keptDraws() < PosteriorSummary.MINIMUM_DRAWS_PER_CHAIN) {
      System.out.printf(Locale.ROOT, "%n[%s, %s] %d sweeps kept: too few for an ess; run longer"
          + " iterations (-r)%n", sampler, model, record.keptDraws());
      return;
    }
    String weakest = record.weakest();
    String named = NAMED.get(model);
    double sweepsPerSecond = record.sweepsPerCpuSecond();
    double essNamed = record.essPerSweep(named);
    double essWeakest = record.essPerSweep(weakest);
    String cost = cost();
    System.out.printf(Locale.ROOT,
        "%n[%s, %s] sweeps kept %d; sweeps per cpu-second %.2f; ess/sweep %s %.4f, weakest %s"
            + " %.4f; ess per cpu-second %s %.2f, weakest %.2f; %s%n",
        sampler, model, record.keptDraws(), sweepsPerSecond, named, essNamed, weakest, essWeakest,
        named, essNamed * sweepsPerSecond, essWeakest * sweepsPerSecond, cost);
    Path out = Path.of(System.getProperty("hullbound.comparison", "target/sweep-comparison.csv"));
    if (out.getParent() != null) {
      Files.createDirectories(out.getParent());
    }
    if (!Files.exists(out)) {
      Files.writeString(out, "model,sampler,sweeps_kept,sweeps_per_cpu_second,named,"
          + "ess_per_sweep_named,weakest,ess_per_sweep_weakest,ess_per_cpu_second_named,"
          + "ess_per_cpu_second_weakest,cost\n", StandardCharsets.UTF_8);
    }
    Files.writeString(out, String.format(Locale.ROOT,
        "%s,%s,%d,%.3f,%s,%.5f,%s,%.5f,%.3f,%.3f,\"%s\"%n", model, sampler, record.keptDraws(),
        sweepsPerSecond, named, essNamed, weakest, essWeakest, essNamed * sweepsPerSecond,
        essWeakest * sweepsPerSecond, cost), StandardCharsets.UTF_8, StandardOpenOption.APPEND);
  }

  /** What a sweep cost besides time: evaluations, or the anchor's gradients and their price. */
  private String cost() {
    if (kernel instanceof AnchorKernel anchor) {
      NoUTurnStatistics statistics = anchor.statistics();
      long conditionalTerms = 0;
      for (int i = 0; i < labels.size(); i++) {
        conditionalTerms += bound.conditional(i).termCount();
      }
      String price = sampler.equals("no-u-turn-fused")
          ? "each gradient one fused pass over (clinic, dose) groups"
          : String.format(Locale.ROOT, "terms per gradient %.2f passes over the joint",
              (double) (bound.termCount() + conditionalTerms) / bound.termCount());
      return String.format(Locale.ROOT,
          "gradients per iteration %.2f; mean depth %.2f; divergent iterations %d; step size %.4g;"
              + " %s",
          statistics.gradientsPerIteration(), statistics.meanDepth(), statistics.divergences(),
          statistics.stepSize(), price);
    }
    if (kernel instanceof GibbsKernel gibbs) {
      long evaluations = 0;
      long draws = 0;
      for (Updater updater : gibbs.updaters()) {
        evaluations += updater.evaluations();
        draws += updater.draws();
      }
      return String.format(Locale.ROOT, "evaluations per conditional draw %.2f",
          (double) evaluations / draws);
    }
    WithinGibbsBaseline baseline = (WithinGibbsBaseline) kernel;
    return String.format(Locale.ROOT, "evaluations per conditional draw %.2f%s",
        baseline.evaluationsPerDraw(), sampler.equals("random-walk-metropolis")
            ? String.format(Locale.ROOT, "; acceptance %.3f", baseline.acceptanceRate()) : "");
  }
}

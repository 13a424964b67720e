package org.hullbound.gibbs;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.random.RandomGenerator;
import org.hullbound.anchor.AnchorKernel;
import org.hullbound.anchor.NoUTurnSampler;
import org.hullbound.model.BoundModel;

/**
 * The comparison of {@link GibbsSweepBenchmark} against the No-U-Turn anchor where the anchor's
 * warm-up is too long for a JMH trial (grown {@code clinics}: each iteration is a trajectory of up
 * to 2^10 gradients of four passes over 120,000 terms). One chain of each sampler from the model's
 * initial state, in one thread, timed by the thread's CPU clock in two phases: the anchor's full
 * warm-up with its adaptation (dual averaging of the step size, windows of the diagonal mass
 * matrix; nothing shortened or tuned from outside), then its sampling phase; hullbound's burn-in
 * (where its direction blocks learn), then its sweeps. It prints the step size and the gradients
 * per iteration every tenth warm-up iteration, so that one sees where the adaptation settles, and
 * for each sampler the effective draws of the weakest unknown per CPU-second of the sampling phase
 * alone and with the warm-up counted. Not a JMH benchmark: no forks, no JIT warm-up iterations;
 * the phases are long enough (minutes) for that to matter little, and the same for both.
 *
 * <pre>
 * java -cp target/benchmarks.jar org.hullbound.gibbs.AnchorPhases clinics-grown 150 200 100 400
 * </pre>
 *
 * <p>Arguments (all optional): model ({@code clinics-grown} or a demo name), the anchor's warm-up
 * iterations (150, the shortest with its full schedule of windows) and kept iterations (200),
 * hullbound's burn-in (100) and kept sweeps (400), and the anchor's target: {@code model} (the
 * default, {@code org.hullbound.anchor.ModelTarget}) or {@code fused} ({@code
 * org.hullbound.anchor.FusedClinicsTarget}, the same density with a practitioner's one-pass
 * gradient; {@code clinics} and {@code clinics-grown} only), such as
 *
 * <pre>
 * java -cp target/benchmarks.jar org.hullbound.gibbs.AnchorPhases \
 *     clinics-grown 150 200 100 400 fused
 * </pre>
 *
 * Both targets start from the same state with the same random stream.
 */
public final class AnchorPhases {
  private AnchorPhases() {}

  public static void main(String[] args) throws IOException {
    String model = args.length > 0 ? args[0] : "clinics-grown";
    int warmup = args.length > 1 ? Integer.parseInt(args[1]) : 150;
    int iterations = args.length > 2 ? Integer.parseInt(args[2]) : 200;
    int burnIn = args.length > 3 ? Integer.parseInt(args[3]) : 100;
    int sweeps = args.length > 4 ? Integer.parseInt(args[4]) : 400;
    String target = args.length > 5 ? args[5] : "model";
    LoadedModel loaded = LoadedModel.load(model);
    BoundModel bound = loaded.bound();
    ModelSampler gibbs = ModelSampler.of(bound, Map.of());
    List<String> labels = gibbs.labels();

    RandomGenerator rng = ChainSeeds.split(20261201L, 2)[1];
    NoUTurnSampler.Settings settings = NoUTurnSampler.Settings.of(warmup);
    AnchorKernel anchor = switch (target) {
      case "model" -> AnchorKernel.of(bound, bound.initialState(), settings);
      case "fused" ->
          AnchorKernel.of(bound, loaded.fusedClinics(), bound.initialState(), settings);
      default -> throw new IllegalArgumentException("target must be model or fused, got " + target);
    };
    System.out.printf(Locale.ROOT, "anchor target: %s%n", target);
    double start = cpuSeconds();
    long gradients = 0;
    for (int k = 1; k <= warmup; k++) {
      anchor.sweep(rng);
      if (k % 10 == 0 || k == warmup) {
        long now = anchor.gradientsSoFar();
        System.out.printf(Locale.ROOT, "anchor warm-up %d/%d: %.1f cpu-s, step size %.4g,"
                + " gradients per iteration in the last %d %.1f%n", k, warmup, cpuSeconds() - start,
            anchor.stepSize(), k % 10 == 0 ? 10 : k % 10,
            (double) (now - gradients) / (k % 10 == 0 ? 10 : k % 10));
        gradients = now;
      }
    }
    String name = target.equals("fused") ? "no-u-turn-fused" : "no-u-turn";
    Phase anchorPhase = sample(name, anchor, rng, cpuSeconds() - start, iterations, labels);
    System.out.printf(Locale.ROOT, "anchor after warm-up: gradients per iteration %.2f, mean depth"
            + " %.2f, divergent iterations %d, step size %.4g%n",
        anchor.statistics().gradientsPerIteration(), anchor.statistics().meanDepth(),
        anchor.statistics().divergences(), anchor.statistics().stepSize());

    rng = ChainSeeds.split(20261201L, 2)[1];
    GibbsKernel hullbound = gibbs.sampler().withAdaptation(burnIn).newChain(1, rng);
    start = cpuSeconds();
    for (int k = 0; k < burnIn; k++) {
      hullbound.sweep(rng);
    }
    Phase gibbsPhase = sample("hullbound", hullbound, rng, cpuSeconds() - start, sweeps, labels);
    System.out.printf(Locale.ROOT, "%s: hullbound / anchor, effective draws of the weakest unknown"
            + " per cpu-second: %.2fx sampling only, %.2fx with warm-up counted%n", model,
        gibbsPhase.samplingOnly() / anchorPhase.samplingOnly(),
        gibbsPhase.withWarmup() / anchorPhase.withWarmup());
  }

  /** The effective draws of the weakest unknown per CPU-second, without and with the warm-up. */
  private record Phase(double samplingOnly, double withWarmup) {}

  private static Phase sample(String name, ChainKernel kernel, RandomGenerator rng,
      double warmupSeconds, int count, List<String> labels) {
    double start = cpuSeconds();
    SweepRecord record = SweepRecord.start(labels, count);
    for (int k = 0; k < count; k++) {
      record.sweep(kernel, rng);
    }
    double seconds = cpuSeconds() - start;
    String weakest = record.weakest();
    double effective = record.essPerSweep(weakest) * count;
    Phase phase = new Phase(effective / seconds, effective / (seconds + warmupSeconds));
    System.out.printf(Locale.ROOT, "[%s] warm-up %.1f cpu-s; %d kept in %.1f cpu-s; weakest %s,"
            + " ess per kept %.4f; effective draws per cpu-second %.3f sampling only, %.3f with"
            + " warm-up counted%n", name, warmupSeconds, count, seconds, weakest,
        effective / count, phase.samplingOnly(), phase.withWarmup());
    return phase;
  }

  private static double cpuSeconds() {
    return ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime() / 1e9;
  }
}

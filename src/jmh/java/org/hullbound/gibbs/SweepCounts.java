package org.hullbound.gibbs;

import java.io.IOException;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.random.RandomGenerator;
import org.hullbound.model.BoundModel;
import org.hullbound.model.EvaluationCounts;
import org.hullbound.model.Update;

/**
 * What a sweep of hullbound's Gibbs driver evaluates, counted rather than timed (issue 12): per kind
 * of updater, the draws and conditional (or line) evaluations a sweep makes and the terms or
 * groups of rows of one linear predictor those evaluations sum, each group one {@code exp} and one
 * {@code log} for a logit Bernoulli or binomial. The counts do not depend on the machine's load,
 * so they measure a change of the sweep on a busy machine where sweeps per second cannot; the
 * sweeps per CPU-second and the weakest unknown's ess per sweep it also prints are rough checks
 * only (one chain, one thread, no JMH).
 *
 * <pre>
 * java -cp target/benchmarks.jar org.hullbound.gibbs.SweepCounts clinics-grown 100 200
 * </pre>
 *
 * <p>Arguments: model ({@code clinics-grown} or a demo name), burn-in sweeps (the direction
 * blocks learn there), counted sweeps. The chain is the benchmark's (seed 20261201, second
 * stream).
 */
public final class SweepCounts {
  private SweepCounts() {}

  public static void main(String[] args) throws IOException {
    String model = args.length > 0 ? args[0] : "clinics-grown";
    int burnIn = args.length > 1 ? Integer.parseInt(args[1]) : 100;
    int sweeps = args.length > 2 ? Integer.parseInt(args[2]) : 200;
    BoundModel bound = model.equals("clinics-grown") ? GrownClinics.load() : DemoModel.load(model);
    ModelSampler gibbs = ModelSampler.of(bound, Map.of());
    RandomGenerator rng = ChainSeeds.split(20261201L, 2)[1];
    GibbsKernel kernel = gibbs.sampler().withAdaptation(burnIn).newChain(1, rng);
    for (int sweep = 0; sweep < burnIn; sweep++) {
      kernel.sweep(rng);
    }
    List<Updater> updaters = kernel.updaters();
    List<Update> moves = bound.moves();
    int firstMove = updaters.size() - moves.size();
    long[] drawsBefore = new long[updaters.size()];
    long[] evaluationsBefore = new long[updaters.size()];
    for (int k = 0; k < updaters.size(); k++) {
      drawsBefore[k] = updaters.get(k).draws();
      evaluationsBefore[k] = updaters.get(k).evaluations();
    }
    SweepRecord record = SweepRecord.start(gibbs.labels(), sweeps);
    for (int sweep = 0; sweep < sweeps; sweep++) {
      record.sweep(kernel, rng);
    }
    double perCpuSecond = record.sweepsPerCpuSecond();
    Map<String, double[]> byKind = new LinkedHashMap<>();
    for (int k = 0; k < updaters.size(); k++) {
      Updater updater = updaters.get(k);
      long draws = updater.draws() - drawsBefore[k];
      long evaluations = updater.evaluations() - evaluationsBefore[k];
      String kind;
      int perCall;
      if (k >= firstMove) {
        Update move = moves.get(k - firstMove);
        kind = EvaluationCounts.kindOf(move);
        perCall = EvaluationCounts.ofMove(move);
      } else {
        int index = updater.indices()[0];
        String label = gibbs.labels().get(index);
        kind = updater.method() + " " + label.replaceAll("\\[.*", "[]");
        perCall = updater.indices().length == 1 && evaluations > 0
            ? EvaluationCounts.ofConditional(bound, index) : 0;
      }
      double[] sums = byKind.computeIfAbsent(kind, x -> new double[4]);
      sums[0] += (double) draws / sweeps;
      sums[1] += (double) evaluations / sweeps;
      sums[2] += (double) evaluations * perCall / sweeps;
      sums[3]++;
    }
    System.out.printf(Locale.ROOT, "%s, %d sweeps after %d of burn-in%n", model, sweeps, burnIn);
    System.out.printf(Locale.ROOT, "%-44s %8s %10s %12s %10s %16s%n", "updater kind", "updaters",
        "draws/sw", "evals/sw", "evals/draw", "groups/sweep");
    double total = 0;
    double evaluations = 0;
    for (Map.Entry<String, double[]> e : byKind.entrySet()) {
      double[] s = e.getValue();
      System.out.printf(Locale.ROOT, "%-44s %8d %10.1f %12.1f %10.3f %16.0f%n", e.getKey(),
          (long) s[3], s[0], s[1], s[0] == 0 ? 0 : s[1] / s[0], s[2]);
      total += s[2];
      evaluations += s[1];
    }
    System.out.printf(Locale.ROOT, "%-44s %8s %10s %12.1f %10s %16.0f%n", "all", "", "",
        evaluations, "", total);
    String weakest = record.weakest();
    System.out.printf(Locale.ROOT,
        "rough: %.2f sweeps per cpu-second; weakest %s ess/sweep %.3f (one chain of %d)%n",
        perCpuSecond, weakest, record.essPerSweep(weakest), sweeps);
  }
}

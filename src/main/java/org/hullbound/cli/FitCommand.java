package org.hullbound.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.hullbound.report.PredictiveChecks;
import org.hullbound.app.RunRefusedException;
import org.hullbound.app.FitRequest;
import org.hullbound.app.FitResult;
import org.hullbound.app.FitRun;
import org.hullbound.app.ProbabilitySection;
import org.hullbound.app.PredictiveOptions;
import org.hullbound.gibbs.MemoryBudget;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.io.CheckpointFile;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/**
 * {@code hullbound fit MODEL [--data FILE]...}: binds a model to its data, runs parallel Gibbs
 * chains, streams every draw to {@code draws.csv}, and prints the posterior summary with the
 * update each unknown got, its cost in density evaluations, and plain-language verdicts.
 *
 * <p>Thin by design: {@link FitRun} does the run (checks, folder lock, chains, files); this class
 * turns options into a request, shows progress on standard error and prints the result; {@link
 * SignalStop} turns Ctrl-C and SIGTERM into a stop request. Failures are typed exceptions that
 * {@link ErrorReporting} turns into messages and exit codes (0 done, 1 sampling failure, 2 usage,
 * model or data error). Before sampling the run refuses to write over an earlier run without
 * {@code --overwrite}, to share its folder with another run, and to keep draws that would not fit
 * the heap ({@link MemoryBudget}).
 */
@Command(
    name = "fit",
    mixinStandardHelpOptions = true,
    sortOptions = false,
    description = {
      "Fit a model by Gibbs sampling, one exact or adaptive-rejection update per unknown.",
      "Chains run in parallel; draws stream to DIR/draws.csv, the summary goes to"
          + " DIR/summary.csv and a self-contained page to DIR/report.html."
    })
public final class FitCommand implements Callable<Integer> {

  @Mixin ModelOptions model;

  @Mixin SweepOptions sweeps;

  @Mixin SeedOption seed;

  @Mixin OutputFolder out;

  @Option(
      names = "--init",
      paramLabel = "FILE",
      description = "Starting values: a CSV of name,value rows (natural scale); others start"
          + " dispersed.")
  Path initFile;

  @Option(
      names = "--threads",
      paramLabel = "N",
      description = "Worker threads (default: chains, at most the processors).")
  Integer threads;

  @Option(names = "--quiet", description = "No progress display.")
  boolean quiet;

  @Option(
      names = "--resume",
      paramLabel = "DIR",
      description = "Continue the interrupted run whose files are in DIR (its checkpoint.txt):"
          + " same draws as if never stopped.")
  Path resumeFolder;

  @Option(
      names = "--overwrite",
      description = "Replace the files of an earlier run in DIR (without it, fit refuses to"
          + " start).")
  boolean overwrite;

  @Mixin LevelOption level;

  @Mixin ProbabilityOption probability;

  @Option(
      names = "--replicate-checks",
      description = "Posterior predictive checks: replicate every modelled data name from each"
          + " kept sweep and report p-values (DIR/predictive_checks.csv, the report, the"
          + " terminal).")
  boolean replicateChecks;

  @Option(
      names = "--keep-replicates",
      description = "With the checks, also write every replicated data set to DIR/replicates.csv"
          + " (can be far larger than draws.csv).")
  boolean keepReplicates;

  @Option(
      names = "--no-moves",
      description = "Leave out the moves along lines that check lists (shift, rescale, direction"
          + " blocks): one unknown at a time only, for comparisons.")
  boolean noMoves;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() {
    // first, so that a signal while reading or compiling finds the hook (see SignalStop)
    try (SignalStop signals = SignalStop.install(spec.commandLine().getErr())) {
      return fit(signals);
    }
  }

  private Integer fit(SignalStop signals) {
    PrintWriter stdout = spec.commandLine().getOut();
    PrintWriter stderr = spec.commandLine().getErr();
    try (FitRun run =
        FitRun.prepare(
            request(), PredictiveOptions.of(replicateChecks, keepReplicates), signals.startup())) {
      for (String note : run.notes()) {
        stderr.println("hullbound fit: " + note);
      }
      stderr.flush();
      StopSignal stop = StopSignal.create();
      if (!signals.beginSampling(stop)) {
        return ErrorReporting.FAILURE; // the JVM is ending with the signal's status
      }
      RunSettings settings = run.settings();
      ProgressDisplay display =
          ProgressDisplay.of(stderr, System.console() != null, settings.chains());
      ProgressListener listener = quiet ? ProgressListener.none() : display;
      if (!quiet) {
        stderr.printf(
            "fit %s: %d unknowns, %d chains of %d burn-in + %d draws%s, seed %d%n",
            run.modelName(), run.unknownCount(), settings.chains(), settings.burnIn(),
            settings.draws(), settings.thin() > 1 ? " thinned by " + settings.thin() : "",
            settings.seed());
        if (run.resuming()) {
          stderr.printf("resuming from %s%n", CheckpointFile.in(run.folder()));
        }
        stderr.flush();
      }
      // Expanded once, before sampling: a statement that is malformed or names no column costs
      // no draw; estimated once from the kept draws, before the page is rendered once.
      List<ProbabilityOption.Statement> statements =
          probability.given() ? probability.expand(run.columns()) : List.of();
      List<List<ProbabilityOption.Estimate>> estimated = new ArrayList<>();
      ProbabilitySection section = statements.isEmpty()
          ? ProbabilitySection.none()
          : draws -> {
              List<ProbabilityOption.Estimate> estimates =
                  ProbabilityOption.estimate(statements, draws);
              estimated.add(estimates);
              return ProbabilityOption.table(estimates);
            };
      FitResult result;
      try {
        result = run.run(listener, stop, section);
      } finally {
        display.finish();
      }
      print(result, stdout, stderr);
      if (!estimated.isEmpty()) {
        List<ProbabilityOption.Estimate> estimates = estimated.get(0);
        stdout.print(ProbabilityOption.text(estimates));
        stdout.println("probabilities: " + ProbabilityOption.write(result.folder(), estimates));
        stdout.flush();
      }
      if (result.stoppedEarly()) {
        printHowToResume(result.folder(), stdout);
      }
      return 0;
    }
  }

  /** The options as the application layer takes them: an option not given is null. */
  private FitRequest request() {
    CommandLine.ParseResult given = spec.commandLine().getParseResult();
    if (level.problem() != null) {
      throw new RunRefusedException(level.problem());
    }
    return new FitRequest(
        model.inputs(), initFile,
        given.hasMatchedOption("--chains") ? sweeps.chains : null,
        given.hasMatchedOption("--burn-in") ? sweeps.burnIn : null,
        given.hasMatchedOption("--draws") ? sweeps.draws : null,
        given.hasMatchedOption("--thin") ? sweeps.thin : null,
        seed.given(), threads, out.given(), resumeFolder, overwrite, level.value())
        .withMoves(!noMoves);
  }

  private void printHowToResume(Path folder, PrintWriter stdout) {
    StringBuilder command = new StringBuilder("hullbound fit ").append(model.modelFile);
    for (Path file : model.dataFiles) {
      command.append(" --data ").append(file);
    }
    command.append(" --resume ").append(folder);
    stdout.println("checkpoint: " + CheckpointFile.in(folder));
    stdout.println("to continue this run with the draws it would have made: " + command);
    stdout.flush();
  }

  /** Chains as the user counts them, from 1: "chains 1, 2". */
  private static String chainNames(int[] chains) {
    StringBuilder names = new StringBuilder(chains.length == 1 ? "chain " : "chains ");
    for (int i = 0; i < chains.length; i++) {
      names.append(i == 0 ? "" : ", ").append(chains[i] + 1);
    }
    return names.toString();
  }

  private static void print(FitResult result, PrintWriter stdout, PrintWriter stderr) {
    RunSettings settings = result.settings();
    int kept = result.keptDraws();
    int[] summarised = result.summarisedChains();
    if (result.stoppedEarly()) {
      stderr.printf(
          "hullbound fit: stopped early; the summary uses the first %d draws of each chain"
              + " (draws.csv keeps every draw)%n",
          kept);
      if (kept > 0 && summarised.length < settings.chains()) {
        stderr.printf(
            "hullbound fit: the summary covers the %d of %d chains that kept draws (%s); the"
                + " others had not started%n",
            summarised.length, settings.chains(), chainNames(summarised));
      }
      stderr.flush();
    }
    if (result.summary().isEmpty()) {
      stdout.println("No draws were kept, so there is no summary.");
      stdout.println("draws:  " + result.drawsFile());
      stdout.println("report: " + result.reportFile());
      stdout.flush();
      return;
    }
    FitResult.Summary summary = result.summary().get();
    stdout.print(summary.table().text());
    stdout.println();
    for (String line : summary.verdicts().lines()) {
      stdout.println(line);
    }
    if (!summary.checks().isEmpty()) {
      stdout.println();
      stdout.print(summary.checks().text());
    }
    for (String note : result.switchNotes()) {
      stdout.println("switched: " + note);
    }
    long imputed = result.imputed();
    if (imputed > 0) {
      stdout.println(imputed + " missing observation" + (imputed == 1 ? " was" : "s were")
          + " imputed; their rows are marked 'imputed'.");
    }
    stdout.println();
    stdout.printf("seed %d (give --seed %d with --chains %d to repeat these draws)%n",
        settings.seed(), settings.seed(), settings.chains());
    stdout.println("draws:   " + result.drawsFile());
    stdout.println("summary: " + summary.file());
    if (!summary.checks().isEmpty()) {
      stdout.println("checks:  " + summary.file().resolveSibling(PredictiveChecks.FILE_NAME));
    }
    stdout.println("report:  " + result.reportFile());
    stdout.flush();
  }
}

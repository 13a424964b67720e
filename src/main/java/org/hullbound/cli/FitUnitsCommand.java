package org.hullbound.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.hullbound.app.BatchRequest;
import org.hullbound.app.BatchResult;
import org.hullbound.app.BatchRun;
import org.hullbound.app.BatchUnits;
import org.hullbound.app.ModelInputs;
import org.hullbound.app.TaskEngine;
import org.hullbound.app.UnitData;
import org.hullbound.app.UnitOutcome;
import org.hullbound.gibbs.StopSignal;
import picocli.CommandLine;
import picocli.CommandLine.ArgGroup;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/**
 * {@code hullbound fit-units MODEL (--units DIR | --unit-column NAME --data FILE...)}: one model
 * fitted to each unit's data, unit by unit with seeds derived from the run's seed and the unit's
 * name, on the local cores or on Spark; writes one summary over all units and one row per unit.
 *
 * <p>Thin: {@link BatchUnits} reads the units, {@link BatchRun} checks, runs and writes; this class
 * turns options into a request, shows progress and prints the outcome, and hands the batch's stop
 * to {@link SignalStop}, so that Ctrl-C or SIGTERM ends it with the finished units kept. Exit 0
 * when every unit was fitted, 1 when one or more failed (each has its row and error) or the batch
 * could not go on, 2 for a usage or model error, the signal's status after a signal.
 */
@Command(
    name = "fit-units",
    mixinStandardHelpOptions = true,
    sortOptions = false,
    description = {
      "Fit one model to many units' data sets, each unit alone, side by side.",
      "Units come from a folder with one subfolder of CSV files per unit",
      "(--units), or from data files with a column naming each row's unit",
      "(--unit-column). Each unit's seed comes from --seed and its name, so",
      "'fit' on that unit alone with that seed repeats it. DIR/summary.csv holds",
      "every unit's summary, DIR/units.csv each unit's seed, status and verdict;",
      "a unit's rows are written as it finishes, so a stopped batch keeps them",
      "and --resume DIR fits the rest."
    })
public final class FitUnitsCommand implements Callable<Integer> {

  @Mixin ModelOptions model;

  @ArgGroup(exclusive = true, multiplicity = "1")
  UnitForm form;

  /** Exactly one way of naming the units. */
  static final class UnitForm {
    @Option(
        names = "--units",
        paramLabel = "DIR",
        description = "A folder with one subfolder per unit, named as the unit, holding its CSV"
            + " files; --data files are shared by every unit.")
    Path folder;

    @Option(
        names = "--unit-column",
        paramLabel = "NAME",
        description = "The column of the --data files that names each row's unit; files without"
            + " it are shared by every unit.")
    String column;
  }

  @Mixin SweepOptions sweeps;

  @Mixin SeedOption seed;

  @Mixin OutputFolder out;

  @Mixin LevelOption level;

  @Mixin EngineOptions engine;

  @Option(
      names = "--keep-draws",
      description = "Keep each unit's folder DIR/units/<unit>: its draws, summary, report and the"
          + " model and data it was fitted to.")
  boolean keepDraws;

  @Option(
      names = "--overwrite",
      description = "Replace the files of an earlier batch in DIR (without it, fit-units refuses"
          + " to start).")
  boolean overwrite;

  @Option(names = "--quiet", description = "No progress display.")
  boolean quiet;

  @Option(
      names = "--resume",
      paramLabel = "DIR",
      description = "Continue the stopped batch whose files are in DIR: the units without their"
          + " row in DIR/units.csv are fitted, with the batch's seed and settings; give the model"
          + " and units as before.")
  Path resumeFolder;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() {
    // first, so that a signal while the units are read finds the hook (see SignalStop)
    try (SignalStop signals = SignalStop.install(spec.commandLine().getErr(), "fit-units",
        "stopped by a signal before any unit began; no file was written")) {
      return fitUnits(signals);
    }
  }

  private Integer fitUnits(SignalStop signals) {
    PrintWriter stdout = spec.commandLine().getOut();
    PrintWriter stderr = spec.commandLine().getErr();
    String problem = level.problem() != null ? level.problem() : engine.problem();
    if (problem != null) {
      return ErrorReporting.userError(spec.commandLine(), problem);
    }
    ModelInputs inputs = model.inputs();
    List<UnitData> units =
        form.folder != null
            ? BatchUnits.fromFolder(form.folder, inputs.dataFiles())
            : BatchUnits.byColumn(inputs.dataFiles(), form.column);
    BatchResult result;
    try (BatchRun run = BatchRun.prepare(request(inputs, units), signals.startup());
        TaskEngine tasks = engine.open()) {
      StopSignal stop = StopSignal.create();
      if (!signals.beginSampling(stop)) {
        return ErrorReporting.FAILURE; // the JVM is ending with the signal's status
      }
      stderr.printf(
          "hullbound fit-units: %d units of %s, seed %d, on %s%n",
          run.unitCount(), run.modelName(), run.seed(), tasks.description());
      if (run.resuming()) {
        stderr.printf("resuming %s: %d units finished before, %d to fit%n", run.folder(),
            run.finishedBefore(), run.unitCount() - run.finishedBefore());
      }
      stderr.flush();
      TaskProgressLine progress =
          TaskProgressLine.of(stderr, System.console() != null, "fit-units", "units");
      try {
        result = run.run(tasks, quiet ? TaskEngine.Progress.none() : progress, stop);
      } finally {
        progress.finish();
      }
      if (!result.complete()) {
        stderr.printf(
            "hullbound fit-units: stopped by a signal; %d of %d units finished and are kept in"
                + " %s; to fit the other %d: %s%n",
            result.outcomes().size(), result.unitCount(), result.folder(),
            result.unitCount() - result.outcomes().size(), resumeCommand(result.folder()));
        stderr.flush();
        return ErrorReporting.FAILURE; // the JVM is ending with the signal's status
      }
    }
    print(stdout, result);
    return result.failedCount() == 0 ? 0 : ErrorReporting.FAILURE;
  }

  /** The options as the application layer takes them: on resume, an option not given is null. */
  private BatchRequest request(ModelInputs inputs, List<UnitData> units) {
    CommandLine.ParseResult given = spec.commandLine().getParseResult();
    boolean all = resumeFolder == null;
    BatchRequest request =
        new BatchRequest(
            inputs.modelFile(), units,
            all || given.hasMatchedOption("--chains") ? sweeps.chains : null,
            all || given.hasMatchedOption("--burn-in") ? sweeps.burnIn : null,
            all || given.hasMatchedOption("--draws") ? sweeps.draws : null,
            all || given.hasMatchedOption("--thin") ? sweeps.thin : null,
            seed.given(), out.given(), overwrite,
            all || given.hasMatchedOption("--level") ? level.value() : null,
            inputs.emptyCells(), keepDraws);
    return all ? request : request.resuming(resumeFolder);
  }

  /** The command that continues the batch in {@code folder}: the model and units as given. */
  private String resumeCommand(Path folder) {
    StringBuilder command = new StringBuilder("hullbound fit-units ").append(model.modelFile);
    if (form.folder != null) {
      command.append(" --units ").append(form.folder);
    } else {
      command.append(" --unit-column ").append(form.column);
    }
    for (Path file : model.dataFiles) {
      command.append(" --data ").append(file);
    }
    if (engine.spark) {
      command.append(" --spark");
    }
    return command.append(" --resume ").append(folder).toString();
  }

  private static void print(PrintWriter stdout, BatchResult result) {
    int total = result.outcomes().size();
    long failed = result.failedCount();
    long flagged = result.flaggedCount();
    stdout.printf(
        "Fitted %d of %d units of %s (seed %d): %d converged, %d flagged, %d failed.%n",
        total - failed, total, result.modelName(), result.seed(), total - failed - flagged,
        flagged, failed);
    for (UnitOutcome outcome : result.outcomes()) {
      if (!UnitOutcome.CONVERGED.equals(outcome.status())) {
        stdout.printf("  %s (%s): %s%n", outcome.unit(), outcome.status(), outcome.verdict());
      }
    }
    stdout.println();
    stdout.println("summary: " + result.summaryFile());
    stdout.println("units:   " + result.unitsFile());
    stdout.flush();
  }
}

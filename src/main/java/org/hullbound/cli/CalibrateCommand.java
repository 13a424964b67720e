package org.hullbound.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.hullbound.app.FolderLock;
import org.hullbound.app.RunRefusedException;
import org.hullbound.app.TaskEngine;
import org.hullbound.validation.Calibration;
import org.hullbound.validation.CalibrationFiles;
import org.hullbound.validation.CalibrationResult;
import org.hullbound.validation.CalibrationSettings;
import org.hullbound.validation.CalibrationText;
import org.hullbound.validation.CalibrationTask;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/**
 * {@code hullbound calibrate MODEL}: simulation-based calibration (Talts et al. 2018) of a model
 * with the Gibbs driver; writes {@code ranks.csv} and one rank histogram per unknown, prints a
 * uniformity p-value per unknown. Exit 0 when no miscalibration is found at family-wise level
 * 0.01, 1 when it is, 2 for a usage, model or simulation error.
 */
@Command(
    name = "calibrate",
    mixinStandardHelpOptions = true,
    sortOptions = false,
    description = {
      "Simulation-based calibration of a model (Talts et al. 2018).",
      "Draws the unknowns from the prior, simulates the data, fits, and tests the ranks",
      "of the prior draws among the posterior draws for uniformity. The model's priors",
      "must be proper; of the data files, covariates and index sizes are kept and the",
      "modelled columns are simulated."
    })
public final class CalibrateCommand implements Callable<Integer> {

  @Mixin ModelOptions model;

  @Option(
      names = "--replicates",
      paramLabel = "N",
      required = true,
      description = "Prior draws, each with a simulated data set and a fit.")
  int replicates;

  @Option(
      names = "--draws",
      paramLabel = "L",
      description = "Posterior draws per fit; ranks run 0 .. L (default: ${DEFAULT-VALUE}).")
  int draws = CalibrationSettings.DEFAULT_DRAWS;

  @Option(
      names = "--thin",
      paramLabel = "K",
      description = "Sweeps per kept draw (default: ${DEFAULT-VALUE}).")
  int thin = CalibrationSettings.DEFAULT_THIN;

  @Option(
      names = "--burn-in",
      paramLabel = "N",
      description = "Sweeps discarded per fit (default: ${DEFAULT-VALUE}).")
  int burnIn = CalibrationSettings.DEFAULT_BURN_IN;

  @Option(
      names = "--bins",
      paramLabel = "B",
      description = "Chi-square bins, a divisor of L + 1 (default: chosen, >= 5 ranks expected per"
          + " bin).")
  int bins;

  @Mixin SeedOption seed;

  @Mixin OutputFolder out;

  @Mixin EngineOptions engine;

  @Option(names = "--quiet", description = "No progress display.")
  boolean quiet;

  @Option(
      names = "--overwrite",
      description = "Replace the files of an earlier calibration in DIR (without it, calibrate"
          + " refuses to start).")
  boolean overwrite;

  /** The seed when none is given: calibration repeats exactly unless asked otherwise. */
  static final long DEFAULT_SEED = 1;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() {
    PrintWriter stdout = spec.commandLine().getOut();
    PrintWriter stderr = spec.commandLine().getErr();
    CalibrationSettings settings;
    try {
      settings = new CalibrationSettings(
          replicates, draws, thin, burnIn, bins, seed.orElse(() -> DEFAULT_SEED));
      settings.binCount();
    } catch (IllegalArgumentException invalid) {
      int status = ErrorReporting.userError(spec.commandLine(), invalid.getMessage()
          .replace("replicates must", "--replicates must").replace("draws must", "--draws must")
          .replace("thin must", "--thin must").replace("burnIn must", "--burn-in must")
          .replace("bins must", "--bins must"));
      ErrorReporting.traceUnderDebug(spec.commandLine(), invalid);
      return status;
    }
    if (engine.problem() != null) {
      return ErrorReporting.userError(spec.commandLine(), engine.problem());
    }
    CalibrationTask task = CalibrationTask.of(model.inputs(), settings);
    Calibration calibration = task.calibration();
    Path folder = out.orDefault("calibrate", calibration.modelName());
    List<Path> earlier = earlierFiles(folder);
    if (!earlier.isEmpty() && !overwrite) {
      throw new RunRefusedException(
          "the folder " + folder + " holds an earlier calibration (" + earlier.get(0).getFileName()
              + (earlier.size() > 1 ? " and " + (earlier.size() - 1) + " more" : "")
              + "); give --overwrite to replace it, or --out with another folder");
    }
    CalibrationResult result;
    List<Path> pictures;
    FolderLock lock = FolderLock.take(folder);
    try (TaskEngine tasks = engine.open()) {
      TaskProgressLine progress =
          TaskProgressLine.of(stderr, System.console() != null, "calibrate", "replicates");
      result = task.run(tasks, quiet ? TaskEngine.Progress.none() : progress);
      progress.finish();
      for (Path file : earlierFiles(folder)) {
        Files.deleteIfExists(file);
      }
      pictures = CalibrationFiles.write(result, folder);
    } catch (IOException e) {
      throw new UncheckedIOException(
          "cannot remove the earlier calibration in " + folder + ": " + e.getMessage(), e);
    } catch (RuntimeException failed) {
      lock.releaseAndRemoveIfEmpty();
      throw failed;
    } finally {
      lock.close();
    }
    stdout.print(CalibrationText.of(result));
    stdout.println();
    stdout.println("ranks:      " + folder.resolve(CalibrationFiles.RANKS_FILE));
    stdout.println("histograms: "
        + (pictures.size() == 1 ? pictures.get(0) : folder.resolve("ranks-*.svg")));
    stdout.flush();
    return result.passes(CalibrationText.LEVEL) ? 0 : ErrorReporting.FAILURE;
  }

  /** The files of an earlier calibration in {@code folder}: its ranks and their histograms. */
  private static List<Path> earlierFiles(Path folder) {
    if (!Files.isDirectory(folder)) {
      return List.of();
    }
    try (var entries = Files.list(folder)) {
      return entries
          .filter(file -> {
            String name = file.getFileName().toString();
            return name.equals(CalibrationFiles.RANKS_FILE)
                || (name.startsWith("ranks-") && name.endsWith(".svg"));
          })
          .sorted()
          .toList();
    } catch (IOException e) {
      throw new UncheckedIOException(
          "cannot list the output folder " + folder + ": " + e.getMessage(), e);
    }
  }

}

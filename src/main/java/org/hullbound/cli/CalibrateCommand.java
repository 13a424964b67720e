package org.hullbound.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.hullbound.io.CsvData;
import org.hullbound.io.TextFiles;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.hullbound.model.SimulationException;
import org.hullbound.validation.Calibration;
import org.hullbound.validation.CalibrationFiles;
import org.hullbound.validation.CalibrationResult;
import org.hullbound.validation.CalibrationSettings;
import org.hullbound.validation.CalibrationText;
import org.hullbound.validation.PosteriorFitter;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

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
      "of the prior draws among the posterior draws for uniformity."
    })
public final class CalibrateCommand implements Callable<Integer> {

  @Parameters(index = "0", paramLabel = "MODEL", description = "The model file (.hbm); its priors must be proper.")
  Path modelFile;

  @Option(names = "--data", paramLabel = "FILE", description = "A data file: covariates and index sizes are kept, modelled columns are simulated.")
  List<Path> dataFiles = new ArrayList<>();

  @Option(names = "--replicates", paramLabel = "N", required = true, description = "Prior draws, each with a simulated data set and a fit.")
  int replicates;

  @Option(names = "--draws", paramLabel = "L", description = "Posterior draws per fit; ranks run 0 .. L (default: ${DEFAULT-VALUE}).")
  int draws = CalibrationSettings.DEFAULT_DRAWS;

  @Option(names = "--thin", paramLabel = "K", description = "Sweeps per kept draw (default: ${DEFAULT-VALUE}).")
  int thin = CalibrationSettings.DEFAULT_THIN;

  @Option(names = "--burn-in", paramLabel = "N", description = "Sweeps discarded per fit (default: ${DEFAULT-VALUE}).")
  int burnIn = CalibrationSettings.DEFAULT_BURN_IN;

  @Option(names = "--bins", paramLabel = "B", description = "Chi-square bins, a divisor of L + 1 (default: chosen, >= 5 ranks expected per bin).")
  int bins;

  @Option(names = "--seed", paramLabel = "S", description = "Seed of the whole run (default: ${DEFAULT-VALUE}).")
  long seed = 1;

  @Option(names = "--out", paramLabel = "DIR", description = "Folder for ranks.csv and the histograms (default: calibrate-out/<model name>).")
  Path out;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() throws IOException {
    PrintWriter stdout = spec.commandLine().getOut();
    PrintWriter stderr = spec.commandLine().getErr();
    CalibrationSettings settings;
    try {
      settings = new CalibrationSettings(replicates, draws, thin, burnIn, bins, seed);
      settings.binCount();
    } catch (IllegalArgumentException invalid) {
      return userError(stderr, invalid.getMessage()
          .replace("replicates must", "--replicates must").replace("draws must", "--draws must")
          .replace("thin must", "--thin must").replace("burnIn must", "--burn-in must")
          .replace("bins must", "--bins must"));
    }
    String text = TextFiles.readUtf8(modelFile, "model file");
    ModelFile parsed = Parser.parse(SourceText.of(modelFile.toString(), text));
    List<DataTable> tables = new ArrayList<>();
    for (Path file : dataFiles) {
      tables.add(CsvData.read(file, BoundModel.readsColumn(parsed)));
    }
    CalibrationResult result;
    try {
      Calibration calibration = Calibration.of(parsed, tables, PosteriorFitter.gibbs());
      int every = Math.max(1, replicates / 10);
      result = calibration.run(settings, done -> {
        if (done % every == 0 || done == replicates) {
          stderr.printf("hullbound calibrate: %d of %d replicates%n", done, replicates);
          stderr.flush();
        }
      });
    } catch (SimulationException cannot) {
      return userError(stderr, cannot.getMessage());
    }
    Path folder = out != null ? out : Path.of("calibrate-out", result.modelName());
    List<Path> pictures = CalibrationFiles.write(result, folder);
    stdout.print(CalibrationText.of(result));
    stdout.println();
    stdout.println("ranks:      " + folder.resolve(CalibrationFiles.RANKS_FILE));
    stdout.println("histograms: " + (pictures.size() == 1 ? pictures.get(0) : folder.resolve("ranks-*.svg")));
    stdout.flush();
    return result.passes(CalibrationText.LEVEL) ? 0 : ErrorReporting.FAILURE;
  }

  private static int userError(PrintWriter stderr, String message) {
    stderr.println("hullbound calibrate: " + message);
    stderr.flush();
    return ErrorReporting.USER_ERROR;
  }
}

package org.hullbound.cli;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.PrintWriter;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.Callable;
import java.util.function.Function;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.app.FitRun;
import org.hullbound.app.RunFactsFile;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.io.Checkpoint;
import org.hullbound.io.CheckpointException;
import org.hullbound.io.CheckpointFile;
import org.hullbound.io.DrawsReader;
import org.hullbound.io.DrawsTable;
import org.hullbound.lang.ModelException;
import org.hullbound.io.DrawsWriter;
import org.hullbound.model.DataSummary;
import org.hullbound.lang.NumberSyntax;
import org.hullbound.report.HtmlReport;
import org.hullbound.report.PredictiveChecks;
import org.hullbound.report.ProbabilityTable;
import org.hullbound.report.ReportInput;
import org.hullbound.report.ReportOptions;
import org.hullbound.report.ReportWriter;
import org.hullbound.report.RunHeader;
import org.hullbound.report.RunSources;
import org.hullbound.report.SummaryTable;
import org.hullbound.report.UpdateFacts;
import org.hullbound.report.Verdicts;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * {@code hullbound report DIR}: renders the HTML page of a finished (or stopped) fit again from the
 * files in its folder, without refitting, e.g. with another interval level or plot cap.
 *
 * <p>It reads {@code draws.csv} (the draws; the summary is recomputed from them exactly as fit
 * computes it), {@code summary.csv} (the update facts of each unknown, which only the sampler
 * knew) and {@code run.txt} (the header facts, data facts and model text; see {@link
 * RunFactsFile}). A folder without {@code run.txt} (written by an older version) still renders,
 * from {@code checkpoint.txt} when there is one, and the page says which facts it lacks.
 */
@Command(
    name = "report",
    mixinStandardHelpOptions = true,
    sortOptions = false,
    description =
        "Render DIR/report.html again from the files a fit left in DIR (draws.csv, summary.csv,"
            + " checkpoint.txt), without refitting.")
public final class ReportCommand implements Callable<Integer> {

  private static final Pattern MODEL_NAME =
      Pattern.compile("(?m)^\\s*model\\s+([A-Za-z_][A-Za-z0-9_]*)");

  @Parameters(index = "0", paramLabel = "DIR", description = "The folder of a fit run.")
  Path folder;

  @CommandLine.Mixin LevelOption level;

  @Option(
      names = "--plot-cap",
      paramLabel = "N",
      description = "Draw the plots of the first N unknowns (default: ${DEFAULT-VALUE}).")
  int plotCap = ReportOptions.DEFAULT_PLOT_CAP;

  @Option(
      names = "--sort-by-mean",
      description = "Open the interval plots of indexed unknowns sorted by mean.")
  boolean sortByMean;

  @Option(
      names = "--out",
      paramLabel = "FILE",
      description = "Write the page to FILE (default: DIR/report.html).")
  Path out;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() throws IOException {
    PrintWriter stdout = spec.commandLine().getOut();
    PrintWriter stderr = spec.commandLine().getErr();
    if (level.problem() != null) {
      return userError(stderr, level.problem());
    }
    if (plotCap < 0) {
      return userError(stderr, "--plot-cap must be 0 or more, got " + plotCap);
    }
    if (!Files.isDirectory(folder)) {
      return userError(stderr, folder + " is not a folder; give the folder of a fit run");
    }
    Path drawsFile = folder.resolve(DrawsWriter.FILE_NAME);
    if (!Files.isRegularFile(drawsFile)) {
      return userError(
          stderr,
          folder + " holds no " + DrawsWriter.FILE_NAME + "; is it the folder of a fit run?");
    }
    Optional<RunFactsFile.RunFacts> facts;
    Optional<Checkpoint> checkpoint = Optional.empty();
    try {
      facts = RunFactsFile.read(folder);
      if (facts.isEmpty() && Files.exists(CheckpointFile.in(folder))) {
        checkpoint = Optional.of(CheckpointFile.read(folder));
      }
    } catch (CheckpointException | IllegalArgumentException unusable) {
      int status = userError(stderr, unusable.getMessage());
      ErrorReporting.traceUnderDebug(spec.commandLine(), unusable);
      return status;
    }
    DrawsTable table = DrawsReader.read(drawsFile);
    for (String note : table.notes()) {
      stderr.println("hullbound report: note: " + note);
    }
    Map<String, UpdateFacts> updates =
        updateFacts(folder.resolve(FitRun.SUMMARY_FILE), stderr);
    stderr.flush();
    List<VariableSummary> summaries = new ArrayList<>();
    List<Draws> draws = new ArrayList<>();
    Map<String, Draws> drawsByName = new HashMap<>();
    for (String name : table.variables()) {
      Draws d = Draws.of(table.draws(name));
      draws.add(d);
      drawsByName.put(name, d);
      summaries.add(PosteriorSummary.of(name, d));
    }
    SummaryTable summary = SummaryTable.of(summaries, updates);
    RunHeader header;
    RunSources sources;
    if (facts.isPresent()) {
      RunHeader h = facts.get().header();
      header =
          new RunHeader(h.modelName(), h.startedAt(), table.chainCount(), table.drawsPerChain(),
              h.burnIn(), h.seed(), h.runTime());
      sources = facts.get().sources();
    } else {
      // A folder from before run.txt: what the checkpoint and the file times can tell.
      String modelText = checkpoint.map(c -> modelText(Path.of(c.modelFile()))).orElse("");
      OffsetDateTime written =
          Files.getLastModifiedTime(drawsFile).toInstant().atOffset(ZoneOffset.UTC);
      header =
          new RunHeader(
              modelName(modelText, checkpoint.map(Checkpoint::modelFile).orElse("")),
              written,
              table.chainCount(),
              table.drawsPerChain(),
              checkpoint.map(Checkpoint::burnIn).orElse(0),
              checkpoint.map(Checkpoint::seed).orElse(0L),
              Duration.ZERO);
      sources = new RunSources(modelText, List.of());
    }
    ReportOptions options =
        ReportOptions.defaults()
            .withPlotCap(plotCap)
            .withIntervalLevel(level.value())
            .withSortByMean(sortByMean);
    ReportInput built = ReportInput.of(header, summary,
        Verdicts.of(summary).withLabelSwitchingFoundInDraws(table.variables(), drawsByName),
        draws, options);
    List<String> warnings = new ArrayList<>(built.warnings());
    if (facts.isEmpty()) {
      warnings.add(0, rerenderNote(checkpoint.isPresent(), !sources.modelText().isEmpty()));
    }
    ReportInput input =
        new ReportInput(
            header, warnings, built.conclusion(), built.unknowns(), options, sources);
    Path target = out != null ? out : folder.resolve(FitRun.REPORT_FILE);
    ReportWriter.writeAtomically(
        target,
        HtmlReport.render(
            input,
            predictiveChecks(folder, stderr),
            readBack(folder.resolve(ProbabilityOption.FILE_NAME), ProbabilityOption::fromCsv,
                ProbabilityTable.none(), "probability statements", stderr)));
    stdout.println("report: " + target);
    stdout.flush();
    return 0;
  }


  /** The first warning of a page re-rendered from a folder without run.txt. */
  static String rerenderNote(boolean checkpointFound, boolean modelFound) {
    return "Re-rendered by 'hullbound report' from a run folder without run.txt: 'started'"
        + " is when draws.csv was last written and the run time is not stored (shown as 0)"
        + (checkpointFound
            ? ""
            : "; the folder has no checkpoint.txt, so the seed and burn-in show as 0")
        + (modelFound ? "" : "; the model file was not found, so its text is not shown")
        + "; the data files are not recorded in the folder.";
  }

  /**
   * The predictive checks of the run in {@code folder}: its table, computed again from the
   * per-sweep file when fit wrote one, so that the panels are fit's own (a folder of an older
   * run has the table alone, and the page then shows the p-values without the panels).
   */
  private static PredictiveChecks predictiveChecks(Path folder, PrintWriter stderr) {
    PredictiveChecks rows = readBack(folder.resolve(PredictiveChecks.FILE_NAME),
        PredictiveChecks::fromCsv, PredictiveChecks.none(), "predictive checks", stderr);
    Path sweeps = folder.resolve(PredictiveChecks.SWEEPS_FILE);
    if (rows.isEmpty() || !Files.isRegularFile(sweeps)) {
      return rows;
    }
    try {
      DrawsTable table = DrawsReader.read(sweeps);
      return PredictiveChecks.fromSweeps(
          rows, column -> table.hasVariable(column) ? table.draws(column) : null);
    } catch (UncheckedIOException | ModelException | IllegalArgumentException unreadable) {
      stderr.println("hullbound report: note: cannot read " + sweeps + " ("
          + unreadable.getMessage() + "), so the predictive checks show no panels");
      stderr.flush();
      return rows;
    }
  }

  /**
   * The table of an optional section, read back from {@code file} in the run folder: {@code none}
   * when the file is absent (the run did not ask for that section) or unreadable (a note says so),
   * since the page can be drawn without it.
   */
  private static <T> T readBack(
      Path file, Function<String, T> parse, T none, String section, PrintWriter stderr) {
    if (!Files.isRegularFile(file)) {
      return none;
    }
    try {
      return parse.apply(Files.readString(file));
    } catch (IOException | IllegalArgumentException unreadable) {
      stderr.println("hullbound report: note: cannot read " + file + " (" + unreadable.getMessage()
          + "), so the page shows no " + section);
      stderr.flush();
      return none;
    }
  }

  /**
   * The update facts of each unknown from fit's summary.csv; none when the file is missing or
   * unreadable (a note says so), since the page can be drawn without them.
   */
  static Map<String, UpdateFacts> updateFacts(Path summaryFile, PrintWriter stderr) {
    Map<String, UpdateFacts> facts = new HashMap<>();
    if (!Files.isRegularFile(summaryFile)) {
      stderr.println(
          "hullbound report: note: no " + summaryFile.getFileName() + ", so the page shows no"
              + " update facts");
      return facts;
    }
    try (Reader reader = Files.newBufferedReader(summaryFile);
        CSVParser parser =
            CSVFormat.RFC4180.builder().setHeader().setSkipHeaderRecord(true).get().parse(reader)) {
      for (CSVRecord row : parser) {
        String update = row.get("update");
        if (update.isBlank()) {
          continue;
        }
        String evaluations = row.get("evaluations_per_draw");
        // the file writes an undefined cost as NaN; every other number in the language's grammar
        double perDraw =
            evaluations.isBlank() || evaluations.equals("NaN")
                ? Double.NaN
                : NumberSyntax.parse(evaluations);
        String sweep = row.get("fallback_sweep");
        UpdateFacts fact =
            switch (row.get("fallback")) {
              case "chosen" -> UpdateFacts.fallback(update, perDraw);
              case "no" -> UpdateFacts.exact(update, perDraw);
              default ->
                  UpdateFacts.switchedToFallback(
                      update, perDraw, sweep.isBlank() ? 0 : NumberSyntax.parseWhole(sweep));
            };
        facts.put(row.get("unknown"), fact);
      }
    } catch (IOException | RuntimeException unreadable) {
      stderr.println(
          "hullbound report: note: " + summaryFile + " could not be read ("
              + unreadable.getMessage() + "), so the page shows no update facts");
      facts.clear();
    }
    return facts;
  }

  private static String modelText(Path modelFile) {
    try {
      return Files.readString(modelFile);
    } catch (IOException | RuntimeException gone) {
      return "";
    }
  }

  /** The name of the model's {@code model NAME} statement, else the file name without suffix. */
  static String modelName(String modelText, String modelFile) {
    Matcher m = MODEL_NAME.matcher(modelText);
    if (m.find()) {
      return m.group(1);
    }
    if (modelFile.isEmpty()) {
      return "";
    }
    String file = Path.of(modelFile).getFileName().toString();
    int dot = file.lastIndexOf('.');
    return dot > 0 ? file.substring(0, dot) : file;
  }

  private static int userError(PrintWriter stderr, String problem) {
    stderr.println("hullbound report: " + problem);
    stderr.flush();
    return ErrorReporting.USER_ERROR;
  }
}

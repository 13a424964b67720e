package org.hullbound.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.gibbs.ChainFailedException;
import org.hullbound.gibbs.ChainRunner;
import org.hullbound.gibbs.DrawSink;
import org.hullbound.gibbs.DrawStore;
import org.hullbound.gibbs.MemoryBudget;
import org.hullbound.gibbs.ModelSampler;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.RunOutcome;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.gibbs.StartingValueException;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.gibbs.UpdateReport;
import org.hullbound.gibbs.UpdateRule;
import org.hullbound.io.AtomicFiles;
import org.hullbound.io.Checkpoint;
import org.hullbound.io.CheckpointException;
import org.hullbound.io.CheckpointFile;
import org.hullbound.io.CsvData;
import org.hullbound.io.TextFiles;
import org.hullbound.io.DrawsWriter;
import org.hullbound.io.InitialValuesFile;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.hullbound.model.Unknown;
import org.hullbound.report.HtmlReport;
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
 * {@code hullbound fit MODEL [--data FILE]...}: binds a model to its data, runs parallel Gibbs
 * chains, streams every draw to {@code draws.csv}, and prints the posterior summary with the
 * update each unknown got, its cost in density evaluations, and plain-language verdicts.
 *
 * <p>Thin by design: the numerics live in {@code gibbs}, {@code diagnostics} and {@code report};
 * this class reads files, shows progress on standard error, writes the outputs and turns failures
 * into exit codes (0 done, 1 sampling failure, 2 usage, model or data error). Before sampling it
 * refuses to write over an earlier run without {@code --overwrite} and refuses a run whose kept
 * draws would not fit the heap ({@link MemoryBudget}).
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

  @Parameters(index = "0", paramLabel = "MODEL", description = "The model file (.hbm).")
  Path modelFile;

  @Option(
      names = "--data",
      paramLabel = "FILE",
      description = "A data file (CSV with a header row); repeat for one file per index set.")
  List<Path> dataFiles = new ArrayList<>();

  @Option(names = "--chains", paramLabel = "N", description = "Chains, run in parallel (default: ${DEFAULT-VALUE}).")
  int chains = RunSettings.DEFAULT_CHAINS;

  @Option(names = "--draws", paramLabel = "N", description = "Kept draws per chain (default: ${DEFAULT-VALUE}).")
  int draws = RunSettings.DEFAULT_DRAWS;

  @Option(names = "--burn-in", paramLabel = "N", description = "Sweeps discarded first (default: ${DEFAULT-VALUE}).")
  int burnIn = RunSettings.DEFAULT_BURN_IN;

  @Option(names = "--thin", paramLabel = "K", description = "Keep every K-th sweep (default: ${DEFAULT-VALUE}).")
  int thin = 1;

  @Option(
      names = "--seed",
      paramLabel = "S",
      description = "Seed of every chain's generator; the same seed and chain count give the same draws (default: drawn, and printed).")
  Long seed;

  @Option(
      names = "--out",
      paramLabel = "DIR",
      description = "Folder for draws.csv, summary.csv and report.html (default: fit-out/<model name>).")
  Path out;

  @Option(
      names = "--init",
      paramLabel = "FILE",
      description = "Starting values: a CSV of name,value rows (natural scale); others start dispersed.")
  Path initFile;

  @Option(names = "--threads", paramLabel = "N", description = "Worker threads (default: chains, at most the processors).")
  Integer threads;

  @Option(names = "--quiet", description = "No progress display.")
  boolean quiet;

  @Option(
      names = "--resume",
      paramLabel = "DIR",
      description = "Continue the interrupted run whose files are in DIR (its checkpoint.txt): same draws as if never stopped.")
  Path resumeFolder;

  @Option(
      names = "--overwrite",
      description = "Replace the files of an earlier run in DIR (without it, fit refuses to start).")
  boolean overwrite;

  @Option(
      names = "--level",
      paramLabel = "P",
      description = "Probability of the central intervals in the summary and report, e.g. 0.9 (default: ${DEFAULT-VALUE}).")
  double level = SummaryTable.INTERVAL_LEVEL;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  /** The model file's text as read, for the report's top. */
  private String modelText = "";

  /** The summary table's file name in the output folder. */
  static final String SUMMARY_FILE = "summary.csv";

  /** The HTML report's file name in the output folder. */
  static final String REPORT_FILE = "report.html";

  /** When sampling started; set just before the chains run. */
  private RunClock clock;

  @Override
  public Integer call() throws IOException {
    PrintWriter stdout = spec.commandLine().getOut();
    PrintWriter stderr = spec.commandLine().getErr();
    String problem = checkOptions();
    if (problem != null) {
      stderr.println("hullbound fit: " + problem);
      stderr.flush();
      return ErrorReporting.USER_ERROR;
    }
    BoundModel model = load();
    Map<String, Double> given = initFile == null ? Map.of() : InitialValuesFile.read(initFile);
    ModelSampler sampler;
    try {
      sampler = ModelSampler.of(model, given);
    } catch (StartingValueException invalid) {
      stderr.println("hullbound fit: " + (initFile != null ? initFile + ": " : "")
          + invalid.getMessage());
      stderr.flush();
      return ErrorReporting.USER_ERROR;
    }
    Checkpoint checkpoint;
    try {
      checkpoint = resumeFolder == null ? null : checkpointToResume(sampler);
    } catch (CheckpointException unusable) {
      stderr.println("hullbound fit: " + unusable.getMessage());
      stderr.flush();
      return ErrorReporting.USER_ERROR;
    }
    long runSeed = checkpoint != null ? checkpoint.seed() : seed != null ? seed : new SecureRandom().nextLong();
    RunSettings settings =
        checkpoint != null
            ? RunSettings.of(
                checkpoint.chains().size(), checkpoint.burnIn(), checkpoint.draws(),
                checkpoint.thin(), runSeed)
            : RunSettings.of(chains, burnIn, draws, thin, runSeed);
    if (threads != null) {
      settings = settings.withThreads(threads);
    }
    Path folder =
        checkpoint != null ? resumeFolder : out != null ? out : Path.of("fit-out", model.name());
    // A resumed run continues in its folder by design; a new one must not replace an earlier one.
    String refusal = checkpoint != null ? null : refuseToOverwrite(folder);
    if (refusal == null) {
      refusal = refuseTooMuchMemory(settings, sampler.labels().size(), stderr);
    }
    if (refusal != null) {
      stderr.println("hullbound fit: " + refusal);
      stderr.flush();
      return ErrorReporting.USER_ERROR;
    }
    if (checkpoint == null) {
      clearEarlierRun(folder);
    }
    StopSignal stop = StopSignal.create();
    CountDownLatch finished = new CountDownLatch(1);
    Thread interruptHook = new Thread(() -> stopAndWait(stop, finished), "hullbound-interrupt");
    Runtime.getRuntime().addShutdownHook(interruptHook);
    ProgressDisplay display =
        ProgressDisplay.of(stderr, System.console() != null, settings.chains());
    ProgressListener listener = quiet ? ProgressListener.none() : display;
    DrawStore store = DrawStore.create(settings.chains(), settings.draws(), sampler.labels().size());
    try {
      RunOutcome outcome;
      DrawsWriter opened;
      try {
        opened = openDraws(folder, sampler, checkpoint, store);
      } catch (CheckpointException unusable) {
        stderr.println("hullbound fit: " + unusable.getMessage());
        stderr.flush();
        return ErrorReporting.USER_ERROR;
      }
      try (DrawsWriter writer = opened) {
        DrawSink both =
            (chain, draw, values) -> {
              writer.accept(chain, draw, values);
              store.accept(chain, draw, values);
            };
        if (!quiet) {
          stderr.printf(
              "fit %s: %d unknowns, %d chains of %d burn-in + %d draws%s, seed %d%n",
              model.name(), sampler.labels().size(), settings.chains(), settings.burnIn(),
              settings.draws(), settings.thin() > 1 ? " thinned by " + settings.thin() : "",
              runSeed);
          if (checkpoint != null) {
            stderr.printf("resuming from %s%n", CheckpointFile.in(folder));
          }
          stderr.flush();
        }
        clock = RunClock.start();
        try {
          outcome =
              ChainRunner.of(settings, listener, stop)
                  .resume(
                      sampler.sampler().withAdaptation(settings.burnIn()), both,
                      checkpoint == null ? List.of() : checkpoint.chains());
        } catch (ChainFailedException failed) {
          display.finish();
          stderr.println("hullbound fit: sampling failed: " + failed.getMessage());
          stderr.println("  the draws made before the failure are in " + writer.file());
          stderr.flush();
          return ErrorReporting.FAILURE;
        } finally {
          display.finish();
        }
      }
      saveCheckpoint(folder, sampler, settings, outcome, checkpoint);
      report(model, sampler, settings, outcome, store, folder, stdout, stderr, clock,
          ReportCommand.sources(modelText, model.data()), level);
      if (outcome.stoppedEarly()) {
        printHowToResume(folder, stdout);
      }
      return 0;
    } finally {
      // Only now may an interrupted JVM exit: the files are written.
      finished.countDown();
      try {
        Runtime.getRuntime().removeShutdownHook(interruptHook);
      } catch (IllegalStateException shuttingDown) {
        // The JVM is already exiting (Ctrl-C): the hook is running and waits for us.
      }
    }
  }

  /**
   * The checkpoint in {@code --resume DIR}, checked against this model, its data and the options
   * given: a finished run, another model or data, or other settings are refused.
   */
  private Checkpoint checkpointToResume(ModelSampler sampler) throws IOException {
    Checkpoint checkpoint = CheckpointFile.read(resumeFolder);
    if (checkpoint.complete()) {
      throw new CheckpointException(
          "the run in " + resumeFolder + " is finished (its checkpoint is marked complete):"
              + " nothing to resume");
    }
    if (!checkpoint.inputHash().equals(inputHash())) {
      throw new CheckpointException(
          "the model or data changed since the run in " + resumeFolder + " was interrupted (it ran "
              + checkpoint.modelFile() + " with other model or data text): resuming would mix"
              + " draws of two models; start a new fit instead");
    }
    if (!checkpoint.columns().equals(sampler.labels())) {
      throw new CheckpointException(
          "the checkpoint in " + resumeFolder + " has other unknowns than this model");
    }
    CommandLine.ParseResult given = spec.commandLine().getParseResult();
    List<String> conflicts = new ArrayList<>();
    if (given.hasMatchedOption("--chains") && chains != checkpoint.chains().size()) {
      conflicts.add("--chains " + checkpoint.chains().size());
    }
    if (given.hasMatchedOption("--burn-in") && burnIn != checkpoint.burnIn()) {
      conflicts.add("--burn-in " + checkpoint.burnIn());
    }
    if (given.hasMatchedOption("--draws") && draws != checkpoint.draws()) {
      conflicts.add("--draws " + checkpoint.draws());
    }
    if (given.hasMatchedOption("--thin") && thin != checkpoint.thin()) {
      conflicts.add("--thin " + checkpoint.thin());
    }
    if (seed != null && seed != checkpoint.seed()) {
      conflicts.add("--seed " + checkpoint.seed());
    }
    if (out != null && !out.toAbsolutePath().normalize().equals(resumeFolder.toAbsolutePath().normalize())) {
      conflicts.add("--out " + resumeFolder);
    }
    if (!conflicts.isEmpty()) {
      throw new CheckpointException(
          "the run in " + resumeFolder + " was made with " + String.join(", ", conflicts)
              + "; a resumed run keeps its settings (leave these options out)");
    }
    return checkpoint;
  }

  /** SHA-256 of the model and data texts as read now (see {@link CheckpointFile#inputHash}). */
  private String inputHash() throws IOException {
    List<String> dataTexts = new ArrayList<>();
    for (Path file : dataFiles) {
      dataTexts.add(TextFiles.readUtf8(file, "data file"));
    }
    return CheckpointFile.inputHash(TextFiles.readUtf8(modelFile, "model file"), dataTexts);
  }

  /** A new draws file, or the checkpointed one continued (its draws handed to {@code store}). */
  private static DrawsWriter openDraws(
      Path folder, ModelSampler sampler, Checkpoint checkpoint, DrawStore store) {
    if (checkpoint == null) {
      return DrawsWriter.open(folder, sampler.labels());
    }
    int[] kept = new int[checkpoint.chains().size()];
    for (int chain = 0; chain < kept.length; chain++) {
      kept[chain] = checkpoint.chains().get(chain).draws();
    }
    return DrawsWriter.resume(folder, sampler.labels(), kept, store);
  }

  /**
   * After the chains stopped: an interrupted run saves where every chain stood; a run that
   * reached its end marks an existing checkpoint complete, so that it is not resumed twice.
   */
  private void saveCheckpoint(
      Path folder, ModelSampler sampler, RunSettings settings, RunOutcome outcome,
      Checkpoint resumed) throws IOException {
    if (outcome.chainStates().isEmpty()) {
      return;
    }
    Checkpoint now =
        new Checkpoint(
            !outcome.stoppedEarly(), modelFile.toString(), inputHash(), settings.seed(),
            settings.burnIn(), settings.draws(), settings.thin(), sampler.labels(),
            outcome.chainStates());
    if (outcome.stoppedEarly() || resumed != null) {
      CheckpointFile.write(folder, now);
    }
  }

  private void printHowToResume(Path folder, PrintWriter stdout) {
    StringBuilder command = new StringBuilder("hullbound fit ").append(modelFile);
    for (Path file : dataFiles) {
      command.append(" --data ").append(file);
    }
    command.append(" --resume ").append(folder);
    stdout.println("checkpoint: " + CheckpointFile.in(folder));
    stdout.println("to continue this run with the draws it would have made: " + command);
    stdout.flush();
  }

  private String checkOptions() {
    if (ReportCommand.levelProblem(level) != null) {
      return ReportCommand.levelProblem(level);
    }
    if (chains < 1) {
      return "--chains must be at least 1, got " + chains;
    }
    if (draws < 1) {
      return "--draws must be at least 1, got " + draws;
    }
    if (burnIn < 0) {
      return "--burn-in must be at least 0, got " + burnIn;
    }
    if (thin < 1) {
      return "--thin must be at least 1, got " + thin;
    }
    if (threads != null && threads < 1) {
      return "--threads must be at least 1, got " + threads;
    }
    if ((long) burnIn + (long) draws * thin > Integer.MAX_VALUE) {
      return "--burn-in + --draws x --thin must be at most " + Integer.MAX_VALUE;
    }
    return null;
  }

  /** Files that mark a folder as holding an earlier run; checkpoint files start with {@code checkpoint}. */
  static final List<String> OUTPUT_FILES =
      List.of(DrawsWriter.FILE_NAME, SUMMARY_FILE, REPORT_FILE, RunFactsFile.FILE_NAME);

  /**
   * Why {@code folder} must not be written, or null: it is a file, or it holds an earlier run's
   * outputs and {@code --overwrite} was not given. A resumed run skips this check.
   */
  String refuseToOverwrite(Path folder) throws IOException {
    if (Files.exists(folder) && !Files.isDirectory(folder)) {
      return "--out " + folder + " is a file, not a folder";
    }
    List<String> found = earlierRunFiles(folder);
    if (found.isEmpty() || overwrite) {
      return null;
    }
    return "the folder " + folder + " holds an earlier run (" + String.join(", ", found)
        + "); give --overwrite to replace it, or --out with another folder";
  }

  /** With {@code --overwrite}, deletes the earlier run's files so none outlives this run. */
  private void clearEarlierRun(Path folder) throws IOException {
    if (!overwrite) {
      return;
    }
    for (String name : earlierRunFiles(folder)) {
      Files.deleteIfExists(folder.resolve(name));
    }
  }

  private static List<String> earlierRunFiles(Path folder) throws IOException {
    List<String> found = new ArrayList<>();
    if (!Files.isDirectory(folder)) {
      return found;
    }
    for (String name : OUTPUT_FILES) {
      if (Files.exists(folder.resolve(name))) {
        found.add(name);
      }
    }
    try (var entries = Files.list(folder)) {
      entries
          .map(entry -> entry.getFileName().toString())
          .filter(name -> name.startsWith("checkpoint") && !Files.isDirectory(folder.resolve(name)))
          .sorted()
          .forEach(found::add);
    }
    return found;
  }

  /**
   * Why the run would not fit the heap, or null; prints a note on {@code stderr} when it fits but
   * is a large share of it (see {@link MemoryBudget}).
   */
  private String refuseTooMuchMemory(RunSettings settings, int unknowns, PrintWriter stderr) {
    MemoryBudget budget = MemoryBudget.of(settings.chains(), settings.draws(), unknowns);
    long heap = Runtime.getRuntime().maxMemory();
    String figure =
        settings.chains() + " chains x " + settings.draws() + " draws x " + unknowns
            + " unknowns will hold about " + MemoryBudget.describe(budget.bytes())
            + " of draws in memory";
    switch (budget.against(heap)) {
      case REFUSE:
        return figure + ", more than " + Math.round(100 * MemoryBudget.REFUSE_SHARE)
            + "% of the Java heap (" + MemoryBudget.describe(heap) + "); keep fewer draws"
            + " (--thin K keeps every K-th sweep, or a smaller --draws) or give Java more memory"
            + " (HULLBOUND_JAVA_OPTS=-Xmx8g ./hullbound fit ...)";
      case NOTE:
        stderr.println("hullbound fit: note: " + figure + " (the Java heap is "
            + MemoryBudget.describe(heap) + ")");
        stderr.flush();
        return null;
      default:
        return null;
    }
  }

  private BoundModel load() throws IOException {
    String text = TextFiles.readUtf8(modelFile, "model file");
    modelText = text;
    ModelFile parsed = Parser.parse(SourceText.of(modelFile.toString(), text));
    List<DataTable> tables = new ArrayList<>();
    for (Path file : dataFiles) {
      tables.add(CsvData.read(file));
    }
    return BoundModel.bind(parsed, tables);
  }

  /** When the chains started, by the wall clock (for the report) and the monotonic one. */
  private record RunClock(OffsetDateTime startedAt, long startNanos) {
    static RunClock start() {
      return new RunClock(OffsetDateTime.now(), System.nanoTime());
    }

    Duration elapsed() {
      return Duration.ofNanos(Math.max(0, System.nanoTime() - startNanos));
    }
  }

  /** On Ctrl-C: ask the chains to stop, then give the run a few seconds to write its files. */
  private static void stopAndWait(StopSignal stop, CountDownLatch finished) {
    stop.request();
    try {
      // Writing the summary and report of a large run on a loaded machine can take a while;
      // a bounded wait still lets a hung run end.
      finished.await(2, TimeUnit.MINUTES);
    } catch (InterruptedException interrupted) {
      Thread.currentThread().interrupt();
    }
  }

  /** Chains as the user counts them, from 1: "chains 1, 2". */
  private static String chainNames(int[] chains) {
    StringBuilder names = new StringBuilder(chains.length == 1 ? "chain " : "chains ");
    for (int i = 0; i < chains.length; i++) {
      names.append(i == 0 ? "" : ", ").append(chains[i] + 1);
    }
    return names.toString();
  }

  private static void report(
      BoundModel model, ModelSampler sampler, RunSettings settings, RunOutcome outcome,
      DrawStore store, Path folder, PrintWriter stdout, PrintWriter stderr, RunClock clock,
      RunSources sources, double level) {
    List<String> labels = sampler.labels();
    int kept = store.commonDraws();
    int[] summarised = store.chainsWithDraws();
    if (outcome.stoppedEarly()) {
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
    Path drawsFile = folder.resolve(DrawsWriter.FILE_NAME);
    RunHeader header =
        new RunHeader(model.name(), clock.startedAt(),
            summarised.length > 0 ? summarised.length : settings.chains(), kept,
            settings.burnIn(), settings.seed(), clock.elapsed());
    RunFactsFile.write(folder, header, sources);
    if (kept == 0) {
      Path reportFile = writeReport(folder, new ReportInput(header,
          List.of("No draws were kept (the run stopped during burn-in), so there is no summary."),
          "", List.of(), ReportOptions.defaults(), sources));
      stdout.println("No draws were kept, so there is no summary.");
      stdout.println("draws:  " + drawsFile);
      stdout.println("report: " + reportFile);
      stdout.flush();
      return;
    }
    List<UpdateReport> reports = UpdateReport.of(labels.size(), outcome.kernels());
    List<UpdateRule> rules = sampler.sampler().rules();
    boolean[] chosenFallback = new boolean[labels.size()];
    for (UpdateRule rule : rules) {
      for (int index : rule.indices()) {
        chosenFallback[index] = rule instanceof UpdateRule.Fallback;
      }
    }
    List<VariableSummary> summaries = new ArrayList<>();
    List<Draws> kepts = new ArrayList<>();
    Map<String, UpdateFacts> facts = new LinkedHashMap<>();
    List<String> switchNotes = new ArrayList<>();
    for (Unknown unknown : model.unknowns()) {
      int index = unknown.index();
      String label = labels.get(index);
      Draws draws = Draws.of(store.draws(index));
      kepts.add(draws);
      summaries.add(PosteriorSummary.of(label, draws));
      UpdateReport update = reports.get(index);
      String method = update.method() + (unknown.imputed() ? ", imputed" : "");
      UpdateFacts fact;
      if (!update.switches().isEmpty()) {
        fact = UpdateFacts.switchedToFallback(method, update.evaluationsPerDraw(), update.firstSwitchSweep());
        for (String note : update.switches()) {
          switchNotes.add(label + ": " + note);
        }
      } else if (chosenFallback[index]) {
        fact = UpdateFacts.fallback(method, update.evaluationsPerDraw());
      } else {
        fact = UpdateFacts.exact(method, update.evaluationsPerDraw());
      }
      facts.put(label, fact);
    }
    SummaryTable table = SummaryTable.of(summaries, facts).withIntervalLevel(level, kepts);
    Path summaryFile = folder.resolve(SUMMARY_FILE);
    AtomicFiles.write(summaryFile, table.csv());
    Verdicts verdicts = Verdicts.of(table);
    Path reportFile = writeReport(folder,
        ReportInput.of(header, table, verdicts, kepts,
                ReportOptions.defaults().withIntervalLevel(level))
            .withSources(sources));
    stdout.print(table.text());
    stdout.println();
    for (String line : verdicts.lines()) {
      stdout.println(line);
    }
    for (String note : switchNotes) {
      stdout.println("switched: " + note);
    }
    long imputed = model.unknowns().stream().filter(Unknown::imputed).count();
    if (imputed > 0) {
      stdout.println(imputed + " missing observation" + (imputed == 1 ? " was" : "s were")
          + " imputed; their rows are marked 'imputed'.");
    }
    stdout.println();
    stdout.printf("seed %d (give --seed %d with --chains %d to repeat these draws)%n",
        settings.seed(), settings.seed(), settings.chains());
    stdout.println("draws:   " + drawsFile);
    stdout.println("summary: " + summaryFile);
    stdout.println("report:  " + reportFile);
    stdout.flush();
  }

  /** Renders the page and writes it atomically; returns its path. */
  private static Path writeReport(Path folder, ReportInput input) {
    Path file = folder.resolve(REPORT_FILE);
    try {
      ReportWriter.writeAtomically(file, HtmlReport.render(input));
    } catch (IOException e) {
      throw new UncheckedIOException("cannot write " + file + ": " + e.getMessage(), e);
    }
    return file;
  }
}

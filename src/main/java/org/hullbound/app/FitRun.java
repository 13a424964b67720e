package org.hullbound.app;

import java.io.IOException;
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
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.gibbs.ChainFailedException;
import org.hullbound.gibbs.DrawSink;
import org.hullbound.gibbs.DrawStore;
import org.hullbound.gibbs.MemoryBudget;
import org.hullbound.gibbs.ModelSampler;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.ReplicatedStatistics;
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
import org.hullbound.io.DrawsWriter;
import org.hullbound.io.InitialValuesFile;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataSummary;
import org.hullbound.model.TestQuantities;
import org.hullbound.model.EmptyCells;
import org.hullbound.model.Unknown;
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

/**
 * One fit from its request to its files: reads the model and data, builds the sampler, takes the
 * output folder for itself ({@link FolderLock}), runs the chains streaming every draw to {@code
 * draws.csv}, saves a checkpoint when stopped, summarises, decides the verdicts and writes the
 * summary and the report.
 *
 * <p>Two steps, so that the caller can say what is about to happen and arrange how to stop it
 * before the chains start: {@link #prepare} does every check that can refuse the run (and refuses
 * before writing anything), {@link #run} samples. {@link #close} releases the folder. Nothing here
 * prints: notes come back as values, failures as typed exceptions.
 */
public final class FitRun implements AutoCloseable {
  /** The summary table's file name in the output folder. */
  public static final String SUMMARY_FILE = "summary.csv";

  /** The HTML report's file name in the output folder. */
  public static final String REPORT_FILE = "report.html";

  /** The replicated data of predictive checks, when asked for ({@link PredictiveOptions}). */
  public static final String REPLICATES_FILE = "replicates.csv";

  /**
   * Files that mark a folder as holding an earlier run; checkpoint files start with {@code
   * checkpoint}.
   */
  public static final List<String> OUTPUT_FILES =
      List.of(DrawsWriter.FILE_NAME, SUMMARY_FILE, REPORT_FILE, RunFactsFile.FILE_NAME,
          PredictiveChecks.FILE_NAME, PredictiveChecks.SWEEPS_FILE, REPLICATES_FILE);

  private final FitRequest request;
  private final BoundModel model;
  private final ModelSampler sampler;
  private final RunSettings settings;
  private final Checkpoint checkpoint;
  private final FolderLock lock;
  private final List<String> notes;
  private final PredictiveOptions predictive;
  /** The test quantities of the predictive checks; null when they were not asked for. */
  private final TestQuantities tests;
  /** What an out-of-memory message needs to say what helps. */
  private final HeapExhaustedException.Facts heapFacts;
  private boolean sampled;

  private FitRun(
      FitRequest request, BoundModel model, ModelSampler sampler, RunSettings settings,
      Checkpoint checkpoint, FolderLock lock, List<String> notes, PredictiveOptions predictive,
      TestQuantities tests, HeapExhaustedException.Facts heapFacts) {
    this.request = request;
    this.model = model;
    this.sampler = sampler;
    this.settings = settings;
    this.checkpoint = checkpoint;
    this.lock = lock;
    this.notes = notes;
    this.predictive = predictive;
    this.tests = tests;
    this.heapFacts = heapFacts;
  }

  /**
   * Checks the request, binds the model, builds the sampler and takes the output folder.
   *
   * @throws RunRefusedException when an option is out of range, the folder is a file, is in use
   *     by another run or holds an earlier one (without {@code overwrite}), or the draws would not
   *     fit the heap
   * @throws StartingValueException when a starting value is unusable (named with its file)
   * @throws CheckpointException when the run to resume cannot be continued
   * @throws org.hullbound.lang.ModelException when the model or data are wrong
   * @throws HeapExhaustedException when the heap runs out while reading, binding or compiling
   */
  public static FitRun prepare(FitRequest request) {
    return prepare(request, PredictiveOptions.none(), StartupGuard.create());
  }

  /**
   * As {@link #prepare(FitRequest)}, also making the posterior predictive checks of {@code
   * predictive}, and taking the folder's lock through {@code guard}, so that a signal that stops
   * the start-up ({@link StartupGuard#stop()}) releases it.
   *
   * @throws StartupStoppedException when the guard was stopped before the folder was locked
   */
  public static FitRun prepare(
      FitRequest request, PredictiveOptions predictive, StartupGuard guard) {
    if (predictive == null || guard == null) {
      throw new IllegalArgumentException("predictive and guard must not be null");
    }
    checkOptions(request);
    HeapExhaustedException.Facts known =
        new HeapExhaustedException.Facts(fileBytes(request.inputs().dataFiles()), -1, -1);
    BoundModel model = HeapExhaustedException.during(
        HeapExhaustedException.Stage.READING, known, () -> request.inputs().bind());
    HeapExhaustedException.Facts bound = known.withRows(
        model.data().stream().mapToLong(DataSummary::rows).sum());
    ModelSampler sampler;
    try {
      Map<String, Double> given =
          request.initFile() == null ? Map.of() : InitialValuesFile.read(request.initFile());
      sampler = HeapExhaustedException.during(
          HeapExhaustedException.Stage.COMPILING, bound, () -> request.moves()
              ? ModelSampler.of(model, given) : ModelSampler.withoutMoves(model, given));
    } catch (StartingValueException invalid) {
      if (request.initFile() == null) {
        throw invalid;
      }
      throw new StartingValueException(request.initFile() + ": " + invalid.getMessage());
    }
    Path folder =
        request.resume() != null
            ? request.resume()
            : request.out() != null ? request.out() : Path.of("fit-out", model.name());
    if (Files.exists(folder) && !Files.isDirectory(folder)) {
      throw new RunRefusedException("--out " + folder + " is a file, not a folder");
    }
    if (request.resume() != null && !Files.isDirectory(folder)) {
      // Resuming reads the folder: a missing one is a checkpoint error, and must not be created.
      CheckpointFile.read(folder);
    }
    List<String> notes = new ArrayList<>();
    // Once here: finding them walks every term of the model.
    TestQuantities tests = predictive.checks() ? TestQuantities.of(model) : null;
    if (tests != null && tests.quantities().isEmpty()) {
      notes.add("the model has no observed modelled data, so there is nothing to check against"
          + " replicates");
    }
    for (String imputed : ImputedCells.of(model)) {
      notes.add("note: " + imputed + (request.inputs().emptyCells() == EmptyCells.IMPUTED
          ? " (--no-empty-cells refuses empty cells instead)" : ""));
    }
    if (request.resume() == null) {
      RunSettings asked = settingsOf(request, 0L);
      refuseTooMuchMemory(asked, sampler.labels().size() + model.derived().size(), notes);
    }
    FolderLock lock = guard.lock(folder);
    try {
      lock.takenOver()
          .ifPresent(
              earlier ->
                  notes.add(
                      "the run that last used " + folder + " (" + earlier + ") ended without"
                          + " releasing it; taking the folder over"));
      // Read under the lock: a run resumed at the same time may have changed the checkpoint.
      Checkpoint checkpoint =
          request.resume() == null ? null : checkpointToResume(request, sampler);
      RunSettings settings;
      if (checkpoint != null) {
        settings =
            RunSettings.of(
                checkpoint.chains().size(), checkpoint.burnIn(), checkpoint.draws(),
                checkpoint.thin(), checkpoint.seed());
        refuseTooMuchMemory(settings, sampler.labels().size() + model.derived().size(), notes);
      } else {
        settings =
            settingsOf(request,
                request.seed() != null ? request.seed() : new SecureRandom().nextLong());
        refuseToReplace(folder, request.overwrite());
      }
      if (request.threads() != null) {
        settings = settings.withThreads(request.threads());
      }
      long keptDrawBytes = MemoryBudget.of(settings.chains(), settings.draws(),
          sampler.labels().size() + model.derived().size()).bytes();
      return new FitRun(
          request, model, sampler, settings, checkpoint, lock, List.copyOf(notes), predictive,
          tests, bound.withKeptDrawBytes(keptDrawBytes));
    } catch (RuntimeException refused) {
      lock.releaseAndRemoveIfEmpty();
      throw refused;
    }
  }

  /** The model's name. */
  public String modelName() {
    return model.name();
  }

  /** The scalar unknowns sampled. */
  public int unknownCount() {
    return sampler.labels().size();
  }

  /** The settings the chains will run with, the seed included. */
  public RunSettings settings() {
    return settings;
  }

  /** The output folder. */
  public Path folder() {
    return lock.folder();
  }

  /** Whether this run continues an interrupted one. */
  public boolean resuming() {
    return checkpoint != null;
  }

  /**
   * Notes for the user found while preparing (a large share of the heap, a stale lock taken over).
   */
  public List<String> notes() {
    return notes;
  }

  /**
   * Runs the chains to their end or to {@code stop}, then writes the checkpoint (when stopped),
   * the summary and the report; returns when every file is written.
   *
   * @throws SamplingFailedException when a chain fails; the draws made before are in draws.csv
   * @throws CheckpointException when the draws file of the run to resume does not fit its
   *     checkpoint
   * @throws HeapExhaustedException when the heap runs out while sampling or summarising
   */
  public FitResult run(ProgressListener listener, StopSignal stop) {
    return run(listener, stop, ProbabilitySection.none());
  }

  /**
   * As {@link #run(ProgressListener, StopSignal)}, with the probability statements of {@code
   * probabilities} estimated from the kept draws and shown in the report, which is rendered once.
   */
  public FitResult run(
      ProgressListener listener, StopSignal stop, ProbabilitySection probabilities) {
    if (probabilities == null) {
      throw new IllegalArgumentException("probabilities must not be null");
    }
    Path folder = folder();
    Sampled done;
    try {
      done = sample(listener, stop, folder);
    } catch (OutOfMemoryError full) {
      Path drawsFile = folder.resolve(DrawsWriter.FILE_NAME);
      throw HeapExhaustedException.of(HeapExhaustedException.Stage.SAMPLING,
          heapFacts, sampled && Files.exists(drawsFile) ? drawsFile : null, full);
    }
    return HeapExhaustedException.during(
        HeapExhaustedException.Stage.SUMMARISING, heapFacts, () -> {
          saveCheckpoint(folder, done.outcome());
          return summarise(done.outcome(), done.store(), done.replicates(), probabilities, folder,
              done.startedAt(), done.elapsed());
        });
  }

  /** What the chains left for the summary. */
  private record Sampled(
      RunOutcome outcome, DrawStore store, ReplicatedStatistics replicates,
      OffsetDateTime startedAt, Duration elapsed) {}

  /** Runs the chains, streaming their draws to the files and the store. */
  private Sampled sample(ProgressListener listener, StopSignal stop, Path folder) {
    DrawStore store = DrawStore.create(settings.chains(), settings.draws(), columns().size());
    RunOutcome outcome;
    OffsetDateTime startedAt;
    long startNanos;
    if (checkpoint == null) {
      // Here, not in prepare: a run stopped before it samples leaves the earlier run's files.
      clearEarlierRun(folder, request.overwrite());
    }
    ReplicatedStatistics replicates = null;
    DrawsWriter replicatesWriter = null;
    if (predictive.checks()) {
      if (predictive.writeReplicates()) {
        List<String> columns = new ArrayList<>();
        for (int node = 0; node < tests.nodes().size(); node++) {
          columns.addAll(tests.elementLabels(node));
        }
        replicatesWriter = DrawsWriter.open(folder, REPLICATES_FILE, columns);
      }
      replicates = ReplicatedStatistics.of(
          tests, settings.chains(), settings.seed(), settings.draws(), replicatesWriter);
    }
    DrawSink kept = replicates == null ? store : both(store, replicates);
    try (DrawsWriter writer = openDraws(folder, kept);
        DrawsWriter replicatesFile = replicatesWriter) {
      sampled = true;
      DrawSink both =
          DerivedColumns.of(
              both(writer, kept), model.derived(), sampler.labels().size(), settings.chains());
      startedAt = OffsetDateTime.now();
      startNanos = System.nanoTime();
      try {
        outcome =
            InMemoryFit.runChains(
                sampler, settings, both, listener, stop,
                checkpoint == null ? List.of() : checkpoint.chains());
      } catch (RuntimeException failed) {
        OutOfMemoryError full = outOfMemoryIn(failed);
        if (full != null) {
          throw HeapExhaustedException.of(
              HeapExhaustedException.Stage.SAMPLING, heapFacts, writer.file(), full);
        }
        if (failed instanceof ChainFailedException) {
          throw new SamplingFailedException(
              "sampling failed: " + failed.getMessage(), writer.file(), failed);
        }
        throw failed;
      }
    }
    Duration elapsed = Duration.ofNanos(Math.max(0, System.nanoTime() - startNanos));
    return new Sampled(outcome, store, replicates, startedAt, elapsed);
  }

  /**
   * The out-of-memory error behind {@code failure}, or null: a chain that runs out of heap
   * fails with it as its cause, and one that runs out between sweeps with it deeper.
   */
  private static OutOfMemoryError outOfMemoryIn(Throwable failure) {
    for (Throwable cause = failure; cause != null; cause = cause.getCause()) {
      if (cause instanceof OutOfMemoryError full) {
        return full;
      }
    }
    return null;
  }

  /** The size of {@code files} in bytes, those that cannot be read left out. */
  private static long fileBytes(List<Path> files) {
    long total = 0;
    for (Path file : files) {
      try {
        total += Files.size(file);
      } catch (IOException | SecurityException unreadable) {
        // reading it will say what is wrong
      }
    }
    return total;
  }

  private static DrawSink both(DrawSink first, DrawSink second) {
    return (chain, draw, values) -> {
      first.accept(chain, draw, values);
      second.accept(chain, draw, values);
    };
  }

  /**
   * Releases the folder; when the run was refused or failed before its draws file was opened, also
   * removes the folders it created.
   */
  @Override
  public void close() {
    if (sampled) {
      lock.close();
    } else {
      lock.releaseAndRemoveIfEmpty();
    }
  }

  static void checkOptions(FitRequest request) {
    if (request.out() != null && request.out().toString().isBlank()) {
      throw new RunRefusedException("--out must name a folder, got an empty name");
    }
    requireAtLeast("--chains", request.chains(), 1);
    requireAtLeast("--draws", request.draws(), 1);
    requireAtLeast("--burn-in", request.burnIn(), 0);
    requireAtLeast("--thin", request.thin(), 1);
    requireAtLeast("--threads", request.threads(), 1);
    long sweeps =
        orDefault(request.burnIn(), RunSettings.DEFAULT_BURN_IN)
            + (long) orDefault(request.draws(), RunSettings.DEFAULT_DRAWS)
                * orDefault(request.thin(), 1);
    if (sweeps > Integer.MAX_VALUE) {
      throw new RunRefusedException(
          "--burn-in + --draws x --thin must be at most " + Integer.MAX_VALUE);
    }
  }

  private static void requireAtLeast(String option, Integer value, int least) {
    if (value != null && value < least) {
      throw new RunRefusedException(option + " must be at least " + least + ", got " + value);
    }
  }

  private static RunSettings settingsOf(FitRequest request, long seed) {
    return RunSettings.of(
        orDefault(request.chains(), RunSettings.DEFAULT_CHAINS),
        orDefault(request.burnIn(), RunSettings.DEFAULT_BURN_IN),
        orDefault(request.draws(), RunSettings.DEFAULT_DRAWS),
        orDefault(request.thin(), 1),
        seed);
  }

  private static int orDefault(Integer value, int otherwise) {
    return value != null ? value : otherwise;
  }

  /**
   * The checkpoint in the folder to resume, checked against this model, its data and the options
   * given: a finished run, another model or data, or other settings are refused.
   */
  private static Checkpoint checkpointToResume(FitRequest request, ModelSampler sampler) {
    Path resumeFolder = request.resume();
    Checkpoint checkpoint = CheckpointFile.read(resumeFolder);
    if (checkpoint.complete()) {
      throw new CheckpointException(
          "the run in " + resumeFolder + " is finished (its checkpoint is marked complete):"
              + " nothing to resume");
    }
    if (!checkpoint.inputHash().equals(request.inputs().inputHash())) {
      throw new CheckpointException(
          "the model or data changed since the run in " + resumeFolder + " was interrupted (it ran "
              + checkpoint.modelFile() + " with other model or data text): resuming would mix"
              + " draws of two models; start a new fit instead");
    }
    if (!checkpoint.columns().equals(sampler.labels())) {
      throw new CheckpointException(
          "the checkpoint in " + resumeFolder + " has other unknowns than this model");
    }
    int updaters = checkpoint.chains().get(0).kernel().updaters().size();
    List<UpdateRule> rules = sampler.sampler().rules();
    if (updaters != rules.size()) {
      // the moves along lines are extra updaters: a run with and one without them differ here;
      // any other count is another sampler for this model (another version's analysis)
      int moves = (int) rules.stream().filter(UpdateRule.Move.class::isInstance).count();
      boolean otherMoves = request.moves() ? updaters == rules.size() - moves
          : updaters > rules.size();
      if (!otherMoves) {
        throw new CheckpointException(
            "the run in " + resumeFolder + " has " + updaters + " updaters per chain, but this"
                + " version samples the model with " + rules.size() + ": it was made by another"
                + " version of hullbound and cannot be continued to the draws it would have"
                + " made; start a new fit");
      }
      throw new CheckpointException(
          "the run in " + resumeFolder + " was made " + (request.moves() ? "with --no-moves"
              : "with the moves along lines") + "; resume it " + (request.moves()
              ? "with --no-moves" : "without --no-moves") + ", as it was started");
    }
    List<String> conflicts = new ArrayList<>();
    conflict(conflicts, "--chains", request.chains(), checkpoint.chains().size());
    conflict(conflicts, "--burn-in", request.burnIn(), checkpoint.burnIn());
    conflict(conflicts, "--draws", request.draws(), checkpoint.draws());
    conflict(conflicts, "--thin", request.thin(), checkpoint.thin());
    if (request.seed() != null && request.seed() != checkpoint.seed()) {
      conflicts.add("--seed " + checkpoint.seed());
    }
    if (request.out() != null
        && !request.out().toAbsolutePath().normalize()
            .equals(resumeFolder.toAbsolutePath().normalize())) {
      conflicts.add("--out " + resumeFolder);
    }
    if (!conflicts.isEmpty()) {
      throw new CheckpointException(
          "the run in " + resumeFolder + " was made with " + String.join(", ", conflicts)
              + "; a resumed run keeps its settings (leave these options out)");
    }
    return checkpoint;
  }

  private static void conflict(List<String> conflicts, String option, Integer given, int saved) {
    if (given != null && given != saved) {
      conflicts.add(option + " " + saved);
    }
  }

  /** The columns of draws.csv: every scalar unknown, then the kept derived quantities. */
  public List<String> columns() {
    List<String> columns = new ArrayList<>(sampler.labels());
    columns.addAll(model.derived().labels());
    return columns;
  }

  /** A new draws file, or the checkpointed one continued (its draws handed to {@code store}). */
  private DrawsWriter openDraws(Path folder, DrawSink store) {
    if (checkpoint == null) {
      return DrawsWriter.open(folder, columns());
    }
    int[] kept = new int[checkpoint.chains().size()];
    for (int chain = 0; chain < kept.length; chain++) {
      kept[chain] = checkpoint.chains().get(chain).draws();
    }
    return DrawsWriter.resume(folder, columns(), kept, store);
  }

  /**
   * After the chains stopped: an interrupted run saves where every chain stood; a run that
   * reached its end marks an existing checkpoint complete, so that it is not resumed twice.
   */
  private void saveCheckpoint(Path folder, RunOutcome outcome) {
    if (outcome.chainStates().isEmpty()) {
      return;
    }
    if (outcome.stoppedEarly() || checkpoint != null) {
      Checkpoint now =
          new Checkpoint(
              !outcome.stoppedEarly(), request.inputs().modelFile().toString(),
              request.inputs().inputHash(), settings.seed(), settings.burnIn(), settings.draws(),
              settings.thin(), sampler.labels(), outcome.chainStates());
      CheckpointFile.write(folder, now);
    }
  }

  /**
   * Why the run would not fit the heap, thrown; adds a note when it fits but is a large share of
   * it (see {@link MemoryBudget}).
   */
  private static void refuseTooMuchMemory(RunSettings settings, int unknowns, List<String> notes) {
    MemoryBudget budget = MemoryBudget.of(settings.chains(), settings.draws(), unknowns);
    long heap = Runtime.getRuntime().maxMemory();
    String figure =
        settings.chains() + " chains x " + settings.draws() + " draws x " + unknowns
            + " unknowns will hold about " + MemoryBudget.describe(budget.bytes())
            + " of draws in memory";
    switch (budget.against(heap)) {
      case REFUSE:
        throw new RunRefusedException(
            figure + ", more than " + Math.round(100 * MemoryBudget.REFUSE_SHARE)
                + "% of the Java heap (" + MemoryBudget.describe(heap) + "); keep fewer draws"
                + " (--thin K keeps every K-th sweep, or a smaller --draws) or give Java more"
                + " memory (HULLBOUND_JAVA_OPTS=-Xmx8g ./hullbound fit ...)");
      case NOTE:
        notes.add("note: " + figure + " (the Java heap is " + MemoryBudget.describe(heap) + ")");
        return;
      default:
        return;
    }
  }

  /**
   * Refuses to write over an earlier run's files unless {@code overwrite}; a resumed run skips
   * this.
   */
  private static void refuseToReplace(Path folder, boolean overwrite) {
    List<String> found = earlierRunFiles(folder);
    if (!found.isEmpty() && !overwrite) {
      throw new RunRefusedException(
          "the folder " + folder + " holds an earlier run (" + String.join(", ", found)
              + "); give --overwrite to replace it, or --out with another folder");
    }
  }

  /** With {@code overwrite}, deletes the earlier run's files so none outlives this run. */
  private static void clearEarlierRun(Path folder, boolean overwrite) {
    if (!overwrite) {
      return;
    }
    try {
      for (String name : earlierRunFiles(folder)) {
        Files.deleteIfExists(folder.resolve(name));
      }
    } catch (IOException e) {
      throw new UncheckedIOException(
          "cannot remove the earlier run in " + folder + ": " + e.getMessage(), e);
    }
  }

  private static List<String> earlierRunFiles(Path folder) {
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
    } catch (IOException e) {
      throw new UncheckedIOException("cannot list " + folder + ": " + e.getMessage(), e);
    }
    return found;
  }

  private FitResult summarise(
      RunOutcome outcome, DrawStore store, ReplicatedStatistics replicates,
      ProbabilitySection probabilities, Path folder, OffsetDateTime startedAt, Duration elapsed) {
    List<String> labels = sampler.labels();
    int kept = store.commonDraws();
    int[] summarised = store.chainsWithDraws();
    Path drawsFile = folder.resolve(DrawsWriter.FILE_NAME);
    long imputed = model.unknowns().stream().filter(Unknown::imputed).count();
    RunHeader header =
        new RunHeader(model.name(), startedAt,
            summarised.length > 0 ? summarised.length : settings.chains(), kept,
            settings.burnIn(), settings.seed(), elapsed);
    RunSources sources =
        RunFactsFile.sources(request.inputs().modelText(), model.data());
    RunFactsFile.write(folder, header, sources);
    if (kept == 0) {
      Path reportFile = writeReport(folder, new ReportInput(header,
          List.of("No draws were kept (the run stopped during burn-in), so there is no summary."),
          "", List.of(), ReportOptions.defaults(), sources), PredictiveChecks.none(),
          ProbabilityTable.none());
      return new FitResult(
          model.name(), settings, folder, outcome.stoppedEarly(), kept, summarised,
          java.util.Optional.empty(), List.of(), imputed, drawsFile, reportFile);
    }
    List<UpdateReport> reports = UpdateReport.of(labels.size(), outcome.kernels());
    boolean[] chosenFallback = chosenFallback(labels.size());
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
        fact = UpdateFacts.switchedToFallback(
            method, update.evaluationsPerDraw(), update.firstSwitchSweep());
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
    List<String> derivedLabels = model.derived().labels();
    for (int k = 0; k < derivedLabels.size(); k++) {
      Draws draws = Draws.of(store.draws(labels.size() + k));
      kepts.add(draws);
      summaries.add(PosteriorSummary.of(derivedLabels.get(k), draws));
      facts.put(derivedLabels.get(k), UpdateFacts.derived());
    }
    SummaryTable table =
        SummaryTable.of(summaries, facts).withIntervalLevel(request.level(), kepts);
    Path summaryFile = folder.resolve(SUMMARY_FILE);
    AtomicFiles.write(summaryFile, table.csv());
    Map<String, Draws> drawsByLabel = new LinkedHashMap<>();
    for (int k = 0; k < summaries.size(); k++) {
      drawsByLabel.put(summaries.get(k).name(), kepts.get(k));
    }
    Verdicts verdicts = Verdicts.of(table).withLabelSwitching(model.components(), drawsByLabel);
    PredictiveChecks checks = PredictiveChecks.none();
    if (replicates != null) {
      checks = predictiveChecks(replicates);
      AtomicFiles.write(folder.resolve(PredictiveChecks.FILE_NAME), checks.csv());
      writeCheckSweeps(folder, replicates);
    }
    ReportInput page =
        ReportInput.of(header, table, verdicts, kepts,
                ReportOptions.defaults().withIntervalLevel(request.level()))
            .withSources(sources);
    List<String> columns = columns();
    ProbabilityTable statements =
        probabilities.of(label -> store.draws(requireColumn(columns, label)));
    Path reportFile = writeReport(folder, page, checks, statements);
    return new FitResult(
        model.name(), settings, folder, outcome.stoppedEarly(), kept, summarised,
        java.util.Optional.of(new FitResult.Summary(table, verdicts, summaryFile, checks, page)),
        switchNotes, imputed, drawsFile, reportFile);
  }

  /** The p-values of every test quantity, from the draws the summary uses. */
  static PredictiveChecks predictiveChecks(ReplicatedStatistics replicates) {
    List<PredictiveChecks.Input> inputs = new ArrayList<>();
    List<TestQuantities.Quantity> quantities = replicates.quantities();
    for (int q = 0; q < quantities.size(); q++) {
      TestQuantities.Quantity quantity = quantities.get(q);
      inputs.add(new PredictiveChecks.Input(
          quantity.node(), quantity.statistic(), quantity.fromModelFile(),
          replicates.observed(q), replicates.replicated(q)));
    }
    return PredictiveChecks.of(inputs);
  }

  /**
   * Every quantity's observed and replicated value of every kept sweep, to {@link
   * PredictiveChecks#SWEEPS_FILE}: {@code report DIR} draws the panels from it again.
   */
  private static void writeCheckSweeps(Path folder, ReplicatedStatistics replicates) {
    List<TestQuantities.Quantity> quantities = replicates.quantities();
    List<String> columns = new ArrayList<>();
    for (TestQuantities.Quantity quantity : quantities) {
      for (String side : List.of("observed", "replicated")) {
        columns.add(PredictiveChecks.sweepColumn(
            quantity.node(), quantity.statistic(), quantity.fromModelFile(), side));
      }
    }
    if (quantities.isEmpty()) {
      return;
    }
    double[][][] observed = new double[quantities.size()][][];
    double[][][] replicated = new double[quantities.size()][][];
    for (int q = 0; q < quantities.size(); q++) {
      observed[q] = replicates.observed(q);
      replicated[q] = replicates.replicated(q);
    }
    try (DrawsWriter writer = DrawsWriter.open(folder, PredictiveChecks.SWEEPS_FILE, columns)) {
      double[] row = new double[columns.size()];
      for (int chain = 0; chain < observed[0].length; chain++) {
        for (int draw = 0; draw < observed[0][chain].length; draw++) {
          for (int q = 0; q < quantities.size(); q++) {
            row[2 * q] = observed[q][chain][draw];
            row[2 * q + 1] = replicated[q][chain][draw];
          }
          writer.accept(chain, draw + 1, row);
        }
      }
    }
  }

  /** Which state entries the model's analysis gave to the fallback from the start. */
  private boolean[] chosenFallback(int size) {
    boolean[] chosen = new boolean[size];
    UpdateRule.Visitor<Boolean> isFallback =
        new UpdateRule.Visitor<>() {
          @Override
          public Boolean conjugate(UpdateRule.Conjugate rule) {
            return false;
          }

          @Override
          public Boolean blockNormal(UpdateRule.BlockNormal rule) {
            return false;
          }

          @Override
          public Boolean adaptiveRejection(UpdateRule.AdaptiveRejection rule) {
            return false;
          }

          @Override
          public Boolean fallback(UpdateRule.Fallback rule) {
            return true;
          }

          @Override
          public Boolean move(UpdateRule.Move rule) {
            return false;
          }

          @Override
          public Boolean discrete(UpdateRule.Discrete rule) {
            return false;
          }
        };
    for (UpdateRule rule : sampler.sampler().rules()) {
      if (rule.extra()) {
        continue;
      }
      boolean fallback = rule.accept(isFallback);
      for (int index : rule.indices()) {
        chosen[index] = fallback;
      }
    }
    return chosen;
  }

  /** The index of {@code label} among the draws' columns. */
  private static int requireColumn(List<String> columns, String label) {
    int index = columns.indexOf(label);
    if (index < 0) {
      throw new IllegalArgumentException("there is no column " + label + " among " + columns);
    }
    return index;
  }

  /** Renders the page once and writes it atomically; returns its path. */
  private static Path writeReport(
      Path folder, ReportInput input, PredictiveChecks checks, ProbabilityTable probabilities) {
    Path file = folder.resolve(REPORT_FILE);
    try {
      ReportWriter.writeAtomically(file, HtmlReport.render(input, checks, probabilities));
    } catch (IOException e) {
      throw new UncheckedIOException("cannot write " + file + ": " + e.getMessage(), e);
    }
    return file;
  }
}

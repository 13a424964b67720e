package org.hullbound.app;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.io.RowWrites;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Statement;
import org.hullbound.model.EmptyCells;
import org.hullbound.report.SummaryTable;

/**
 * A batch of fits: one model fitted to each unit's data ({@link UnitFit}), the units run as tasks
 * of a {@link TaskEngine} (the local cores, or Spark), the results gathered into two files:
 * {@value #SUMMARY_FILE} (the unit, then the columns of {@code fit}'s summary.csv, one row per unit
 * and unknown) and {@value #UNITS_FILE} (one row per unit: its seed, its status and its verdict or
 * error).
 *
 * <p>As {@link FitRun}: {@link #prepare} does every check that can refuse the whole run (options,
 * the model's text, an earlier batch in the folder, a batch to resume that does not match) before
 * any unit starts, {@link #run} fits. Each unit's rows are written as it finishes ({@link
 * BatchTables}), so that a stop, a unit's task that fails or a full disk keeps every unit that
 * finished before; {@link BatchRequest#resume()} then fits the others with the same seeds. A batch
 * that finishes writes its tables again in the units' input order, so that its files depend on the
 * units and the seed only, not on the engine, its workers or an interruption.
 */
public final class BatchRun implements AutoCloseable {
  /** The summary over all units. */
  public static final String SUMMARY_FILE = "summary.csv";

  /** One row per unit: seed, status, verdict or error. */
  public static final String UNITS_FILE = "units.csv";

  /** The columns of {@value #UNITS_FILE}. */
  public static final List<String> UNITS_HEADER = List.of("unit", "seed", "status", "verdict");

  private final BatchRequest request;
  private final String modelName;
  private final BatchFacts facts;
  private final FolderLock lock;
  /** The rows of the units a resumed batch had finished, by unit; empty for a new batch. */
  private final Map<String, BatchTables.Written> finishedBefore;

  private BatchRun(
      BatchRequest request, String modelName, BatchFacts facts, FolderLock lock,
      Map<String, BatchTables.Written> finishedBefore) {
    this.request = request;
    this.modelName = modelName;
    this.facts = facts;
    this.lock = lock;
    this.finishedBefore = finishedBefore;
  }

  /**
   * Checks the request and the model's text, and takes the output folder.
   *
   * @throws RunRefusedException when an option is out of range, there is no unit, two units share
   *     a name, the folder holds an earlier batch (without {@code overwrite}), or the batch to
   *     resume is finished or was made with another model, other data or other settings
   * @throws org.hullbound.lang.ModelException when the model file is not a model
   */
  public static BatchRun prepare(BatchRequest request) {
    return prepare(request, StartupGuard.create());
  }

  /**
   * As {@link #prepare(BatchRequest)}, taking the folder's lock through {@code guard}, so that a
   * signal that stops the start-up ({@link StartupGuard#stop()}) releases it.
   *
   * @throws StartupStoppedException when the guard was stopped before the folder was locked
   */
  public static BatchRun prepare(BatchRequest request, StartupGuard guard) {
    if (guard == null) {
      throw new IllegalArgumentException("guard must not be null");
    }
    ModelInputs modelOnly = new ModelInputs(request.modelFile(), List.of(), request.emptyCells());
    double level = request.level() != null ? request.level() : SummaryTable.INTERVAL_LEVEL;
    FitRun.checkOptions(
        new FitRequest(modelOnly, null, request.chains(), request.burnIn(), request.draws(),
            request.thin(), request.seed(), null, request.out(), null, request.overwrite(),
            level));
    if (request.units().isEmpty()) {
      throw new RunRefusedException("the batch has no unit");
    }
    Set<String> names = new HashSet<>();
    for (UnitData unit : request.units()) {
      if (!names.add(unit.name())) {
        throw new RunRefusedException("two units are named '" + unit.name() + "'");
      }
      if (unit.name().contains("\n") || unit.name().contains("\r")) {
        throw new RunRefusedException(
            "the unit name '" + unit.name().replaceAll("[\r\n]", "\\\\n") + "' holds a line"
                + " break; a unit's name is one line");
      }
    }
    String modelName = modelName(modelOnly.parse(), request.modelFile());
    String inputHash = BatchFacts.hashOf(modelOnly.modelText(), request.units());
    Path folder =
        request.resume() != null
            ? request.resume()
            : request.out() != null ? request.out() : Path.of("fit-units-out", modelName);
    if (Files.exists(folder) && !Files.isDirectory(folder)) {
      throw new RunRefusedException("--out " + folder + " is a file, not a folder");
    }
    if (request.resume() != null) {
      if (!Files.isDirectory(folder)) {
        // resuming reads the folder: a missing one must not be created
        BatchFacts.read(folder);
      }
    } else {
      List<String> earlier = earlierFiles(folder);
      if (!earlier.isEmpty() && !request.overwrite()) {
        throw new RunRefusedException(
            "the folder " + folder + " holds an earlier batch (" + String.join(", ", earlier)
                + "); give --overwrite to replace it, --resume " + folder + " to continue it if"
                + " it was stopped, or --out with another folder");
      }
    }
    FolderLock lock = guard.lock(folder);
    try {
      BatchFacts facts;
      Map<String, BatchTables.Written> finishedBefore;
      if (request.resume() != null) {
        // read under the lock: the batch may have been running until a moment ago
        facts = resumable(request, level, inputHash);
        finishedBefore = BatchTables.read(folder);
        if (request.units().stream().allMatch(unit -> finishedBefore.containsKey(unit.name()))) {
          throw new RunRefusedException(
              "the batch in " + folder + " is finished (every unit has its row in " + UNITS_FILE
                  + "): nothing to resume");
        }
      } else {
        long seed = request.seed() != null ? request.seed() : new SecureRandom().nextLong();
        facts =
            new BatchFacts(
                request.modelFile().getFileName().toString(), inputHash, request.units().size(),
                new BatchSettings(
                    orDefault(request.chains(), RunSettings.DEFAULT_CHAINS),
                    orDefault(request.burnIn(), RunSettings.DEFAULT_BURN_IN),
                    orDefault(request.draws(), RunSettings.DEFAULT_DRAWS),
                    orDefault(request.thin(), 1), seed, level, request.emptyCells(),
                    folder.toString(), request.keepDraws()));
        finishedBefore = Map.of();
      }
      return new BatchRun(request, modelName, facts, lock, finishedBefore);
    } catch (RuntimeException refused) {
      lock.releaseAndRemoveIfEmpty();
      throw refused;
    }
  }

  /**
   * The facts of the batch to resume, checked against this request: the same model and units
   * (by their hash), and every option given equal to the batch's.
   */
  private static BatchFacts resumable(BatchRequest request, double level, String inputHash) {
    Path folder = request.resume();
    BatchFacts facts = BatchFacts.read(folder);
    if (!facts.inputHash().equals(inputHash)) {
      throw new RunRefusedException(
          "the model or the units' data changed since the batch in " + folder + " was stopped (it"
              + " fitted " + facts.modelFile() + " to " + facts.units() + " units with other text):"
              + " resuming would mix two batches; start a new one instead");
    }
    BatchSettings saved = facts.settings();
    List<String> conflicts = new ArrayList<>();
    conflict(conflicts, "--chains", request.chains(), saved.chains());
    conflict(conflicts, "--burn-in", request.burnIn(), saved.burnIn());
    conflict(conflicts, "--draws", request.draws(), saved.draws());
    conflict(conflicts, "--thin", request.thin(), saved.thin());
    if (request.seed() != null && request.seed() != saved.seed()) {
      conflicts.add("--seed " + saved.seed());
    }
    if (request.level() != null && level != saved.level()) {
      conflicts.add("--level " + saved.level());
    }
    if (request.emptyCells() != EmptyCells.IMPUTED && saved.emptyCells() == EmptyCells.IMPUTED) {
      conflicts.add("empty cells imputed (without --no-empty-cells)");
    }
    if (request.keepDraws() && !saved.keepDraws()) {
      conflicts.add("no --keep-draws");
    }
    if (request.out() != null
        && !request.out().toAbsolutePath().normalize()
            .equals(folder.toAbsolutePath().normalize())) {
      conflicts.add("--out " + folder);
    }
    if (!conflicts.isEmpty()) {
      throw new RunRefusedException(
          "the batch in " + folder + " was made with " + String.join(", ", conflicts)
              + "; a resumed batch keeps its settings (leave these options out)");
    }
    return new BatchFacts(
        facts.modelFile(), facts.inputHash(), facts.units(),
        new BatchSettings(
            saved.chains(), saved.burnIn(), saved.draws(), saved.thin(), saved.seed(),
            saved.level(), saved.emptyCells(), folder.toString(), saved.keepDraws()));
  }

  private static void conflict(
      List<String> conflicts, String option, Integer given, Integer saved) {
    if (given != null && !given.equals(saved)) {
      conflicts.add(option + " " + saved);
    }
  }

  private static int orDefault(Integer value, int otherwise) {
    return value != null ? value : otherwise;
  }

  /** The model's name. */
  public String modelName() {
    return modelName;
  }

  /** The run's seed, from which each unit's is derived. */
  public long seed() {
    return facts.settings().seed();
  }

  /** The output folder. */
  public Path folder() {
    return lock.folder();
  }

  /** The number of units. */
  public int unitCount() {
    return request.units().size();
  }

  /** Whether this batch continues a stopped one. */
  public boolean resuming() {
    return request.resume() != null;
  }

  /** How many units a resumed batch had finished before (0 for a new batch). */
  public int finishedBefore() {
    return finishedBefore.size();
  }

  /** The settings every unit is fitted with (the run's seed included). */
  public BatchSettings settings() {
    return facts.settings();
  }

  /** The task that fits one unit: what {@link #run} hands to the engine. */
  public UnitFit task() {
    ModelInputs modelOnly = new ModelInputs(request.modelFile(), List.of(), request.emptyCells());
    return UnitFit.of(
        request.modelFile().getFileName().toString(), modelOnly.modelText(), settings());
  }

  /** {@link #run(TaskEngine, TaskEngine.Progress, StopSignal)} to the end. */
  public BatchResult run(TaskEngine engine, TaskEngine.Progress progress) {
    return run(engine, progress, StopSignal.create());
  }

  /**
   * Fits every unit not finished yet on {@code engine}, writing each unit's rows as it finishes
   * and telling {@code progress}; a unit that fails is a row of its own and the others go on.
   * Once {@code stop} is requested, no unit begins and running ones are given up (their rows are
   * not written; a resume fits them again): the result then holds the finished units only.
   *
   * @throws BatchStoppedException when a unit's task fails (rather than its fit) or a table
   *     cannot be written; every unit finished before is in the tables
   */
  public BatchResult run(TaskEngine engine, TaskEngine.Progress progress, StopSignal stop) {
    return run(engine, progress, stop, FileChannel::write);
  }

  /**
   * {@link #run(TaskEngine, TaskEngine.Progress, StopSignal)} writing its tables through {@code
   * writes}: tests inject a full disk.
   */
  BatchResult run(
      TaskEngine engine, TaskEngine.Progress progress, StopSignal stop, RowWrites writes) {
    Path folder = folder();
    Path units = folder.resolve(UnitFit.UNITS_FOLDER);
    List<UnitData> left = new ArrayList<>();
    for (UnitData unit : request.units()) {
      if (!finishedBefore.containsKey(unit.name())) {
        left.add(unit);
      }
    }
    BatchTables tables;
    if (resuming()) {
      // a unit given up when the batch stopped may have left its folder: it starts afresh
      for (UnitData unit : left) {
        Path own = UnitFit.folderOf(folder, unit.name(), UnitSeeds.of(seed(), unit.name()));
        if (Files.exists(own)) {
          UnitFit.deleteTree(own);
        }
      }
      tables = BatchTables.resume(folder, finishedBefore, writes);
    } else {
      try {
        // Here, not in prepare: a refused run leaves the earlier batch as it was.
        Files.deleteIfExists(folder.resolve(SUMMARY_FILE));
        Files.deleteIfExists(folder.resolve(UNITS_FILE));
        Files.deleteIfExists(folder.resolve(BatchFacts.FILE_NAME));
      } catch (IOException e) {
        throw new UncheckedIOException(
            "cannot remove the earlier batch in " + folder + ": " + e.getMessage(), e);
      }
      if (Files.isDirectory(units)) {
        UnitFit.deleteTree(units);
      }
      facts.write(folder);
      tables = BatchTables.start(folder, writes);
    }
    int doneBefore = finishedBefore.size();
    int failedBefore = (int) finishedBefore.values().stream()
        .filter(rows -> UnitOutcome.FAILED.equals(rows.unitRow().get(2))).count();
    int total = request.units().size();
    try (tables) {
      engine.each(
          left, task(), (index, outcome) -> tables.append(outcome),
          (done, failed, all) -> progress.update(doneBefore + done, failedBefore + failed, total),
          stop);
    } catch (RuntimeException | Error failed) {
      stop.request();
      throw stopped(failed, tables.finishedUnits().size());
    }
    List<UnitOutcome> outcomes = new ArrayList<>();
    for (UnitData unit : request.units()) {
      BatchTables.Written rows = tables.rowsOf(unit.name());
      if (rows != null) {
        outcomes.add(outcomeOf(rows));
      }
    }
    if (outcomes.size() == total) {
      try {
        tables.inOrder(request.units().stream().map(UnitData::name).toList());
      } catch (UncheckedIOException cannot) {
        throw stopped(cannot, total);
      }
      removeIfEmpty(units);
    }
    return new BatchResult(
        modelName, seed(), folder, outcomes, total, folder.resolve(SUMMARY_FILE),
        folder.resolve(UNITS_FILE));
  }

  private BatchStoppedException stopped(Throwable failed, int finished) {
    String what =
        failed instanceof UncheckedIOException io
            ? io.getMessage()
            : "a unit's task failed: " + (failed instanceof RuntimeException unchecked
                ? UnitFit.message(unchecked) : failed.toString());
    return new BatchStoppedException(
        what + "; the " + finished + " of " + request.units().size() + " units that finished"
            + " are kept in " + folder() + " (" + SUMMARY_FILE + ", " + UNITS_FILE + "); --resume "
            + folder() + " fits the others",
        failed);
  }

  /** A unit's outcome as its rows in the tables give it. */
  private static UnitOutcome outcomeOf(BatchTables.Written rows) {
    List<String> unitRow = rows.unitRow();
    List<List<String>> summary = new ArrayList<>();
    for (List<String> row : rows.summaryRows()) {
      summary.add(row.subList(1, row.size()));
    }
    return new UnitOutcome(
        unitRow.get(0), Long.parseLong(unitRow.get(1)), unitRow.get(2), summary, unitRow.get(3));
  }

  /** Removes the units folder when no unit left its own folder in it. */
  private static void removeIfEmpty(Path units) {
    try {
      if (Files.isDirectory(units)) {
        try (var left = Files.list(units)) {
          if (left.findAny().isEmpty()) {
            Files.delete(units);
          }
        }
      }
    } catch (IOException e) {
      throw new UncheckedIOException("cannot tidy " + units + ": " + e.getMessage(), e);
    }
  }

  /** Releases the folder. */
  @Override
  public void close() {
    lock.close();
  }

  /** The name the model gives itself ({@code model NAME}), else its file's name without .hbm. */
  private static String modelName(ModelFile parsed, Path modelFile) {
    for (Statement statement : parsed.statements()) {
      if (statement instanceof Statement.ModelName named) {
        return named.name().text();
      }
    }
    return modelFile.getFileName().toString().replaceFirst("\\.hbm$", "");
  }

  /** An earlier batch's files in {@code folder}. */
  private static List<String> earlierFiles(Path folder) {
    List<String> found = new ArrayList<>();
    for (String name
        : List.of(SUMMARY_FILE, UNITS_FILE, BatchFacts.FILE_NAME, UnitFit.UNITS_FOLDER)) {
      if (Files.exists(folder.resolve(name))) {
        found.add(name);
      }
    }
    return found;
  }
}

package org.hullbound.app;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.hullbound.io.AtomicFiles;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Statement;
import org.hullbound.report.SummaryTable;

/**
 * A batch of fits: one model fitted to each unit's data ({@link UnitFit}), the units run as tasks
 * of a {@link TaskEngine} (the local cores, or Spark), the results gathered into two files:
 * {@value #SUMMARY_FILE} (the unit, then the columns of {@code fit}'s summary.csv, one row per unit
 * and unknown) and {@value #UNITS_FILE} (one row per unit: its seed, its status and its verdict or
 * error).
 *
 * <p>As {@link FitRun}: {@link #prepare} does every check that can refuse the whole run (options,
 * the model's text, an earlier batch in the folder) before any unit starts, {@link #run} fits.
 * The files depend on the units and the seed only, not on the engine or its workers.
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
  private final long seed;
  private final FolderLock lock;

  private BatchRun(BatchRequest request, String modelName, long seed, FolderLock lock) {
    this.request = request;
    this.modelName = modelName;
    this.seed = seed;
    this.lock = lock;
  }

  /**
   * Checks the request and the model's text, and takes the output folder.
   *
   * @throws RunRefusedException when an option is out of range, there is no unit, two units share
   *     a name, or the folder holds an earlier batch (without {@code overwrite})
   * @throws org.hullbound.lang.ModelException when the model file is not a model
   */
  public static BatchRun prepare(BatchRequest request) {
    ModelInputs modelOnly = new ModelInputs(request.modelFile(), List.of(), request.emptyCells());
    FitRun.checkOptions(
        new FitRequest(modelOnly, null, request.chains(), request.burnIn(), request.draws(),
            request.thin(), request.seed(), null, request.out(), null, request.overwrite(),
            request.level()));
    if (request.units().isEmpty()) {
      throw new RunRefusedException("the batch has no unit");
    }
    Set<String> names = new HashSet<>();
    for (UnitData unit : request.units()) {
      if (!names.add(unit.name())) {
        throw new RunRefusedException("two units are named '" + unit.name() + "'");
      }
    }
    String modelName = modelName(modelOnly.parse(), request.modelFile());
    Path folder = request.out() != null ? request.out() : Path.of("fit-units-out", modelName);
    if (Files.exists(folder) && !Files.isDirectory(folder)) {
      throw new RunRefusedException("--out " + folder + " is a file, not a folder");
    }
    List<String> earlier = earlierFiles(folder);
    if (!earlier.isEmpty() && !request.overwrite()) {
      throw new RunRefusedException(
          "the folder " + folder + " holds an earlier batch (" + String.join(", ", earlier)
              + "); give --overwrite to replace it, or --out with another folder");
    }
    FolderLock lock = FolderLock.take(folder);
    long seed = request.seed() != null ? request.seed() : new SecureRandom().nextLong();
    return new BatchRun(request, modelName, seed, lock);
  }

  /** The model's name. */
  public String modelName() {
    return modelName;
  }

  /** The run's seed, from which each unit's is derived. */
  public long seed() {
    return seed;
  }

  /** The output folder. */
  public Path folder() {
    return lock.folder();
  }

  /** The number of units. */
  public int unitCount() {
    return request.units().size();
  }

  /** The settings every unit is fitted with (the run's seed included). */
  public BatchSettings settings() {
    return new BatchSettings(
        request.chains(), request.burnIn(), request.draws(), request.thin(), seed,
        request.level(), request.emptyCells(), folder().toString(), request.keepDraws());
  }

  /** The task that fits one unit: what {@link #run} hands to the engine. */
  public UnitFit task() {
    ModelInputs modelOnly = new ModelInputs(request.modelFile(), List.of(), request.emptyCells());
    return UnitFit.of(
        request.modelFile().getFileName().toString(), modelOnly.modelText(), settings());
  }

  /**
   * Fits every unit on {@code engine}, telling {@code progress} as units finish, then writes the
   * two tables; a unit that fails is a row of its own and the others go on.
   */
  public BatchResult run(TaskEngine engine, TaskEngine.Progress progress) {
    Path folder = folder();
    Path units = folder.resolve(UnitFit.UNITS_FOLDER);
    try {
      // Here, not in prepare: a refused run leaves the earlier batch as it was.
      Files.deleteIfExists(folder.resolve(SUMMARY_FILE));
      Files.deleteIfExists(folder.resolve(UNITS_FILE));
    } catch (IOException e) {
      throw new UncheckedIOException("cannot remove the earlier batch in " + folder + ": " + e.getMessage(), e);
    }
    if (Files.isDirectory(units)) {
      UnitFit.deleteTree(units);
    }
    return write(engine.run(request.units(), task(), progress));
  }

  /** Writes the tables of {@code outcomes} (one per unit, in the request's order). */
  private BatchResult write(List<UnitOutcome> outcomes) {
    Path folder = folder();
    Path units = folder.resolve(UnitFit.UNITS_FOLDER);
    try {
      if (Files.isDirectory(units)) {
        try (var left = Files.list(units)) {
          if (left.findAny().isEmpty()) {
            Files.delete(units);
          }
        }
      }
    } catch (IOException e) {
      throw new UncheckedIOException("cannot tidy " + folder + ": " + e.getMessage(), e);
    }
    List<String> summaryHeader = new ArrayList<>(List.of("unit"));
    summaryHeader.addAll(SummaryTable.CSV_HEADER);
    StringBuilder summary = new StringBuilder();
    StringBuilder unitRows = new StringBuilder();
    try {
      CSVPrinter summaryCsv = printer(summary, summaryHeader);
      CSVPrinter unitsCsv = printer(unitRows, UNITS_HEADER);
      for (UnitOutcome outcome : outcomes) {
        for (List<String> row : outcome.rows()) {
          List<String> cells = new ArrayList<>(List.of(outcome.unit()));
          cells.addAll(row);
          summaryCsv.printRecord(cells);
        }
        unitsCsv.printRecord(outcome.unit(), outcome.seed(), outcome.status(), outcome.verdict());
      }
      summaryCsv.flush();
      unitsCsv.flush();
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    Path summaryFile = folder.resolve(SUMMARY_FILE);
    Path unitsFile = folder.resolve(UNITS_FILE);
    AtomicFiles.write(summaryFile, summary.toString());
    AtomicFiles.write(unitsFile, unitRows.toString());
    return new BatchResult(modelName, seed, folder, outcomes, summaryFile, unitsFile);
  }

  /** Releases the folder. */
  @Override
  public void close() {
    lock.close();
  }

  private static CSVPrinter printer(StringBuilder out, List<String> header) throws IOException {
    // CRLF records, as summary.csv's (RFC 4180).
    return new CSVPrinter(out, CSVFormat.RFC4180.builder().setHeader(header.toArray(String[]::new)).get());
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
    for (String name : List.of(SUMMARY_FILE, UNITS_FILE, UnitFit.UNITS_FOLDER)) {
      if (Files.exists(folder.resolve(name))) {
        found.add(name);
      }
    }
    return found;
  }
}

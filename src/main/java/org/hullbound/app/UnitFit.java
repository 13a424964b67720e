package org.hullbound.app;

import java.io.IOException;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashSet;
import java.util.HexFormat;
import java.util.List;
import java.util.Set;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.io.AtomicFiles;
import org.hullbound.lang.ModelException;

/**
 * Fits one unit of a batch as {@code fit} would fit it alone: the model and the unit's data files
 * are written into the unit's folder, and {@link FitRun} runs there with the unit's own seed
 * ({@link UnitSeeds}) and one thread (the batch runs units side by side instead).
 *
 * <p>Never throws for the unit's own faults: bad data, a model that does not bind to them, a
 * sampling failure all come back as a failed {@link UnitOutcome} with the message, and the unit's
 * folder stays so that the message's file and line can be looked at. A unit that succeeds keeps
 * its folder only when draws were asked for. A task, so that an engine can run it anywhere: it
 * carries the model's text and the settings, and depends on nothing else.
 */
public final class UnitFit implements TaskEngine.Task<UnitData, UnitOutcome> {
  private static final long serialVersionUID = 1L;

  /** The folder under the batch's folder that holds one folder per unit. */
  public static final String UNITS_FOLDER = "units";

  private static final Pattern PLAIN_NAME = Pattern.compile("[A-Za-z0-9_-][A-Za-z0-9._-]*");

  private final String modelFileName;
  private final String modelText;
  private final BatchSettings settings;

  private UnitFit(String modelFileName, String modelText, BatchSettings settings) {
    this.modelFileName = modelFileName;
    this.modelText = modelText;
    this.settings = settings;
  }

  /** Fits units of the model {@code modelText} (read from a file called {@code modelFileName}). */
  public static UnitFit of(String modelFileName, String modelText, BatchSettings settings) {
    if (modelFileName == null || modelText == null || settings == null) {
      throw new IllegalArgumentException("modelFileName, modelText and settings must not be null");
    }
    return new UnitFit(modelFileName, modelText, settings);
  }

  /** The folder of unit {@code unit} in the batch's folder {@code batchFolder}. */
  public static Path folderOf(Path batchFolder, String unit, long seed) {
    // A name that is not a plain file name gets a readable stand-in and, so that two such names
    // cannot meet, a part of its seed (a hash of the name).
    String name = PLAIN_NAME.matcher(unit).matches() ? unit
        : unit.replaceAll("[^A-Za-z0-9._-]+", "_").replaceAll("^\\.", "_") + "-"
            + HexFormat.of().toHexDigits((int) seed);
    return batchFolder.resolve(UNITS_FOLDER).resolve(name);
  }

  @Override
  public UnitOutcome run(UnitData unit) {
    return run(unit, StopSignal.create());
  }

  /**
   * Fits {@code unit}, its chains stopping early once {@code stop} is requested: a unit stopped so
   * has no outcome (null), and its folder is removed, since a resumed batch fits it again whole.
   */
  @Override
  public UnitOutcome run(UnitData unit, StopSignal stop) {
    long seed = UnitSeeds.of(settings.seed(), unit.name());
    if (unit.problem() != null) {
      return UnitOutcome.failed(unit.name(), seed, unit.problem());
    }
    Path folder = folderOf(Path.of(settings.folder()), unit.name(), seed);
    FitResult result;
    try {
      Files.createDirectories(folder);
      Path modelFile = folder.resolve(modelFileName);
      AtomicFiles.write(modelFile, modelText);
      List<Path> dataFiles = new ArrayList<>();
      Set<String> names = new HashSet<>(List.of(modelFileName));
      for (DataText data : unit.files()) {
        // Two files of one name (a unit's and a shared one) must not overwrite each other.
        String name = data.baseName();
        for (int k = 2; !names.add(name); k++) {
          name = k + "-" + data.baseName();
        }
        dataFiles.add(data.writeInto(folder, name));
      }
      FitRequest request =
          new FitRequest(
              new ModelInputs(modelFile, dataFiles, settings.emptyCells()), null,
              settings.chains(), settings.burnIn(), settings.draws(), settings.thin(), seed, 1,
              folder, null, true, settings.level());
      try (FitRun run = FitRun.prepare(request)) {
        result = run.run(ProgressListener.none(), stop);
      }
    } catch (IOException io) {
      return UnitOutcome.failed(
          unit.name(), seed, "cannot write " + folder + ": " + io.getMessage());
    } catch (RuntimeException failed) {
      return UnitOutcome.failed(unit.name(), seed, message(failed));
    }
    if (result.stoppedEarly()) {
      deleteTree(folder);
      return null;
    }
    FitResult.Summary summary = result.summary().orElseThrow();
    UnitOutcome outcome =
        new UnitOutcome(
            unit.name(), seed,
            summary.verdicts().allWell() ? UnitOutcome.CONVERGED : UnitOutcome.FLAGGED,
            records(summary.table().csv()), String.join(" | ", summary.verdicts().lines()));
    if (!settings.keepDraws()) {
      deleteTree(folder);
    }
    return outcome;
  }

  /**
   * The one-line message of a unit's failure: a model or data error with its place, one of our
   * typed failures (a refused run, a sampling failure) or an I/O failure with its own words,
   * anything else as an internal error with its type.
   */
  static String message(RuntimeException failed) {
    if (failed instanceof ModelException wrong) {
      return wrong.position() + ": " + wrong.problem();
    }
    if (failed instanceof UncheckedIOException
        || failed.getClass().getPackageName().startsWith("org.hullbound")) {
      return failed.getMessage();
    }
    return "internal error: " + failed;
  }

  /** The records of a summary.csv text, the header left out. */
  private static List<List<String>> records(String csv) {
    List<List<String>> rows = new ArrayList<>();
    try (var parser = CSVFormat.RFC4180.builder().setHeader().setSkipHeaderRecord(true).get()
        .parse(new StringReader(csv))) {
      for (CSVRecord record : parser) {
        rows.add(record.toList());
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return rows;
  }

  /** Removes {@code folder} and everything in it (a unit's own folder only). */
  static void deleteTree(Path folder) {
    try (Stream<Path> walk = Files.walk(folder)) {
      for (Path path : walk.sorted(Comparator.reverseOrder()).toList()) {
        Files.deleteIfExists(path);
      }
    } catch (IOException e) {
      throw new UncheckedIOException("cannot remove " + folder + ": " + e.getMessage(), e);
    }
  }
}

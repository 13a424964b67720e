package org.hullbound.app;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.hullbound.io.AtomicFiles;
import org.hullbound.io.CheckpointFile;
import org.hullbound.model.EmptyCells;

/**
 * What a batch was started with, kept in {@code DIR/}{@value #FILE_NAME} so that a stopped batch
 * can be continued with exactly the same settings ({@code fit-units --resume DIR}): the run's seed,
 * the size of every unit's run, the level, how empty cells are taken, whether unit folders are
 * kept, and a SHA-256 of the model and every unit's data, which a resume must match.
 *
 * <p>Labelled lines of text, as {@code fit}'s checkpoint, written once before the first unit
 * starts (atomically). It holds nothing of the engine or the time, so that the same batch on two
 * engines writes the same file.
 *
 * @param modelFile the model file's name
 * @param inputHash the SHA-256 of the model text and the units' names and data ({@link #hashOf})
 * @param units how many units the batch has
 * @param settings the settings every unit is fitted with (the folder is not written)
 */
record BatchFacts(String modelFile, String inputHash, int units, BatchSettings settings) {
  /** The file's name in the batch's folder. */
  static final String FILE_NAME = "batch.txt";

  private static final String FIRST_LINE = "hullbound batch, format 1";

  /**
   * The SHA-256 over the model's text and, for every unit in order, its name and its files'
   * names and texts (a unit whose data could not be read counts by its name alone).
   */
  static String hashOf(String modelText, List<UnitData> units) {
    List<String> texts = new ArrayList<>();
    for (UnitData unit : units) {
      texts.add("unit " + unit.name() + (unit.problem() != null ? " unreadable" : ""));
      for (DataText file : unit.files()) {
        texts.add(file.baseName());
        texts.add(file.text());
      }
    }
    return CheckpointFile.inputHash(modelText, texts);
  }

  /** Writes the facts to {@code folder}/{@value #FILE_NAME}. */
  void write(Path folder) {
    StringBuilder text = new StringBuilder(FIRST_LINE).append('\n');
    text.append("model: ").append(modelFile.replace('\n', ' ')).append('\n');
    text.append("model and units sha-256: ").append(inputHash).append('\n');
    text.append("units: ").append(units).append('\n');
    text.append("seed: ").append(settings.seed()).append('\n');
    text.append("chains: ").append(settings.chains()).append('\n');
    text.append("burn-in: ").append(settings.burnIn()).append('\n');
    text.append("draws: ").append(settings.draws()).append('\n');
    text.append("thin: ").append(settings.thin()).append('\n');
    text.append("level: ").append(Double.toString(settings.level())).append('\n');
    text.append("empty cells: ").append(settings.emptyCells().name().toLowerCase()).append('\n');
    text.append("keep draws: ").append(settings.keepDraws() ? "yes" : "no").append('\n');
    AtomicFiles.write(folder.resolve(FILE_NAME), text.toString());
  }

  /**
   * Reads the facts of the batch in {@code folder}.
   *
   * @throws RunRefusedException when there are none, or they are damaged
   */
  static BatchFacts read(Path folder) {
    Path file = folder.resolve(FILE_NAME);
    String text;
    try {
      text = Files.readString(file, StandardCharsets.UTF_8);
    } catch (NoSuchFileException missing) {
      throw new RunRefusedException(
          "no batch to resume in " + folder + " (" + file + " does not exist): give the folder of"
              + " a batch that was stopped");
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read " + file + ": " + e.getMessage(), e);
    }
    List<String> lines = text.lines().toList();
    if (lines.isEmpty() || !lines.get(0).equals(FIRST_LINE)) {
      throw damaged(file, "it does not begin with '" + FIRST_LINE + "'");
    }
    Map<String, String> values = new LinkedHashMap<>();
    for (String line : lines.subList(1, lines.size())) {
      int colon = line.indexOf(": ");
      if (colon < 0) {
        throw damaged(file, "the line '" + line + "' is not 'label: value'");
      }
      values.put(line.substring(0, colon), line.substring(colon + 2));
    }
    try {
      BatchSettings settings =
          new BatchSettings(
              whole(values, "chains", file), whole(values, "burn-in", file),
              whole(values, "draws", file), whole(values, "thin", file),
              Long.parseLong(value(values, "seed", file)),
              Double.parseDouble(value(values, "level", file)),
              EmptyCells.valueOf(value(values, "empty cells", file).toUpperCase()),
              folder.toString(), value(values, "keep draws", file).equals("yes"));
      return new BatchFacts(
          value(values, "model", file), value(values, "model and units sha-256", file),
          whole(values, "units", file), settings);
    } catch (IllegalArgumentException unreadable) {
      throw damaged(file, unreadable.getMessage());
    }
  }

  private static String value(Map<String, String> values, String label, Path file) {
    String value = values.get(label);
    if (value == null) {
      throw damaged(file, "it has no line '" + label + ": ...'");
    }
    return value;
  }

  private static int whole(Map<String, String> values, String label, Path file) {
    return Integer.parseInt(value(values, label, file));
  }

  private static RunRefusedException damaged(Path file, String why) {
    return new RunRefusedException("cannot resume the batch: " + file + " is damaged: " + why);
  }
}

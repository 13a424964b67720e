package org.hullbound.app;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.hullbound.io.AtomicFiles;
import org.hullbound.model.DataSummary;
import org.hullbound.report.RunHeader;
import org.hullbound.report.RunSources;

/**
 * {@code run.txt}: the facts of a fit that its draws and summary do not hold (model name and text,
 * when it started, how long it took, burn-in, seed, the data files read), so that {@code hullbound
 * report DIR} can render the page again exactly as fit did.
 *
 * <p>Plain text: one {@code key: value} line per fact, {@code data:} repeated per data source as
 * {@code rows missing source}, then a line {@code model text:} followed by the model file verbatim.
 */
public final class RunFactsFile {
  public static final String FILE_NAME = "run.txt";
  private static final String MODEL_TEXT = "model text:";

  private RunFactsFile() {}

  /** What {@code run.txt} holds. */
  public record RunFacts(RunHeader header, RunSources sources) {}

  /** Writes the facts to {@code folder/run.txt}, atomically. */
  public static void write(Path folder, RunHeader header, RunSources sources) {
    StringBuilder text = new StringBuilder("# hullbound run facts, read by 'hullbound report'\n");
    text.append("model name: ").append(oneLine(header.modelName())).append('\n')
        .append("started: ").append(header.startedAt()).append('\n')
        .append("run time ms: ").append(header.runTime().toMillis()).append('\n')
        .append("chains: ").append(header.chains()).append('\n')
        .append("draws per chain: ").append(header.drawsPerChain()).append('\n')
        .append("burn-in: ").append(header.burnIn()).append('\n')
        .append("seed: ").append(header.seed()).append('\n');
    for (RunSources.DataSource d : sources.data()) {
      text.append("data: ").append(d.rows()).append(' ').append(d.missingCells()).append(' ')
          .append(oneLine(d.source())).append('\n');
    }
    text.append(MODEL_TEXT).append('\n').append(sources.modelText());
    AtomicFiles.write(folder.resolve(FILE_NAME), text.toString());
  }

  private static String oneLine(String s) {
    return s.replace('\n', ' ').replace('\r', ' ');
  }

  /**
   * The facts in {@code folder/run.txt}, or empty when the file is missing; a line that cannot be
   * read ends with an {@link IllegalArgumentException} naming the file and line.
   */
  public static Optional<RunFacts> read(Path folder) throws IOException {
    Path file = folder.resolve(FILE_NAME);
    if (!Files.isRegularFile(file)) {
      return Optional.empty();
    }
    List<String> lines = List.of(Files.readString(file).split("\n", -1));
    String name = "";
    OffsetDateTime started = null;
    long runTime = 0;
    int chains = 1;
    int draws = 0;
    int burnIn = 0;
    long seed = 0;
    List<RunSources.DataSource> data = new ArrayList<>();
    String modelText = "";
    for (int i = 0; i < lines.size(); i++) {
      String line = lines.get(i);
      if (line.equals(MODEL_TEXT)) {
        modelText = String.join("\n", lines.subList(i + 1, lines.size()));
        break;
      }
      if (line.isBlank() || line.startsWith("#")) {
        continue;
      }
      int colon = line.indexOf(": ");
      if (colon < 0) {
        throw bad(file, i, "expected 'key: value'");
      }
      String key = line.substring(0, colon);
      String value = line.substring(colon + 2);
      try {
        switch (key) {
          case "model name" -> name = value;
          case "started" -> started = OffsetDateTime.parse(value);
          case "run time ms" -> runTime = Long.parseLong(value);
          case "chains" -> chains = Integer.parseInt(value);
          case "draws per chain" -> draws = Integer.parseInt(value);
          case "burn-in" -> burnIn = Integer.parseInt(value);
          case "seed" -> seed = Long.parseLong(value);
          case "data" -> {
            String[] parts = value.split(" ", 3);
            data.add(
                new RunSources.DataSource(
                    parts[2], Integer.parseInt(parts[0]), Integer.parseInt(parts[1])));
          }
          default -> { } // a fact from a later version: not needed to draw the page
        }
      } catch (NumberFormatException | DateTimeParseException | ArrayIndexOutOfBoundsException e) {
        throw bad(file, i, "'" + key + "' has an unreadable value '" + value + "'");
      }
    }
    if (started == null) {
      throw bad(file, lines.size() - 1, "no 'started' line");
    }
    try {
      return Optional.of(
          new RunFacts(
              new RunHeader(name, started, chains, draws, burnIn, seed, Duration.ofMillis(runTime)),
              new RunSources(modelText, data)));
    } catch (IllegalArgumentException e) {
      throw bad(file, lines.size() - 1, e.getMessage());
    }
  }

  private static IllegalArgumentException bad(Path file, int line, String what) {
    return new IllegalArgumentException(file + ", line " + (line + 1) + ": " + what);
  }

  /** The facts of a fit's model text and data, as the report shows them. */
  public static RunSources sources(String modelText, List<DataSummary> data) {
    List<RunSources.DataSource> sources = new ArrayList<>();
    for (DataSummary d : data) {
      sources.add(new RunSources.DataSource(d.source(), d.rows(), d.missingCells()));
    }
    return new RunSources(modelText, sources);
  }
}

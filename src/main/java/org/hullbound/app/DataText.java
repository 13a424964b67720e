package org.hullbound.app;

import java.io.Serializable;
import java.util.function.Predicate;
import java.nio.file.Path;
import org.hullbound.io.AtomicFiles;
import org.hullbound.io.CsvData;
import org.hullbound.io.TextFiles;
import org.hullbound.model.DataTable;

/**
 * A data file carried as its text, so that a task on another machine (or a later refit) reads
 * exactly the same bytes: the unit of a batch and the data of a calibration travel this way.
 *
 * @param fileName the file's name as given (shown in messages); a copy written into a folder
 *     takes its last part
 * @param text the CSV text
 */
public record DataText(String fileName, String text) implements Serializable {
  public DataText {
    if (fileName == null || text == null) {
      throw new IllegalArgumentException("fileName and text must not be null");
    }
  }

  /**
   * The file's text.
   *
   * @throws java.io.UncheckedIOException when it cannot be read
   */
  public static DataText read(Path file) {
    return new DataText(file.toString(), TextFiles.readUtf8(file, "data file"));
  }

  /** Writes the text to {@code folder}, named {@code name}; returns the file. */
  public Path writeInto(Path folder, String name) {
    Path file = folder.resolve(name);
    AtomicFiles.write(file, text);
    return file;
  }

  /** The last part of {@link #fileName}, as a copy in a folder is named. */
  public String baseName() {
    return Path.of(fileName).getFileName().toString();
  }

  /**
   * The table, keeping the columns {@code keep} accepts, as {@code CsvData.read} reads the file.
   */
  public DataTable table(Predicate<String> keep) {
    return CsvData.parse(fileName, text, keep);
  }
}

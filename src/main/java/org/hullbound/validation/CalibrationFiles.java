package org.hullbound.validation;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.hullbound.io.AtomicFiles;

/**
 * Writes a calibration's results into a folder: {@code ranks.csv} (one row per replicate, one
 * column per unknown) and one {@code ranks-<unknown>.svg} histogram per unknown.
 *
 * <p>Files are written whole and atomically (via {@link AtomicFiles}), so a reader never sees half
 * a file.
 */
public final class CalibrationFiles {
  public static final String RANKS_FILE = "ranks.csv";

  private CalibrationFiles() {}

  /** Writes every file; returns the histogram files written, in unknown order. */
  public static List<Path> write(CalibrationResult result, Path folder) {
    StringBuilder csv = new StringBuilder("replicate");
    for (String label : result.labels()) {
      csv.append(',').append(csvCell(label));
    }
    csv.append('\n');
    int[][] ranks = result.ranks();
    for (int n = 0; n < ranks.length; n++) {
      csv.append(n + 1);
      for (int rank : ranks[n]) {
        csv.append(',').append(rank);
      }
      csv.append('\n');
    }
    AtomicFiles.write(folder.resolve(RANKS_FILE), csv.toString());
    List<Path> pictures = new ArrayList<>();
    List<String> used = new ArrayList<>();
    for (RankUniformity test : result.tests()) {
      String name = fileName(test.label());
      while (used.contains(name)) {
        name = name + "_";
      }
      used.add(name);
      Path file = folder.resolve("ranks-" + name + ".svg");
      AtomicFiles.write(file, RankHistogramSvg.of(test, result.settings().replicates(), result.settings().draws()));
      pictures.add(file);
    }
    return pictures;
  }

  /** {@code theta[1, 2]} becomes {@code theta_1_2}: safe on every file system. */
  static String fileName(String label) {
    String cleaned = label.replaceAll("[^A-Za-z0-9_]+", "_").replaceAll("_+$", "");
    return cleaned.isEmpty() ? "unknown" : cleaned;
  }

  private static String csvCell(String text) {
    return text.contains(",") || text.contains("\"") ? "\"" + text.replace("\"", "\"\"") + "\"" : text;
  }
}

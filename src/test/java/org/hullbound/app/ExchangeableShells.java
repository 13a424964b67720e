package org.hullbound.app;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * A two-component normal mixture whose chains settle on swapped labels, for the label-switching
 * tests: the same prior on both centres (exchangeable components) and two invented clusters of 20
 * shells 20 apart (sd 2), so that a Gibbs chain keeps the labelling its start gives it.
 */
public final class ExchangeableShells {
  private ExchangeableShells() {}

  /** Writes the model file into {@code folder} and returns its path. */
  public static Path model(Path folder) throws IOException {
    return Files.writeString(folder.resolve("shells.hbm"), String.join("\n",
        "model shells",
        "index shell",
        "index cohort = 1 .. 2",
        "data  share[cohort] = [0.5, 0.5]",
        "param centre[cohort] ~ normal(mean = 40, sd = 15)",
        "param cohort_of[shell] ~ categorical(p = share)",
        "data  length[shell] ~ normal(mean = centre[cohort_of[shell]], sd = 2)",
        ""));
  }

  /** Writes the data file (40 lengths about 30 and 50) into {@code folder}; returns its path. */
  public static Path data(Path folder) throws IOException {
    StringBuilder csv = new StringBuilder("length\n");
    for (int i = 1; i <= 20; i++) {
      double offset = ((i * 7) % 11 - 5) * 0.6;
      csv.append(String.format(Locale.ROOT, "%.1f%n%.1f%n", 30 + offset, 50 - offset));
    }
    return Files.writeString(folder.resolve("shells.csv"), csv.toString());
  }
}

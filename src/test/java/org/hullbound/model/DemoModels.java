package org.hullbound.model;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;
import java.util.stream.Collectors;
import java.util.stream.Stream;

/**
 * The bundled demos under {@code models/} and the data files each is fitted with, as README and
 * docs/check.md give them: one list for the tests that run every demo ({@code
 * cli.DemoModelsFitTest} checks that it names every model in the folder).
 */
public final class DemoModels {
  /** Each demo's name and its data files in {@code models/}, in the order they are given. */
  public static final Map<String, List<String>> DATA_FILES =
      Map.ofEntries(
          Map.entry("clinics", List.of("clinics.csv")),
          Map.entry("extract", List.of("extract.csv")),
          Map.entry("fill_weights", List.of("bottles.csv", "shifts.csv")),
          Map.entry("fleet_faults", List.of()),
          Map.entry("moth_traps", List.of()),
          Map.entry("mussels", List.of("mussels.csv")),
          Map.entry("nests", List.of()),
          Map.entry("orchard", List.of("orchard.csv")),
          Map.entry("seedlings", List.of("seedlings.csv")),
          Map.entry("sensors", List.of("sensors.csv")),
          Map.entry("weedkiller", List.of()),
          Map.entry("wells", List.of("wells.csv")));

  private DemoModels() {}

  /** The names of the models in {@code models/} (file names less {@code .hbm}), sorted. */
  public static TreeSet<String> inModelsFolder() {
    try (Stream<Path> files = Files.list(Path.of("models"))) {
      return files.map(file -> file.getFileName().toString())
          .filter(name -> name.endsWith(".hbm"))
          .map(name -> name.substring(0, name.length() - ".hbm".length()))
          .collect(Collectors.toCollection(TreeSet::new));
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }
}

package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Every bundled demo under {@code models/} fits from its documented command and ends with exit 0:
 * a demo that cannot start (as the tern nests once could not, its latent clutches starting below
 * the chicks counted) is a broken first impression that no other test would see.
 */
class DemoModelsFitTest {
  /** Each demo and its data files, as README and docs/check.md give them. */
  private static final Map<String, List<String>> DEMOS =
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

  @TempDir Path folder;

  @Test
  void everyDemoIsListedHere() throws IOException {
    try (Stream<Path> files = Files.list(Path.of("models"))) {
      TreeSet<String> demos =
          files.map(file -> file.getFileName().toString())
              .filter(name -> name.endsWith(".hbm"))
              .map(name -> name.substring(0, name.length() - ".hbm".length()))
              .collect(Collectors.toCollection(TreeSet::new));
      assertEquals(new TreeSet<>(DEMOS.keySet()), demos, "add a new demo and its data files here");
    }
  }

  @Test
  void everyDemoFitsWithExitZero() throws Exception {
    List<String> failures = new ArrayList<>();
    for (String demo : new TreeSet<>(DEMOS.keySet())) {
      List<String> arguments = new ArrayList<>(List.of("fit", "models/" + demo + ".hbm"));
      for (String data : DEMOS.get(demo)) {
        arguments.addAll(List.of("--data", "models/" + data));
      }
      // Short runs: this is about starting and finishing, not about convergence.
      arguments.addAll(List.of("--seed", "5", "--chains", "2", "--burn-in", "100", "--draws", "100",
          "--quiet", "--out", folder.resolve(demo).toString()));
      CliRun run = CliRun.of(arguments.toArray(String[]::new));
      if (run.exit() != 0) {
        failures.add(demo + ": " + run);
      } else {
        assertTrue(Files.exists(folder.resolve(demo).resolve("draws.csv")), demo);
      }
    }
    assertEquals(List.of(), failures);
  }
}

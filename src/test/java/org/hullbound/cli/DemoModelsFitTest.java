package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;
import org.hullbound.model.DemoModels;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Every bundled demo under {@code models/} fits from its documented command and ends with exit 0:
 * a demo that cannot start (as the tern nests once could not, its latent clutches starting below
 * the chicks counted) is a broken first impression that no other test would see.
 */
class DemoModelsFitTest {
  private static final Map<String, List<String>> DEMOS = DemoModels.DATA_FILES;

  @TempDir Path folder;

  @Test
  void everyDemoIsListedHere() {
    assertEquals(new TreeSet<>(DEMOS.keySet()), DemoModels.inModelsFolder(),
        "add a new demo and its data files to model.DemoModels");
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

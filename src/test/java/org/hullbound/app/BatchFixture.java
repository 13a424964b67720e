package org.hullbound.app;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.model.EmptyCells;

/**
 * A small batch for tests: a normal model with a known sd and a conjugate mean (fast, exact), and
 * three units' readings in a folder, one subfolder per unit; unit {@code c} holds a cell that is
 * not a number on line 3 of its file.
 */
final class BatchFixture {
  static final String MODEL =
      "model station\n"
          + "index reading\n"
          + "data y[reading] ~ normal(mean = mu, sd = 1)\n"
          + "param mu ~ normal(mean = 0, sd = 10)\n";

  static final String A = "y\n1.2\n0.4\n2.1\n1.7\n";
  static final String B = "y\n-0.5\n-1.1\n0.2\n";
  static final String C_BAD = "y\n0.3\nseven\n1.0\n";

  private BatchFixture() {}

  /** Writes the model to {@code folder}/station.hbm; returns it. */
  static Path model(Path folder) throws IOException {
    return Files.writeString(folder.resolve("station.hbm"), MODEL);
  }

  /** Writes a units folder with the given units' y.csv texts (name, text, name, text, ...). */
  static Path units(Path folder, String... namesAndTexts) throws IOException {
    Path units = folder.resolve("units");
    for (int k = 0; k < namesAndTexts.length; k += 2) {
      Path unit = Files.createDirectories(units.resolve(namesAndTexts[k]));
      Files.writeString(unit.resolve("y.csv"), namesAndTexts[k + 1]);
    }
    return units;
  }

  /** A request over {@code units} with short chains, seed 11. */
  static BatchRequest request(Path model, List<UnitData> units, Path out, boolean keepDraws) {
    return new BatchRequest(
        model, units, 2, 100, 200, 1, 11L, out, false, 0.95, EmptyCells.IMPUTED, keepDraws);
  }

  /** Runs {@code request} on {@code workers} local workers. */
  static BatchResult run(BatchRequest request, int workers) {
    try (BatchRun run = BatchRun.prepare(request); TaskEngine engine = TaskEngine.local(workers)) {
      return run.run(engine, TaskEngine.Progress.none());
    }
  }
}

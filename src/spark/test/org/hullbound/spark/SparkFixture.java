package org.hullbound.spark;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.List;
import java.util.stream.Stream;
import org.apache.spark.SparkConf;
import org.hullbound.app.BatchRequest;
import org.hullbound.app.BatchResult;
import org.hullbound.app.BatchRun;
import org.hullbound.app.BatchUnits;
import org.hullbound.app.TaskEngine;
import org.hullbound.model.EmptyCells;

/** A Spark context for tests, and a small batch (three units, one with a bad cell). */
final class SparkFixture {
  private SparkFixture() {}

  /** A context on {@code master}, without the web UI. */
  static SparkTasks spark(String master) {
    return SparkTasks.of(
        new SparkConf().setMaster(master).setAppName("hullbound-test").set("spark.ui.enabled", "false"));
  }

  /** Writes the model and three units (c with 'seven' on line 3); returns the model file. */
  static Path batch(Path folder) throws IOException {
    write(folder.resolve("units/a/y.csv"), "y\n1.2\n0.4\n2.1\n1.7\n");
    write(folder.resolve("units/b/y.csv"), "y\n-0.5\n-1.1\n0.2\n");
    write(folder.resolve("units/c/y.csv"), "y\n0.3\nseven\n1.0\n");
    return write(folder.resolve("station.hbm"),
        "model station\nindex reading\ndata y[reading] ~ normal(mean = mu, sd = 1)\n"
            + "param mu ~ normal(mean = 0, sd = 10)\n");
  }

  static BatchRequest request(Path folder, Path model, Path out) {
    return new BatchRequest(
        model, BatchUnits.fromFolder(folder.resolve("units"), List.of()), 2, 100, 200, 1, 11L,
        out, false, 0.95, EmptyCells.IMPUTED, false);
  }

  static BatchResult run(BatchRequest request, TaskEngine engine, TaskEngine.Progress progress) {
    try (BatchRun run = BatchRun.prepare(request)) {
      return run.run(engine, progress);
    }
  }

  /** Every file under {@code folder}, as paths relative to it, sorted. */
  static List<Path> files(Path folder) throws IOException {
    try (Stream<Path> walk = Files.walk(folder)) {
      return walk.filter(Files::isRegularFile).map(folder::relativize)
          .sorted(Comparator.naturalOrder()).toList();
    }
  }

  private static Path write(Path file, String text) throws IOException {
    Files.createDirectories(file.getParent());
    return Files.writeString(file, text);
  }
}

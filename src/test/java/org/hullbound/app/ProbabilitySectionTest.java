package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.io.DrawsReader;
import org.hullbound.io.DrawsTable;
import org.hullbound.report.ProbabilityTable;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code fit --probability} in the application layer: the statements are estimated once, from the
 * kept draws as draws.csv holds them, and the page is rendered once with their table (it was
 * rendered, then rendered again over itself once the statements were estimated from draws.csv
 * read back).
 */
class ProbabilitySectionTest {
  @TempDir Path folder;

  @Test
  void theStatementsAreEstimatedOnceFromTheKeptDrawsAndShownInTheOnePage() throws Exception {
    Path model = folder.resolve("m.hbm");
    Files.writeString(model, String.join("\n",
        "data y[obs] = [1.2, 0.4, 2.0, 1.1, 0.3] ~ normal(mean = mu, sd = 1)",
        "index obs",
        "param mu ~ normal(mean = 0, sd = 2)",
        "let doubled = 2 * mu",
        ""));
    FitRequest request = new FitRequest(new ModelInputs(model, List.of()), null, 2, 20, 50, 1, 5L,
        null, folder.resolve("out"), null, false, 0.95);
    List<double[][]> seen = new ArrayList<>();
    FitResult result;
    try (FitRun run = FitRun.prepare(request)) {
      result = run.run(ProgressListener.none(), StopSignal.create(), draws -> {
        seen.add(draws.apply("mu"));
        seen.add(draws.apply("doubled"));
        return ProbabilityTable.of(List.of(
            new ProbabilityTable.Row("mu > 0.123456", 0.75, 0.02)));
      });
    }
    assertEquals(2, seen.size(), "called once, for both columns");
    DrawsTable written = DrawsReader.read(result.drawsFile());
    for (int chain = 0; chain < 2; chain++) {
      assertArrayEquals(written.draws("mu")[chain], seen.get(0)[chain], "mu, chain " + chain);
      assertArrayEquals(written.draws("doubled")[chain], seen.get(1)[chain],
          "doubled, chain " + chain);
    }
    String page = Files.readString(result.reportFile());
    assertTrue(page.contains("mu &gt; 0.123456") || page.contains("mu > 0.123456"),
        "the table is on the page");
  }
}

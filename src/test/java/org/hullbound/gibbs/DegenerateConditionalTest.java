package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.junit.jupiter.api.Test;

/**
 * A full conditional the hull cannot follow (issue 14: a binomial tray of 1e15 trials under a
 * logit started 33 units from its mode) ends the chain with an error that names the unknown and
 * the values that show the degeneracy, instead of a draw that spins forever.
 */
class DegenerateConditionalTest {

  /**
   * The seedlings model and data of {@code models/}, tray 1 planted with 1e15 seeds: with seed 1
   * and four chains, chain 1 starts the logit of bench 1 near 4.7, 33 units above the mode near
   * -28 that 1e15 trials pin it to, and its first draw hung the fit.
   */
  static ModelSampler seedlingsWithAHugeTray() {
    String text =
        """
        model seedlings
        index bench = 1 .. 8
        index tray
        data  planted[tray], bench_of[tray]
        data  survived[tray] ~ binomial(trials = planted[tray], logit_p = effect[bench_of[tray]])
        param centre ~ normal(mean = 0, sd = 2.5)
        param spread ~ half-normal(sd = 1)
        param effect[bench] ~ normal(mean = centre, sd = spread)
        """;
    List<List<String>> rows = new ArrayList<>();
    try {
      for (String line : Files.readAllLines(Path.of("models", "seedlings.csv")).subList(1, 41)) {
        rows.add(List.of(line.split(",")));
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    // tray 1 (bench 1, 16 survived) planted with 1e15 seeds
    rows.set(0, List.of("1e15", "1", "16"));
    DataTable trays =
        DataTable.of("trays.csv", List.of("planted", "bench_of", "survived"), rows);
    BoundModel model =
        BoundModel.bind(Parser.parse(SourceText.of("seedlings.hbm", text)), List.of(trays));
    return ModelSampler.of(model, Map.of());
  }

  @Test
  void aDegenerateConditionalFailsTheChainNamingTheUnknownAndItsHull() {
    ModelSampler sampler = seedlingsWithAHugeTray();
    ChainRunner runner =
        ChainRunner.of(RunSettings.of(4, 10, 10, 1, 1L), ProgressListener.none(), StopSignal.create());
    ChainFailedException failed =
        assertTimeoutPreemptively(
            Duration.ofMinutes(2),
            () -> assertThrows(ChainFailedException.class,
                () -> runner.run(sampler.sampler().withAdaptation(10), (c, d, v) -> {})));
    UpdateFailedException update = assertInstanceOf(UpdateFailedException.class, failed.getCause());
    assertInstanceOf(DegenerateConditionalException.class, update.getCause());
    String message = failed.getMessage();
    assertTrue(message.contains("updating effect[1]"), message);
    assertTrue(message.contains("numerically degenerate"), message);
    assertTrue(message.contains("no proposal accepted in 100000 proposals"), message);
    assertTrue(message.contains("abscissae run from"), message);
    assertTrue(message.contains("support (-Infinity, Infinity)"), message);
  }
}

package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.junit.jupiter.api.Test;

/**
 * A full conditional the first hull cannot follow (issue 14: a binomial tray of 1e15 trials under
 * a logit started 33 units from its mode) is drawn from a hull restarted around the stuck hull's
 * highest point, instead of failing the chain or spinning forever.
 */
class DegenerateConditionalTest {

  /**
   * The seedlings model and data of {@code models/}, tray 1 planted with 1e15 seeds: with seed 1
   * and four chains, chain 1 starts the logit of bench 1 near 4.7, 33 units above the mode near
   * -28 that 1e15 trials pin it to, and its first draw hung the fit.
   */
  static ModelSampler seedlingsWithAHugeTray() {
    return seedlingsWithATrayOf("1e15");
  }

  /** The seedlings model of {@code models/}, tray 1 (bench 1, 16 survived) planted with {@code planted} seeds. */
  static ModelSampler seedlingsWithATrayOf(String planted) {
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
    rows.set(0, List.of(planted, "1", "16"));
    DataTable trays =
        DataTable.of("trays.csv", List.of("planted", "bench_of", "survived"), rows);
    BoundModel model =
        BoundModel.bind(Parser.parse(SourceText.of("seedlings.hbm", text)), List.of(trays));
    return ModelSampler.of(model, Map.of());
  }

  /**
   * With seed 1 and one chain, the first draw of effect[1] reaches the proposal cap (the hull of 32
   * abscissae cannot follow a conditional pinned near -28 from a start near 4.7); before the
   * restart this failed the chain with {@link DegenerateConditionalException} (checked by hand on
   * the code before it). A new hull started around the stuck hull's highest point follows it, and
   * the chain completes with finite draws.
   */
  @Test
  void aHullRestartedAroundItsHighestPointFollowsTheHugeTray() {
    ModelSampler sampler = seedlingsWithAHugeTray();
    ChainRunner runner =
        ChainRunner.of(RunSettings.of(1, 10, 10, 1, 1L), ProgressListener.none(), StopSignal.create());
    List<double[]> kept = new ArrayList<>();
    assertTimeoutPreemptively(
        Duration.ofMinutes(2),
        () -> runner.run(sampler.sampler().withAdaptation(10), (c, d, v) -> kept.add(v.clone())));
    assertEquals(10, kept.size());
    for (double[] draw : kept) {
      for (double value : draw) {
        assertTrue(Double.isFinite(value), () -> Arrays.toString(draw));
      }
    }
  }

  /**
   * For a concave h the mode lies between the neighbours of the highest of any points (common
   * practice): the restart starts from those three, or two at an end of the hull.
   */
  @Test
  void theRestartStartsFromTheHighestAbscissaAndItsNeighbours() {
    double[] xs = {-3, -1, 0.5, 2, 7};
    assertArrayEquals(
        new double[] {-1, 0.5, 2},
        AdaptiveRejectionUpdater.aroundHighest(xs, new double[] {-9, -2, -1, -4, -50}));
    assertArrayEquals(
        new double[] {-3, -1},
        AdaptiveRejectionUpdater.aroundHighest(xs, new double[] {0, -2, -3, -4, -50}));
    assertArrayEquals(
        new double[] {2, 7},
        AdaptiveRejectionUpdater.aroundHighest(xs, new double[] {-90, -20, -10, -4, -1}));
  }
}

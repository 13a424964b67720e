package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code fit --resume} end to end: a child JVM stopped by a real signal leaves a checkpoint, the
 * resumed run gives exactly the draws.csv rows of an uninterrupted run (per chain, in order) and
 * the same summary, and unusable checkpoints are refused with exit status 2 and a plain message.
 */
class FitResumeTest {
  @TempDir Path folder;

  /**
   * The seedlings demo with derived quantities kept with the draws (a scalar by default, a vector
   * marked keep), so that their columns are resumed too: read back from the stopped run's file,
   * then computed from the restored state.
   */
  private static final String DERIVED =
      "let centre_odds = exp(centre)\nkeep let bench_share[bench] = expit(effect[bench])\n";

  private Path model;
  private String[] run;

  @BeforeEach
  void writeModel() throws Exception {
    model = folder.resolve("seedlings_kept.hbm");
    Files.writeString(model, Files.readString(Path.of("models/seedlings.hbm")) + DERIVED);
    run = new String[] {
      "fit", model.toString(), "--data", "models/seedlings.csv", "--chains", "2",
      "--burn-in", "300", "--draws", "6000", "--seed", "17", "--quiet"
    };
  }

  private static String[] with(String[] base, String... more) {
    List<String> all = new ArrayList<>(List.of(base));
    all.addAll(List.of(more));
    return all.toArray(new String[0]);
  }

  private String[] resume(Path dir, String... more) {
    return with(
        new String[] {"fit", model.toString(), "--data", "models/seedlings.csv", "--quiet",
            "--resume", dir.toString()},
        more);
  }

  /** Rows of draws.csv by chain, in file order: rows of different chains interleave. */
  private static Map<String, List<String>> rowsByChain(Path draws) throws Exception {
    List<String> lines = Files.readAllLines(draws, StandardCharsets.UTF_8);
    Map<String, List<String>> byChain = new LinkedHashMap<>();
    byChain.put("header", List.of(lines.get(0)));
    for (String line : lines.subList(1, lines.size())) {
      byChain.computeIfAbsent(line.substring(0, line.indexOf(',')),
          c -> new ArrayList<>()).add(line);
    }
    return byChain;
  }

  @Test
  void aRunStoppedBySigtermAndResumedHasExactlyTheDrawsOfAnUninterruptedRun() throws Exception {
    Path stopped = folder.resolve("stopped");
    // SIGTERM runs the same shutdown hook as Ctrl-C (SIGINT); Process.destroy sends SIGTERM.
    Process child =
        new ProcessBuilder(
                with(
                    new String[] {
                      Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                      "-cp", System.getProperty("java.class.path"), "org.hullbound.cli.Main"
                    },
                    with(run, "--threads", "2", "--out", stopped.toString())))
            .redirectErrorStream(true)
            .redirectOutput(folder.resolve("child.txt").toFile())
            .start();
    Path draws = stopped.resolve("draws.csv");
    long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
    while (System.nanoTime() < deadline && !Files.exists(draws)) {
      Thread.sleep(20);
    }
    Thread.sleep(300);
    child.destroy();
    assertTrue(child.waitFor(30, TimeUnit.SECONDS), "the child stopped");
    String output = Files.readString(folder.resolve("child.txt"));
    String checkpoint = Files.readString(stopped.resolve("checkpoint.txt"));
    assertTrue(checkpoint.contains("status: interrupted"), output);
    assertTrue(output.contains("--resume " + stopped), output);

    // Unusable checkpoints first, each refused without touching the run.
    Path changedModel = folder.resolve("seedlings.hbm");
    Files.writeString(changedModel, Files.readString(model) + "# one more comment\n");
    CliRun otherModel =
        CliRun.of("fit", changedModel.toString(), "--data", "models/seedlings.csv", "--quiet",
            "--resume", stopped.toString());
    assertEquals(2, otherModel.exit(), otherModel.toString());
    assertTrue(otherModel.err().contains("the model or data changed"), otherModel.err());
    assertTrue(otherModel.errorIsPlain(), otherModel.toString());

    CliRun otherSeed = CliRun.of(resume(stopped, "--seed", "18"));
    assertEquals(2, otherSeed.exit(), otherSeed.toString());
    assertTrue(otherSeed.err().contains("was made with --seed 17"), otherSeed.err());

    Path damaged = folder.resolve("damaged");
    Files.createDirectories(damaged);
    Files.copy(draws, damaged.resolve("draws.csv"));
    Files.writeString(
        damaged.resolve("checkpoint.txt"), checkpoint.replace("seed: 17", "seed: 71"));
    CliRun corrupt = CliRun.of(resume(damaged));
    assertEquals(2, corrupt.exit(), corrupt.toString());
    assertTrue(corrupt.err().contains("is damaged"), corrupt.err());
    assertTrue(corrupt.errorIsPlain(), corrupt.toString());

    // A cut last line (as a crash while writing would leave) is dropped before appending.
    Files.writeString(draws, "1,99", StandardCharsets.UTF_8,
        java.nio.file.StandardOpenOption.APPEND);

    // The stopped run had two threads; the resumed one has one thread for both chains.
    // Predictive checks asked for only now replicate the draws made before the stop as well.
    CliRun resumed = CliRun.of(resume(stopped, "--threads", "1", "--replicate-checks"));
    assertEquals(0, resumed.exit(), resumed.toString());
    Path whole = folder.resolve("whole");
    CliRun uninterrupted = CliRun.of(with(run, "--out", whole.toString(), "--replicate-checks"));
    assertEquals(0, uninterrupted.exit(), uninterrupted.toString());

    Map<String, List<String>> expected = rowsByChain(whole.resolve("draws.csv"));
    Map<String, List<String>> actual = rowsByChain(draws);
    assertEquals(expected.keySet(), actual.keySet());
    for (String chain : expected.keySet()) {
      assertEquals(expected.get(chain), actual.get(chain), "chain " + chain);
    }
    assertEquals(6000, actual.get("1").size());
    assertTrue(
        actual.get("header").get(0).endsWith(",centre_odds,bench_share[1],bench_share[2],"
            + "bench_share[3],bench_share[4],bench_share[5],bench_share[6],bench_share[7],"
            + "bench_share[8]"),
        actual.get("header").get(0));
    assertEquals(
        Files.readString(whole.resolve("summary.csv")), Files.readString(stopped.resolve("summary.csv")),
        "the summary over all draws, and the evaluations per draw, are those of one run");
    assertEquals(
        Files.readString(whole.resolve("predictive_checks.csv")),
        Files.readString(stopped.resolve("predictive_checks.csv")),
        "the replicates of a resumed run are those of one run");

    CliRun again = CliRun.of(resume(stopped));
    assertEquals(2, again.exit(), again.toString());
    assertTrue(again.err().contains("is finished"), again.err());
  }

  @Test
  void aFolderWithoutCheckpointCannotBeResumed() throws Exception {
    Path done = folder.resolve("done");
    CliRun finished =
        CliRun.of(
            "fit", "models/seedlings.hbm", "--data", "models/seedlings.csv", "--chains", "2",
            "--burn-in", "20", "--draws", "50", "--seed", "3", "--quiet", "--out", done.toString());
    assertEquals(0, finished.exit(), finished.toString());
    CliRun resumed = CliRun.of(resume(done));
    assertEquals(2, resumed.exit(), resumed.toString());
    assertTrue(resumed.err().contains("no checkpoint in"), resumed.err());
    assertTrue(resumed.errorIsPlain(), resumed.toString());
  }
}

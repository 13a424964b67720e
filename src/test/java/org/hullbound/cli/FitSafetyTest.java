package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Function;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * {@code fit} never destroys an earlier run, refuses runs too large for the heap before sampling,
 * and turns every bad input into exit status 2 with a message that names the file and the place.
 */
class FitSafetyTest {
  @TempDir Path folder;

  private static final String MODEL = "models/seedlings.hbm";
  private static final String DATA = "models/seedlings.csv";

  private CliRun fit(Path out, String... more) {
    List<String> args = new ArrayList<>(List.of("fit", MODEL, "--data", DATA, "--chains", "2",
        "--burn-in", "5", "--draws", "10", "--quiet", "--out", out.toString()));
    args.addAll(List.of(more));
    return CliRun.of(args.toArray(String[]::new));
  }

  @Test
  void anEarlierRunIsKeptWithoutOverwriteAndReplacedWithIt() throws IOException {
    Path out = folder.resolve("run");
    CliRun first = fit(out, "--seed", "1");
    assertEquals(0, first.exit(), first.toString());
    for (String name : List.of("draws.csv", "summary.csv", "report.html")) {
      assertTrue(Files.exists(out.resolve(name)), name);
    }
    String draws = Files.readString(out.resolve("draws.csv"));
    String report = Files.readString(out.resolve("report.html"));

    CliRun refused = fit(out, "--seed", "2");
    assertEquals(2, refused.exit(), refused.toString());
    assertTrue(refused.err().contains(out.toString()), refused.err());
    assertTrue(refused.err().contains("--overwrite"), refused.err());
    assertTrue(refused.errorIsPlain(), refused.toString());
    assertEquals(draws, Files.readString(out.resolve("draws.csv")), "draws untouched");
    assertEquals(report, Files.readString(out.resolve("report.html")), "report untouched");

    CliRun replaced = fit(out, "--seed", "2", "--overwrite");
    assertEquals(0, replaced.exit(), replaced.toString());
    assertNotEquals(draws, Files.readString(out.resolve("draws.csv")), "new draws");
    assertTrue(Files.readString(out.resolve("report.html")).contains(">2<"),
        "seed 2 in the report");
  }

  @Test
  void anyOneOutputFileOrACheckpointMarksAnEarlierRunButOtherFilesDoNot() throws IOException {
    for (String name : List.of("draws.csv", "summary.csv", "report.html", "checkpoint.bin")) {
      Path out = Files.createDirectories(folder.resolve("only-" + name));
      Files.writeString(out.resolve(name), "earlier");
      CliRun refused = fit(out);
      assertEquals(2, refused.exit(), name + ": " + refused);
      assertTrue(refused.err().contains(name), refused.err());
      assertEquals("earlier", Files.readString(out.resolve(name)));
    }
    Path notes = Files.createDirectories(folder.resolve("notes"));
    Files.writeString(notes.resolve("notes.txt"), "mine");
    assertEquals(0, fit(notes).exit(), "a folder without run files is used");
    assertEquals("mine", Files.readString(notes.resolve("notes.txt")));
  }

  @Test
  void overwriteRemovesAnEarlierCheckpointSoNoStaleFileOutlivesTheNewRun() throws IOException {
    Path out = Files.createDirectories(folder.resolve("stale"));
    Files.writeString(out.resolve("checkpoint.bin"), "earlier");
    assertEquals(0, fit(out, "--overwrite").exit());
    assertFalse(Files.exists(out.resolve("checkpoint.bin")));
  }

  @Test
  void aRunTooLargeForTheHeapIsRefusedBeforeSamplingWithTheFigureAndTheRemedies() {
    Path out = folder.resolve("huge");
    CliRun huge = CliRun.of("fit", MODEL, "--data", DATA, "--chains", "2", "--burn-in", "0",
        "--draws", "2000000000", "--quiet", "--out", out.toString());
    assertEquals(2, huge.exit(), huge.toString());
    assertTrue(huge.errorIsPlain(), huge.toString());
    // 2 chains x 2e9 draws x 10 unknowns x 8 bytes x 3 copies = 9.6e11 bytes = 894.1 GiB.
    assertTrue(huge.err().contains("894.1 GiB"), huge.err());
    assertTrue(huge.err().contains("Java heap ("), huge.err());
    assertTrue(huge.err().contains("--thin"), huge.err());
    assertTrue(huge.err().contains("--draws"), huge.err());
    assertTrue(huge.err().contains("HULLBOUND_JAVA_OPTS=-Xmx"), huge.err());
    assertFalse(Files.exists(out), "nothing was written: no sampling happened");
  }

  /**
   * A run stopped during burn-in (SIGTERM in a child JVM, the same hook as Ctrl-C) kept no draws:
   * it still writes a report, which says so, and no summary.
   */
  @Test
  void aRunStoppedBeforeAnyKeptDrawStillWritesAReportThatSaysSo() throws Exception {
    Path out = folder.resolve("burn-in");
    Process process =
        new ProcessBuilder(
                Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-cp", System.getProperty("java.class.path"), "org.hullbound.cli.Main",
                "fit", MODEL, "--data", DATA, "--chains", "1", "--burn-in", "100000000",
                "--draws", "1", "--seed", "5", "--quiet", "--out", out.toString())
            .redirectErrorStream(true)
            .redirectOutput(folder.resolve("child.txt").toFile())
            .start();
    long deadline = System.nanoTime() + java.util.concurrent.TimeUnit.SECONDS.toNanos(30);
    while (System.nanoTime() < deadline && !Files.exists(out.resolve("draws.csv"))) {
      Thread.sleep(50);
    }
    Thread.sleep(300);
    process.destroy();
    assertTrue(process.waitFor(30, java.util.concurrent.TimeUnit.SECONDS), "the child stopped");
    String output = Files.readString(folder.resolve("child.txt"));
    assertTrue(output.contains("No draws were kept"), output);
    assertTrue(output.contains("report: " + out.resolve("report.html")), output);
    String report = Files.readString(out.resolve("report.html"));
    assertTrue(report.contains("No draws were kept"), report);
    assertFalse(report.contains("class=\"plot plot-trace\""), "no plots without draws");
    assertFalse(Files.exists(out.resolve("summary.csv")));
  }

  /** One bad input per row: what to write, the arguments, and what the message must name. */
  static Stream<Arguments> errorPaths() {
    return Stream.of(
        row("unclosed parenthesis in the model",
            f -> List.of("fit", write(f, "broken.hbm", "param mu ~ normal(mean = 0, sd = 1\n")),
            "broken.hbm:1:18:"),
        row("unknown name in the model",
            f -> List.of("fit",
                write(f, "unbound.hbm", "model m\nparam mu ~ normal(mean = nu, sd = 1)\n")),
            "unbound.hbm:2:26:", "'nu'"),
        row("model file missing", f -> List.of("fit", f.resolve("none.hbm").toString()),
            "none.hbm", "no such file"),
        row("model file is a folder", f -> List.of("fit", f.toString()), f -> f.toString(),
            "folder"),
        row("model file is not UTF-8",
            f -> List.of("fit", writeBytes(f, "bytes.hbm", new byte[] {'m', (byte) 0xC3, '(', 0})),
            "bytes.hbm", "not UTF-8", "byte 2"),
        row("data cell not a number",
            f -> List.of("fit", MODEL, "--data",
                write(f, "bad.csv", "planted,bench_of,survived\n22,1,16\n25,x,19\n")),
            "bad.csv:3:2:", "'x'"),
        row("ragged data row",
            f -> List.of("fit", MODEL, "--data",
                write(f, "ragged.csv", "planted,bench_of,survived\n22,1\n")),
            "ragged.csv:2:"),
        row("data column missing",
            f -> List.of("fit", MODEL, "--data", write(f, "short.csv", "planted,bench_of\n22,1\n")),
            "seedlings.hbm:", "survived"),
        row("data file missing",
            f -> List.of("fit", MODEL, "--data", f.resolve("no.csv").toString()),
            "no.csv", "no such file"),
        row("data file is a folder", f -> List.of("fit", MODEL, "--data", f.toString()),
            f -> f.toString(), "folder"),
        row("starting value not a number",
            f -> List.of("fit", MODEL, "--data", DATA, "--init",
                write(f, "init.csv", "centre,abc\n")),
            "init.csv:1:8:"),
        row("starting value names no unknown",
            f -> List.of("fit", MODEL, "--data", DATA, "--init",
                write(f, "name.csv", "center,1\n")),
            "name.csv", "'center'"),
        row("starting value outside the support",
            f -> List.of("fit", MODEL, "--data", DATA, "--init",
                write(f, "neg.csv", "spread,-1\n")),
            "neg.csv", "spread = -1,", "(0, inf)"),
        row("starting values file missing",
            f -> List.of("fit", MODEL, "--data", DATA, "--init", f.resolve("gone.csv").toString()),
            "gone.csv:1:1:"),
        row("--chains 0", f -> List.of("fit", MODEL, "--data", DATA, "--chains", "0"), "--chains",
            "0"),
        row("--draws -3", f -> List.of("fit", MODEL, "--data", DATA, "--draws", "-3"), "--draws",
            "-3"),
        row("--thin 0", f -> List.of("fit", MODEL, "--data", DATA, "--thin", "0"), "--thin", "0"),
        row("--burn-in -1", f -> List.of("fit", MODEL, "--data", DATA, "--burn-in", "-1"),
            "--burn-in", "-1"),
        row("--threads 0", f -> List.of("fit", MODEL, "--data", DATA, "--threads", "0"),
            "--threads", "0"),
        row("--draws not a number", f -> List.of("fit", MODEL, "--draws", "many"), "--draws",
            "'many'"),
        row("--draws beyond an int", f -> List.of("fit", MODEL, "--draws", "99999999999"),
            "--draws", "99999999999"),
        row("sweeps beyond an int",
            f -> List.of("fit", MODEL, "--data", DATA, "--draws", "100000", "--thin", "100000"),
            "--thin", "at most"),
        row("an unknown option", f -> List.of("fit", MODEL, "--drawz", "3"), "--drawz"),
        row("--out is a file",
            f -> List.of("fit", MODEL, "--data", DATA, "--out", write(f, "file.txt", "x")),
            "file.txt", "not a folder"),
        row("--out holds an earlier run",
            f -> List.of("fit", MODEL, "--data", DATA, "--out",
                write(f, "old/draws.csv", "chain,draw\n").replace("/draws.csv", "")),
            f -> f.resolve("old").toString(), "--overwrite"));
  }

  private static Arguments row(String what, Function<Path, List<String>> args, String... named) {
    return Arguments.of(what, args, (Function<Path, List<String>>) f -> List.of(named));
  }

  private static Arguments row(
      String what, Function<Path, List<String>> args, Function<Path, String> file,
      String... named) {
    return Arguments.of(what, args, (Function<Path, List<String>>) f -> {
      List<String> all = new ArrayList<>(List.of(named));
      all.add(file.apply(f));
      return all;
    });
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("errorPaths")
  void eachErrorPathExitsTwoWithAMessageNamingTheFileAndThePlace(
      String what, Function<Path, List<String>> args, Function<Path, List<String>> named) {
    List<String> all = new ArrayList<>(args.apply(folder));
    if (!all.contains("--out")) {
      all.addAll(List.of("--out", folder.resolve("out").toString()));
    }
    all.add("--quiet");
    CliRun run = CliRun.of(all.toArray(String[]::new));
    assertEquals(2, run.exit(), what + ": " + run);
    assertTrue(run.errorIsPlain(), what + ": " + run);
    for (String part : named.apply(folder)) {
      assertTrue(run.err().contains(part), what + ": expected '" + part + "' in\n" + run.err());
    }
    assertFalse(Files.exists(folder.resolve("out").resolve("draws.csv")), "nothing sampled");
  }

  private static String write(Path folder, String name, String text) {
    try {
      Path file = folder.resolve(name);
      Files.createDirectories(file.getParent());
      return Files.writeString(file, text).toString();
    } catch (IOException e) {
      throw new java.io.UncheckedIOException(e);
    }
  }

  private static String writeBytes(Path folder, String name, byte[] bytes) {
    try {
      return Files.write(folder.resolve(name), bytes).toString();
    } catch (IOException e) {
      throw new java.io.UncheckedIOException(e);
    }
  }
}

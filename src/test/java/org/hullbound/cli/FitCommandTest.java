package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.Reader;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/** {@code hullbound fit} end to end on the bundled demo models (invented data). */
class FitCommandTest {
  @TempDir Path folder;

  private record Result(int status, String out, String err) {}

  private static Result run(String... args) {
    StringWriter out = new StringWriter();
    StringWriter err = new StringWriter();
    CommandLine command = Main.commandLine();
    command.setOut(new PrintWriter(out));
    command.setErr(new PrintWriter(err));
    int status = command.execute(args);
    return new Result(status, out.toString(), err.toString());
  }

  private static List<CSVRecord> csv(Path file) throws IOException {
    try (Reader reader = Files.newBufferedReader(file);
        CSVParser parser = CSVParser.parse(reader, CSVFormat.RFC4180)) {
      return parser.getRecords();
    }
  }

  @Test
  void fitsTheSeedlingsDemoWritesBothFilesAndPrintsTheTable() throws Exception {
    Path out = folder.resolve("seedlings");
    Result result =
        run("fit", "models/seedlings.hbm", "--data", "models/seedlings.csv", "--chains", "2",
            "--burn-in", "100", "--draws", "150", "--seed", "7", "--out", out.toString(), "--quiet");
    assertEquals(0, result.status(), result.err());
    assertEquals("", result.err(), "--quiet prints nothing on stderr");
    assertTrue(result.out().contains("unknown"), result.out());
    assertTrue(result.out().contains("effect[8]"), result.out());
    assertTrue(result.out().contains("conjugate normal"), result.out());
    assertTrue(result.out().contains("adaptive rejection"), result.out());
    assertTrue(result.out().contains("seed 7"), result.out());
    assertTrue(result.out().contains(out.resolve("draws.csv").toString()), result.out());
    List<CSVRecord> draws = csv(out.resolve("draws.csv"));
    assertEquals(1 + 2 * 150, draws.size());
    assertEquals(List.of("chain", "draw", "centre", "spread", "effect[1]"),
        draws.get(0).toList().subList(0, 5));
    assertEquals(12, draws.get(0).size());
    List<CSVRecord> summary = csv(out.resolve("summary.csv"));
    assertEquals(1 + 10, summary.size());
    assertEquals("unknown", summary.get(0).get(0));
    assertTrue(result.out().contains(out.resolve("report.html").toString()), result.out());
    ReportPage.assertOneTracePerUnknown(
        Files.readString(out.resolve("report.html")), draws.get(0).toList().subList(2, 12));
  }

  @Test
  void theSameSeedGivesTheSameDrawsFileWithOneAndWithTwoThreads() throws IOException {
    Path one = folder.resolve("one");
    Path two = folder.resolve("two");
    String[] common = {"fit", "models/fill_weights.hbm", "--data", "models/bottles.csv", "--data",
        "models/shifts.csv", "--chains", "2", "--burn-in", "20", "--draws", "50", "--seed", "3",
        "--quiet"};
    assertEquals(0, run(concat(common, "--threads", "1", "--out", one.toString())).status());
    assertEquals(0, run(concat(common, "--threads", "2", "--out", two.toString())).status());
    // Rows of different chains may interleave; each chain's rows, in order, must be identical.
    assertEquals(sortedRows(one.resolve("draws.csv")), sortedRows(two.resolve("draws.csv")));
  }

  private static List<String> sortedRows(Path file) throws IOException {
    List<String> lines = Files.readAllLines(file);
    List<String> rows = new java.util.ArrayList<>(lines.subList(1, lines.size()));
    rows.sort(
        java.util.Comparator.comparing((String row) -> Integer.parseInt(row.split(",")[0]))
            .thenComparing(row -> Integer.parseInt(row.split(",")[1])));
    return rows;
  }

  private static String[] concat(String[] first, String... more) {
    String[] all = java.util.Arrays.copyOf(first, first.length + more.length);
    System.arraycopy(more, 0, all, first.length, more.length);
    return all;
  }

  @Test
  void imputedObservationsAreReportedInTheSummary() {
    Result result =
        run("fit", "models/fill_weights.hbm", "--data", "models/bottles.csv", "--data",
            "models/shifts.csv", "--chains", "2", "--burn-in", "50", "--draws", "100", "--seed", "1",
            "--out", folder.toString(), "--quiet");
    assertEquals(0, result.status(), result.err());
    assertTrue(result.out().contains("imputed"), result.out());
    assertTrue(result.out().contains("2 missing observations were imputed"), result.out());
  }

  @Test
  void unknownsWithoutProvenLogConcavityAreDrawnByTheFallbackAndSaidSo() {
    Result result =
        run("fit", "models/sensors.hbm", "--data", "models/sensors.csv", "--chains", "2",
            "--burn-in", "100", "--draws", "100", "--seed", "2", "--out", folder.toString(),
            "--quiet");
    assertEquals(0, result.status(), result.err());
    assertTrue(result.out().contains("ARMS fallback"), result.out());
    assertTrue(result.out().contains("level: drawn by ARMS fallback"), result.out());
  }

  @Test
  void startingValuesFromAFileAreAccepted() throws IOException {
    Path init = folder.resolve("init.csv");
    Files.writeString(init, "name,value\ncentre,0.5\nspread,0.3\n");
    Result result =
        run("fit", "models/seedlings.hbm", "--data", "models/seedlings.csv", "--chains", "1",
            "--burn-in", "10", "--draws", "20", "--init", init.toString(), "--out",
            folder.resolve("o").toString(), "--quiet");
    assertEquals(0, result.status(), result.err());
  }

  @Test
  void badStartingValuesModelErrorsAndBadOptionsExitWithTwoAndNoStackTrace() throws IOException {
    Path init = folder.resolve("init.csv");
    Files.writeString(init, "centre,0.5\ncenter,1\n");
    Result wrongName =
        run("fit", "models/seedlings.hbm", "--data", "models/seedlings.csv", "--init",
            init.toString(), "--out", folder.toString(), "--quiet");
    assertEquals(2, wrongName.status());
    assertTrue(wrongName.err().contains("'center'"), wrongName.err());

    Path broken = folder.resolve("broken.hbm");
    Files.writeString(broken, "param mu ~ normal(mean = 0, sd = 1\n");
    Result modelError = run("fit", broken.toString(), "--out", folder.toString(), "--quiet");
    assertEquals(2, modelError.status());
    assertTrue(modelError.err().contains("broken.hbm:"), modelError.err());
    assertFalse(modelError.err().contains("\tat "), "no stack trace");

    Result missing = run("fit", folder.resolve("none.hbm").toString(), "--quiet");
    assertEquals(2, missing.status());
    assertTrue(missing.err().contains("no such file"), missing.err());

    Result badChains = run("fit", "models/seedlings.hbm", "--chains", "0");
    assertEquals(2, badChains.status());
    assertTrue(badChains.err().contains("--chains must be at least 1, got 0"), badChains.err());

    Result notANumber = run("fit", "models/seedlings.hbm", "--draws", "many");
    assertEquals(2, notANumber.status());
  }

  /**
   * An interrupted run (SIGTERM, which runs the same shutdown hook as Ctrl-C) leaves a valid
   * draws.csv of whole rows and a summary of the draws made so far. Runs the CLI in a child JVM.
   */
  @Test
  void anInterruptedRunLeavesValidFiles() throws Exception {
    Path out = folder.resolve("interrupted");
    // A run far longer than the test (2e7 sweeps per chain) that keeps few enough draws to pass
    // the memory check before sampling.
    Process process =
        new ProcessBuilder(
                Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-cp", System.getProperty("java.class.path"), "org.hullbound.cli.Main",
                "fit", "models/seedlings.hbm", "--data", "models/seedlings.csv", "--chains", "2",
                "--burn-in", "10", "--draws", "200000", "--thin", "100", "--seed", "5", "--quiet",
                "--out", out.toString())
            .redirectErrorStream(true)
            .redirectOutput(folder.resolve("child.txt").toFile())
            .start();
    Path draws = out.resolve("draws.csv");
    long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
    while (System.nanoTime() < deadline
        && !(Files.exists(draws) && Files.readAllLines(draws).size() > 50)) {
      Thread.sleep(100);
    }
    process.destroy();
    assertTrue(process.waitFor(30, TimeUnit.SECONDS), "the child stopped");
    String output = Files.readString(folder.resolve("child.txt"));
    List<CSVRecord> rows = csv(draws);
    assertTrue(rows.size() > 50, "rows " + rows.size() + "; output " + output);
    for (CSVRecord row : rows) {
      assertEquals(12, row.size(), "a whole row: " + row);
    }
    assertTrue(Files.exists(out.resolve("summary.csv")), output);
    ReportPage.assertOneTracePerUnknown(
        Files.readString(out.resolve("report.html")), rows.get(0).toList().subList(2, 12));
    assertTrue(output.contains("stopped early"), output);
  }
}

package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.report.SummaryTable;
import org.hullbound.report.Verdicts;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code hullbound summarize}: its report equals the one built directly from the draws by {@link
 * PosteriorSummary}, {@link SummaryTable} and {@link Verdicts}, and every bad input exits 2 with a
 * message naming the file, line and cell, never a stack trace.
 */
class SummarizeCommandTest {

  private static final int CHAINS = 4;
  private static final int DRAWS = 300;

  @TempDir Path folder;
  private double[][] mu;
  private double[][] sigma;
  private Path drawsFile;

  /**
   * Four AR(1) chains (rho = 0.6) for mu and iid exponential chains for sigma, fixed seed, written
   * as fit writes them: rows of the chains interleaved, chains and draws numbered from 1.
   */
  @BeforeEach
  void writeDraws() throws IOException {
    RandomGenerator seeded = RandomGeneratorFactory.of("L64X128MixRandom").create(20261201L);
    mu = new double[CHAINS][DRAWS];
    sigma = new double[CHAINS][DRAWS];
    for (int c = 0; c < CHAINS; c++) {
      double state = seeded.nextGaussian();
      for (int i = 0; i < DRAWS; i++) {
        state = 0.6 * state + 0.8 * seeded.nextGaussian();
        mu[c][i] = 1.5 + state;
        sigma[c][i] = -Math.log(seeded.nextDouble());
      }
    }
    StringBuilder text = new StringBuilder("chain,draw,mu,sigma\n");
    for (int i = 0; i < DRAWS; i++) {
      for (int c = 0; c < CHAINS; c++) {
        text.append(c + 1).append(',').append(i + 1).append(',').append(mu[c][i]).append(',')
            .append(sigma[c][i]).append('\n');
      }
    }
    drawsFile = folder.resolve("draws.csv");
    Files.writeString(drawsFile, text);
  }

  private static SummaryTable direct(List<String> names, List<double[][]> draws) {
    List<VariableSummary> summaries = new ArrayList<>();
    for (int k = 0; k < names.size(); k++) {
      summaries.add(PosteriorSummary.of(names.get(k), draws.get(k)));
    }
    return SummaryTable.of(summaries);
  }

  @Test
  void printsTheTableAndVerdictsOfPosteriorSummaryRunDirectly() {
    CliRun run = CliRun.of("summarize", drawsFile.toString());
    assertEquals(0, run.exit(), run.toString());
    SummaryTable table = direct(List.of("mu", "sigma"), List.of(mu, sigma));
    String expected =
        table.text() + "\n" + String.join("\n", Verdicts.of(table).lines()) + "\n";
    assertEquals(expected, run.out());
    assertTrue(run.out().startsWith("4 chains of 300 draws"), run.out());
    assertEquals("", run.err());
  }

  @Test
  void writesTheFullPrecisionCsvAtomicallyAndItsNumbersAreThoseOfPosteriorSummary()
      throws IOException {
    Path csv = folder.resolve("out").resolve("summary.csv");
    CliRun run = CliRun.of("summarize", drawsFile.toString(), "--csv", csv.toString());
    assertEquals(0, run.exit(), run.toString());
    String written = Files.readString(csv, StandardCharsets.UTF_8);
    assertEquals(direct(List.of("mu", "sigma"), List.of(mu, sigma)).csv(), written);
    VariableSummary direct = PosteriorSummary.of("mu", mu);
    String[] muRow = written.split("\r\n")[1].split(",");
    assertEquals(direct.mean(), Double.parseDouble(muRow[1]));
    assertEquals(direct.mcseMean(), Double.parseDouble(muRow[2]));
    assertEquals(direct.rhat(), Double.parseDouble(muRow[8]));
    assertEquals(direct.essBulk(), Double.parseDouble(muRow[11]));
    assertTrue(run.out().endsWith("summary: " + csv + "\n"), run.out());
    try (var left = Files.list(csv.getParent())) {
      assertEquals(List.of(csv), left.toList(), "no temporary file is left behind");
    }
  }

  @Test
  void columnsChooseAndOrderTheVariables() {
    CliRun run = CliRun.of("summarize", drawsFile.toString(), "--columns", "sigma,mu");
    assertEquals(0, run.exit(), run.toString());
    SummaryTable table = direct(List.of("sigma", "mu"), List.of(sigma, mu));
    assertTrue(run.out().startsWith(table.text()), run.out());
    CliRun one = CliRun.of("summarize", drawsFile.toString(), "--columns", "sigma");
    assertFalse(one.out().contains("mu "), one.out());
  }

  @Test
  void thresholdsReachTheVerdicts() {
    // 1200 draws of an AR(1) chain with rho = 0.6 have an ess near 1200 * 0.4 / 1.6 = 300 (Geyer
    // 1992), far below 100000, so a minimum of 100000 must flag mu.
    CliRun run =
        CliRun.of("summarize", drawsFile.toString(), "--min-ess", "100000", "--max-rhat", "1.5");
    assertEquals(0, run.exit(), run.toString());
    assertTrue(run.out().contains("mu: few effective draws in the bulk"), run.out());
    assertTrue(run.out().contains("< 100000"), run.out());
    // The table's verdict mark is judged at the same thresholds as the verdict lines: sigma passes
    // the default minimum of 400 but not 100000.
    assertTrue(run.out().contains("sigma: few effective draws"), run.out());
    String sigmaRow =
        run.out().lines().filter(line -> line.startsWith("sigma ")).findFirst().orElseThrow();
    assertTrue(sigmaRow.contains("  check"), sigmaRow);
  }

  @Test
  void badThresholdsAndColumnsAreUsageErrors() {
    CliRun rhat = CliRun.of("summarize", drawsFile.toString(), "--max-rhat", "0.9");
    assertEquals(2, rhat.exit());
    assertEquals("hullbound summarize: --max-rhat must be a finite number above 1, got 0.9\n",
        rhat.err());
    CliRun ess = CliRun.of("summarize", drawsFile.toString(), "--min-ess", "NaN");
    assertEquals(2, ess.exit());
    // NaN is no number of the language's grammar (docs/model-language.md), so the option's
    // converter refuses it before the range check.
    assertTrue(ess.err().contains("'NaN' is not a number"), ess.err());
    CliRun infinite = CliRun.of("summarize", drawsFile.toString(), "--min-ess", "inf");
    assertEquals(2, infinite.exit());
    assertTrue(infinite.err().contains("--min-ess must be a finite number above 0, got inf"),
        infinite.err());
    CliRun unknown = CliRun.of("summarize", drawsFile.toString(), "--columns", "mu,sigam");
    assertEquals(2, unknown.exit());
    assertEquals(
        "hullbound summarize: --columns: 'sigam' is not a variable of " + drawsFile
            + " (did you mean 'sigma'?); its variables are mu, sigma\n",
        unknown.err());
    CliRun empty = CliRun.of("summarize", drawsFile.toString(), "--columns", "mu,,sigma");
    assertEquals(2, empty.exit());
    assertTrue(empty.errorIsPlain(), empty.toString());
    CliRun notANumber = CliRun.of("summarize", drawsFile.toString(), "--min-ess", "many");
    assertEquals(2, notANumber.exit());
    assertTrue(notANumber.err().contains("--min-ess"), notANumber.err());
  }

  @Test
  void unequalChainsAreCutWithANoteOnStandardError() throws IOException {
    Path file = folder.resolve("uneven.csv");
    StringBuilder text = new StringBuilder("chain,x\n");
    for (int i = 0; i < 10; i++) {
      text.append("1,").append(i * 0.37 % 1).append('\n');
    }
    for (int i = 0; i < 8; i++) {
      text.append("2,").append(i * 0.61 % 1).append('\n');
    }
    Files.writeString(file, text);
    CliRun run = CliRun.of("summarize", file.toString());
    assertEquals(0, run.exit(), run.toString());
    assertEquals(
        "hullbound summarize: note: the chains differ in length (chain 1: 10, chain 2: 8), so"
            + " each is cut to its first 8 draws\n",
        run.err());
    assertTrue(run.out().startsWith("2 chains of 8 draws"), run.out());
  }

  @Test
  void nonFiniteDrawsAreReportedByTheVerdictsNotRefused() throws IOException {
    Path file = folder.resolve("nan.csv");
    Files.writeString(file, "x,y\n1,2\nNaN,3\n2,4\n3,5\n4,-1\n");
    CliRun run = CliRun.of("summarize", file.toString());
    assertEquals(0, run.exit(), run.toString());
    assertTrue(run.out().contains("x: some draws are not finite numbers"), run.out());
  }

  /** Each malformed file, the position its message must start with, and a word it must hold. */
  @Test
  void everyBadFileExitsTwoWithItsPositionAndNoStackTrace() throws IOException {
    String[][] cases = {
      {"chain,draw,mu\n1,1,0.5\n1,2,zero\n", ":3:3: cell 3 (column 'mu'): expected a number"},
      {"a,b\n1,2\n3\n", ":3:2: this row has 1 cell but the header has 2 columns"},
      {"", ":1:1: the draws file is empty"},
      {"chain,draw,x\n", ":2:1: the draws file has a header row but no draws"},
      {"x,y,x\n1,2,3\n", ":1:3: column names must be distinct"},
      {"chain,x\n1,0.5\nA,0.7\n", ":3:1: cell 1 (column 'chain'): expected a whole number"},
      {"x\n1\nNA\n", ":3:1: cell 1 (column 'x') is NA"},
      {"x,y\n1,\n", ":2:2: cell 2 (column 'y') is empty"},
      {"x\n1e999\n", ":2:1: cell 1 (column 'x'): '1e999' is too large to represent"},
      {"x\n\"1\n", ":2:1: this is not valid CSV"},
    };
    for (String[] c : cases) {
      Path file = folder.resolve("bad.csv");
      Files.writeString(file, c[0]);
      CliRun run = CliRun.of("summarize", file.toString());
      assertEquals(2, run.exit(), c[0] + "\n" + run);
      assertTrue(run.err().startsWith(file + c[1]), c[0] + "\n" + run);
      assertTrue(run.errorIsPlain(), run.toString());
      assertEquals("", run.out(), run.toString());
    }
  }

  @Test
  void summarisingTheDrawsOfFitGivesFitsOwnSummary() throws IOException {
    Path out = folder.resolve("seedlings");
    CliRun fit = CliRun.of("fit", "models/seedlings.hbm", "--data", "models/seedlings.csv",
        "--chains", "2", "--burn-in", "100", "--draws", "150", "--seed", "7", "--out",
        out.toString(), "--quiet");
    assertEquals(0, fit.exit(), fit.toString());
    Path summary = folder.resolve("again.csv");
    CliRun run = CliRun.of("summarize", out.resolve("draws.csv").toString(), "--csv",
        summary.toString());
    assertEquals(0, run.exit(), run.toString());
    List<String> fitRows = Files.readAllLines(out.resolve("summary.csv"));
    List<String> ourRows = Files.readAllLines(summary);
    assertEquals(fitRows.size(), ourRows.size());
    for (int r = 0; r < fitRows.size(); r++) {
      // Every column up to "draws per chain" agrees to the last digit; the update columns are
      // known to fit only.
      List<String> fitCells = List.of(fitRows.get(r).split(",")).subList(0, 18);
      List<String> ourCells = List.of(ourRows.get(r).split(",")).subList(0, 18);
      assertEquals(fitCells, ourCells, "row " + r);
    }
  }

  @Test
  void aMissingFileExitsTwoNamingIt() {
    Path missing = folder.resolve("missing.csv");
    CliRun run = CliRun.of("summarize", missing.toString());
    assertEquals(2, run.exit());
    assertEquals("hullbound: cannot read '" + missing + "': no such file\n", run.err());
  }

  @Test
  void withoutAFileItIsAUsageError() {
    CliRun run = CliRun.of("summarize");
    assertEquals(2, run.exit());
    assertTrue(run.err().contains("DRAWS.csv"), run.err());
  }
}

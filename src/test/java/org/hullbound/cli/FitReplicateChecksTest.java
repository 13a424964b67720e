package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.report.PredictiveChecks;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code hullbound fit --replicate-checks} and {@code --keep-replicates} end to end. */
class FitReplicateChecksTest {
  @TempDir Path folder;

  private static List<CSVRecord> csv(Path file) throws IOException {
    try (Reader reader = Files.newBufferedReader(file);
        CSVParser parser = CSVParser.parse(reader, CSVFormat.RFC4180)) {
      return parser.getRecords();
    }
  }

  private Path model(String text) throws IOException {
    Path file = folder.resolve("m.hbm");
    Files.writeString(file, text);
    return file;
  }

  /** Fits the seedlings demo (2 chains, seed 4) into {@code out} with {@code option}. */
  private static CliRun seedlings(Path out, int draws, String option) {
    CliRun run = CliRun.of("fit", "models/seedlings.hbm", "--data", "models/seedlings.csv",
        "--chains", "2", "--burn-in", "20", "--draws", Integer.toString(draws), "--seed", "4",
        "--out", out.toString(), "--quiet", option);
    assertEquals(0, run.exit(), run.toString());
    return run;
  }

  @Test
  void theChecksGoToTheirFileTheTerminalAndTheReportButNotToTheDraws() throws IOException {
    Path out = folder.resolve("out");
    CliRun run = seedlings(out, 100, "--replicate-checks");
    assertTrue(run.out().contains("Posterior predictive checks"), run.out());
    assertTrue(run.out().contains("survived  zero_share"), run.out());
    List<CSVRecord> checks = csv(out.resolve(PredictiveChecks.FILE_NAME));
    assertEquals(PredictiveChecks.CSV_HEADER, checks.get(0).toList());
    assertEquals(List.of("mean", "sd", "min", "max", "zero_share"),
        checks.subList(1, checks.size()).stream().map(r -> r.get(1)).toList());
    assertEquals("200", checks.get(1).get(PredictiveChecks.CSV_HEADER.indexOf("sweeps")));
    assertEquals(12, csv(out.resolve("draws.csv")).get(0).size(), "draws.csv holds no replicates");
    assertFalse(Files.exists(out.resolve("replicates.csv")));
    String report = Files.readString(out.resolve("report.html"));
    assertTrue(report.contains("id=\"predictive\""));
    assertEquals(5, report.split("class=\"plot plot-predictive\"", -1).length - 1);
    CliRun again = CliRun.of("report", out.toString());
    assertEquals(0, again.exit(), again.toString());
    String redrawn = Files.readString(out.resolve("report.html"));
    assertTrue(redrawn.contains("id=\"predictive\""), "report DIR keeps the checks");
    // the histograms too, from predictive_sweeps.csv (reportDirRedrawsThePanelsOfFitsOwnPage)
    assertEquals(5, redrawn.split("class=\"plot plot-predictive\"", -1).length - 1);
    assertFalse(redrawn.contains("no histogram"));
  }

  @Test
  void keepReplicatesWritesEveryReplicatedDataSetToAFileOfItsOwn() throws IOException {
    Path out = folder.resolve("kept");
    seedlings(out, 30, "--keep-replicates");
    List<CSVRecord> rows = csv(out.resolve("replicates.csv"));
    assertEquals(1 + 2 * 30, rows.size());
    assertEquals(List.of("chain", "draw", "survived[1]"), rows.get(0).toList().subList(0, 3));
    assertEquals(2 + 40, rows.get(0).size(), "the 40 trays of the demo data");
    assertTrue(Files.exists(out.resolve(PredictiveChecks.FILE_NAME)), "implies the checks");
  }

  @Test
  void aCheckOfTheModelFileIsReportedBesideTheDefaults() throws IOException {
    Path model = model("""
        param mu ~ normal(mean = 0, sd = 5)
        index obs
        data y[obs] = [0.3, -1.2, 2.2, 0.9, 1.4] ~ normal(mean = mu, sd = 1)
        check squares = sum(obs: (y[obs] - mu) ^ 2)
        """);
    Path out = folder.resolve("own");
    CliRun run = CliRun.of("fit", model.toString(), "--chains", "2", "--burn-in", "20",
        "--draws", "100", "--seed", "2", "--out", out.toString(), "--quiet", "--replicate-checks");
    assertEquals(0, run.exit(), run.toString());
    assertTrue(run.out().contains("squares (check)"), run.out());
    CSVRecord squares = csv(out.resolve(PredictiveChecks.FILE_NAME)).get(5);
    assertEquals(List.of("y", "squares", "check"), squares.toList().subList(0, 3));
    assertEquals("yes", squares.get(4), "it reads mu");
  }

  @Test
  void checkListsTheTestQuantitiesOfEveryModelledName() throws IOException {
    Path model = model("""
        param rate ~ gamma(shape = 2, rate = 1)
        index night
        data caught[night] = [0, 3, NA, 1] ~ poisson(rate = rate)
        check pearson = sum(night: (caught[night] - rate) ^ 2 / rate)
        """);
    CliRun run = CliRun.of("check", model.toString());
    assertEquals(0, run.exit(), run.toString());
    assertTrue(run.out().contains("caught ~ poisson, 3 observed (1 missing, left out of the"
        + " defaults): mean, sd, min, max, zero_share, pearson (check)"), run.out());
  }

  @Test
  void aCheckThatReadsNoModelledDataIsAModelErrorWithExitTwo() throws IOException {
    Path model = model("""
        param mu ~ normal(mean = 0, sd = 5)
        check twice = 2 * mu
        """);
    CliRun run = CliRun.of("fit", model.toString(), "--out", folder.resolve("x").toString(),
        "--quiet", "--replicate-checks");
    assertEquals(2, run.exit(), run.toString());
    assertTrue(run.errorIsPlain(), run.toString());
    assertTrue(run.err().contains("m.hbm:2:7: check 'twice' must read exactly one modelled data"),
        run.err());
  }

  @Test
  void aCensoredLineIsLeftOutAndTheRunStillEnds() throws IOException {
    // It once failed in the first kept sweep: no replicate can be drawn from a censored family.
    Path out = folder.resolve("wells");
    CliRun run = CliRun.of("fit", "models/wells.hbm", "--data", "models/wells.csv",
        "--chains", "2", "--burn-in", "20", "--draws", "50", "--seed", "4",
        "--out", out.toString(), "--quiet", "--replicate-checks");
    assertEquals(0, run.exit(), run.toString());
    assertTrue(run.out().contains("nothing to check") || run.err().contains("nothing to check"),
        run.toString());
    assertFalse(Files.exists(out.resolve("predictive_checks.csv"))
        && Files.readString(out.resolve("predictive_checks.csv")).contains("nitrate"));
  }

  /**
   * The largest and smallest over a set and the indicators in checks. Observed values by hand from
   * the ten counts: the largest is 11, the smallest count less 0 is 0, two counts exceed 5 (7 and
   * 11), five are below 0.5. Replicated, {@code max(obs: y[obs])} is the default max statistic and
   * the share below 0.5 is the default zero share, so their p-values agree to the bit.
   */
  @Test
  void largestSmallestAndIndicatorsInChecks() throws IOException {
    Path model = model(String.join("\n",
        "index obs",
        "data  y[obs] = [3, 0, 0, 7, 2, 0, 11, 0, 1, 0] ~ poisson(rate = r)",
        "param r ~ gamma(shape = 2, rate = 1)",
        "check top = max(obs: y[obs])",
        "check bottom = min(obs: y[obs] + 0)",
        "check high = sum(obs: above(y[obs], 5))",
        "check zeros = sum(obs: below(y[obs], 0.5)) / 10",
        ""));
    Path out = folder.resolve("out");
    CliRun run = CliRun.of("fit", model.toString(), "--chains", "2", "--burn-in", "50", "--draws",
        "400", "--seed", "3", "--out", out.toString(), "--quiet", "--replicate-checks");
    assertEquals(0, run.exit(), run.toString());
    List<CSVRecord> rows = csv(out.resolve(PredictiveChecks.FILE_NAME));
    java.util.Map<String, CSVRecord> by = new java.util.HashMap<>();
    for (CSVRecord row : rows.subList(1, rows.size())) {
      by.put(row.get(1), row);
    }
    assertEquals("11.0", by.get("top").get(3));
    assertEquals("0.0", by.get("bottom").get(3));
    assertEquals("2.0", by.get("high").get(3));
    assertEquals("0.5", by.get("zeros").get(3));
    for (int column : new int[] {5, 6, 7}) {
      assertEquals(by.get("max").get(column), by.get("top").get(column), "max, column " + column);
      assertEquals(by.get("min").get(column), by.get("bottom").get(column),
          "min, column " + column);
      assertEquals(by.get("zero_share").get(column), by.get("zeros").get(column),
          "zeros, column " + column);
    }
  }

  /**
   * {@code report DIR} draws the predictive-check panels again from predictive_sweeps.csv: the
   * section equals fit's own to the byte (it showed the p-values without histograms). A folder
   * without the file still gets the p-values, and says why there is no histogram.
   */
  @Test
  void reportDirRedrawsThePanelsOfFitsOwnPage() throws IOException {
    Path model = model(String.join("\n",
        "index obs",
        "data  y[obs] = [3, 0, 0, 7, 2, 0, 11, 0, 1, 0] ~ poisson(rate = r)",
        "param r ~ gamma(shape = 2, rate = 1)",
        "check spread = sum(obs: (y[obs] - r) ^ 2 / r)",
        "check top = max(obs: y[obs])",
        ""));
    Path out = folder.resolve("out");
    CliRun run = CliRun.of("fit", model.toString(), "--chains", "2", "--burn-in", "50", "--draws",
        "300", "--seed", "8", "--out", out.toString(), "--quiet", "--replicate-checks");
    assertEquals(0, run.exit(), run.toString());
    assertTrue(Files.isRegularFile(out.resolve(PredictiveChecks.SWEEPS_FILE)));
    String fitted = predictiveSection(Files.readString(out.resolve("report.html")));
    assertTrue(fitted.contains("<svg") && !fitted.contains("no histogram"), fitted);
    Files.delete(out.resolve("report.html"));
    CliRun again = CliRun.of("report", out.toString());
    assertEquals(0, again.exit(), again.toString());
    assertEquals(fitted, predictiveSection(Files.readString(out.resolve("report.html"))));

    Files.delete(out.resolve(PredictiveChecks.SWEEPS_FILE));
    assertEquals(0, CliRun.of("report", out.toString()).exit());
    String older = predictiveSection(Files.readString(out.resolve("report.html")));
    assertTrue(older.contains("(no histogram: the run folder has no predictive_sweeps.csv)"),
        older);
  }

  private static String predictiveSection(String page) {
    int start = page.indexOf("<section id=\"predictive\">");
    assertTrue(start >= 0, "the page has a predictive section");
    return page.substring(start, page.indexOf("</section>\n</section>", start));
  }
}

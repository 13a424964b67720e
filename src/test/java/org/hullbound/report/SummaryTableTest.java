package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.StringReader;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.junit.jupiter.api.Test;

class SummaryTableTest {
  private static final List<String> HEADINGS =
      List.of(
          "unknown", "mean +- mcse", "sd", "95% interval", "R-hat", "bulk-ESS", "tail-ESS",
          "verdict", "update", "evals per draw");

  private static SummaryTable sample() {
    List<VariableSummary> summaries =
        List.of(
            Summaries.withValues("alpha", 0.3009, 0.1013, 0.1071, 0.3002, 0.4944, 0.0016),
            Summaries.withValues("beta[3]", -1.6157, 1.2041, -3.8372, -1.6563, 0.9015, 0.33),
            Summaries.withValues("total", 4.99e6, 9.936e5, 3.014e6, 4.977e6, 6.956e6, 15000),
            Summaries.withValues("sigma", -6.3e-7, 2.228e-5, -4.808e-5, -6.46e-7, 4.956e-5, 3.5e-7),
            Summaries.undefined("broken", VariableSummary.State.NON_FINITE, "draw 3 is NaN, twice"));
    Map<String, UpdateFacts> updates =
        Map.of(
            "alpha", UpdateFacts.exact("conjugate", 0),
            "beta[3]", UpdateFacts.exact("adaptive rejection", 3.27),
            "sigma", UpdateFacts.switchedToFallback("ARMS fallback", 11.5, 212));
    return SummaryTable.of(summaries, updates);
  }

  private static List<String> lines(String text) {
    return List.of(text.split("\n"));
  }

  /** The cells of a line: runs of two or more spaces and the group bars separate them. */
  private static List<String> cells(String line) {
    return List.of(line.trim().split(" {2,}(\\| {2,})?"));
  }

  @Test
  void headingsAreOursInOrderUnderACaptionAndTheirGroups() {
    List<String> lines = lines(sample().text());
    assertEquals(
        "4 chains of 1000 draws; R-hat, bulk-ESS and tail-ESS from rank-normalised split chains",
        lines.get(0));
    assertEquals(List.of("|", "estimate", "|", "trust", "|", "cost"),
        List.of(lines.get(1).trim().split(" +")));
    assertEquals(HEADINGS, cells(lines.get(2)));
    // Each group label stands over the first column of its group, after the group's bar.
    String headings = lines.get(2);
    assertEquals(headings.indexOf("|  ") , lines.get(1).indexOf("|  "));
    assertEquals(headings.indexOf("R-hat"), lines.get(1).indexOf("trust"));
    assertEquals(headings.indexOf("update"), lines.get(1).indexOf("cost"));
  }

  @Test
  void everyRowHasTheWidthOfTheRuleAndColumnsLineUp() {
    List<String> lines = lines(sample().text());
    String rule = lines.get(3);
    assertTrue(rule.matches("[-| ]+"), rule);
    // The rule marks each column's extent; right-aligned cells end where their dashes end.
    for (String line : lines.subList(2, lines.size())) {
      assertEquals(rule.length(), line.length(), "line '" + line + "'");
    }
    int sdEnd = lines.get(2).indexOf(" sd ") + 3;
    int barAt = lines.get(2).indexOf('|');
    for (String line : lines.subList(4, lines.size())) {
      assertTrue(line.charAt(sdEnd - 1) != ' ', "sd column ends at " + sdEnd + " in '" + line + "'");
      assertEquals(' ', line.charAt(sdEnd), line);
      assertEquals('|', line.charAt(barAt), line);
    }
    assertEquals(5 + 4, lines.size());
  }

  @Test
  void cellsShowNegativesScientificFormAndNaNAsNotAvailable() {
    String text = sample().text();
    assertEquals(
        List.of(
            "beta[3]", "-1.616 +- 0.33", "1.204", "-3.837 .. 0.9015", "1.001", "3800", "3500",
            "ok", "adaptive rejection", "3.27"),
        cells(lines(text).get(5)));
    List<String> total = cells(lines(text).get(6));
    assertEquals("4.990e+06 +- 15000", total.get(1));
    assertEquals("3.014e+06 .. 6.956e+06", total.get(3));
    assertEquals("n/a", total.get(8));
    List<String> sigma = cells(lines(text).get(7));
    assertEquals("-6.300e-07 +- 3.5e-07", sigma.get(1));
    assertEquals("ARMS fallback", sigma.get(8));
    assertEquals("11.5", sigma.get(9));
    List<String> broken = cells(lines(text).get(8));
    assertEquals("broken", broken.get(0));
    assertEquals("check", broken.get(7));
    assertTrue(
        broken.subList(1, 7).stream().allMatch("n/a"::equals)
            && broken.subList(8, 10).stream().allMatch("n/a"::equals),
        broken.toString());
    assertEquals("0", cells(lines(text).get(4)).get(9));
  }

  @Test
  void theIntervalsLineUpOnTheirRangeMarks() {
    List<String> lines = lines(sample().text());
    int at = lines.get(4).indexOf(" .. ");
    for (int i = 5; i < 8; i++) {
      assertEquals(at, lines.get(i).indexOf(" .. "), lines.get(i));
    }
  }

  @Test
  void aTableWithoutUpdateFactsLeavesOutTheCostGroup() {
    String text = SummaryTable.of(List.of(Summaries.fine("a"))).text();
    assertTrue(!text.contains("cost") && !text.contains("update"), text);
    assertEquals(HEADINGS.subList(0, 8), cells(lines(text).get(2)));
  }

  @Test
  void aLongNameWidensItsColumn() {
    String name = "a_rather_long_unknown_name[12,7]";
    String text = SummaryTable.of(List.of(Summaries.fine(name), Summaries.fine("x"))).text();
    List<String> lines = lines(text);
    assertTrue(lines.get(4).startsWith(name + "  |"));
    assertTrue(lines.get(5).startsWith("x" + " ".repeat(name.length() - 1) + "  |"));
  }

  @Test
  void mixedChainLayoutsDropTheCaptionAndAnEmptyTableSaysSo() {
    VariableSummary short1 =
        PosteriorSummary.of("a", new double[][] {{1, 2, 3, 4, 5}, {2, 3, 4, 5, 6}});
    String text = SummaryTable.of(List.of(Summaries.fine("b"), short1)).text();
    assertTrue(text.startsWith("         |  estimate"), text);
    assertEquals("no unknowns to summarise\n"
        + "         |  estimate                        |  trust\n"
        + "unknown  |  mean +- mcse  sd  95% interval  |  R-hat  bulk-ESS  tail-ESS  verdict\n"
        + "-------  |  ------------  --  ------------  |  -----  --------  --------  -------\n",
        SummaryTable.of(List.of()).text());
  }

  @Test
  void csvFollowsRfc4180WithFullPrecision() throws IOException {
    double awkward = 0.1 + 0.2;
    VariableSummary exact =
        Summaries.withValues("x", awkward, 1e-300, -Double.MAX_VALUE, Math.PI, 7, Double.NaN);
    VariableSummary infinite =
        new VariableSummary(
            "stuck", 2, 10, 1, 0.5, 0, 1, 2, Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY,
            1, 2.1, 3.3, 2.1, 0.3, 0.1, 0.1, 0.1, VariableSummary.State.COMPLETE,
            List.of("every half-chain is constant, so \"stuck\"", "second note"));
    SummaryTable table =
        SummaryTable.of(
            List.of(exact, infinite),
            Map.of("stuck", UpdateFacts.switchedToFallback("slice, stepped", 4.25, 90)));
    String csv = table.csv();
    assertTrue(csv.endsWith("\r\n"));
    assertEquals(3, csv.split("\r\n").length);
    try (CSVParser parser =
        CSVParser.parse(
            new StringReader(csv), CSVFormat.RFC4180.builder().setHeader().get())) {
      assertEquals(SummaryTable.CSV_HEADER, parser.getHeaderNames());
      List<CSVRecord> records = parser.getRecords();
      CSVRecord x = records.get(0);
      assertEquals(awkward, Double.parseDouble(x.get("mean")));
      assertEquals(1e-300, Double.parseDouble(x.get("sd")));
      assertEquals(-Double.MAX_VALUE, Double.parseDouble(x.get("lower")));
      assertEquals(Math.PI, Double.parseDouble(x.get("median")));
      assertEquals(7, Double.parseDouble(x.get("upper")));
      assertEquals(0.95, Double.parseDouble(x.get("level")));
      assertEquals("NaN", x.get("mean_mcse"));
      assertEquals("", x.get("update"));
      assertEquals("complete", x.get("status"));
      CSVRecord stuck = records.get(1);
      assertEquals("Inf", stuck.get("rhat"));
      assertEquals("slice, stepped", stuck.get("update"));
      assertEquals("4.25", stuck.get("evaluations_per_draw"));
      assertEquals("switched during run", stuck.get("fallback"));
      assertEquals("90", stuck.get("fallback_sweep"));
      assertEquals(
          "every half-chain is constant, so \"stuck\"; second note", stuck.get("notes"));
    }
    // RFC 4180 section 2.7: a quote inside a quoted field is doubled.
    assertTrue(csv.contains("\"every half-chain is constant, so \"\"stuck\"\"; second note\""));
  }

  @Test
  void writeCsvLeavesTheCallersWriterOpen() throws IOException {
    boolean[] closed = {false};
    StringBuilder target = new StringBuilder();
    java.io.Writer writer =
        new java.io.Writer() {
          @Override
          public void write(char[] buffer, int offset, int length) {
            target.append(buffer, offset, length);
          }

          @Override
          public void flush() {}

          @Override
          public void close() {
            closed[0] = true;
          }
        };
    SummaryTable table = SummaryTable.of(List.of(Summaries.fine("a")));
    table.writeCsv(writer);
    assertTrue(!closed[0], "writeCsv closed the caller's writer");
    assertEquals(table.csv(), target.toString());
  }

  @Test
  void rejectsDuplicateNamesAndFactsForUnknownsNotInTheTable() {
    assertThrows(
        IllegalArgumentException.class,
        () -> SummaryTable.of(List.of(Summaries.fine("a"), Summaries.fine("a"))));
    String message =
        assertThrows(
                IllegalArgumentException.class,
                () ->
                    SummaryTable.of(
                        List.of(Summaries.fine("a")), Map.of("b", UpdateFacts.exact("slice", 3))))
            .getMessage();
    assertTrue(message.contains("'b'"), message);
    assertThrows(IllegalArgumentException.class, () -> SummaryTable.of(null));
  }

  @Test
  void updateFactsAreValidated() {
    assertThrows(IllegalArgumentException.class, () -> UpdateFacts.exact(" ", 1));
    assertThrows(IllegalArgumentException.class, () -> UpdateFacts.exact("conjugate", -1));
    assertThrows(
        IllegalArgumentException.class,
        () -> UpdateFacts.exact("conjugate", Double.POSITIVE_INFINITY));
    assertThrows(
        IllegalArgumentException.class,
        () -> new UpdateFacts("slice", 2, UpdateFacts.Fallback.NONE, 5));
    assertEquals(Double.NaN, UpdateFacts.fallback("slice", Double.NaN).evaluationsPerDraw());
  }

  @Test
  void anotherIntervalLevelChangesTheColumnAndTheCsvEndsToThoseQuantiles() {
    double[][] draws = SampleReports.ar1(31, 2, 500, 0, 1, 0.3);
    org.hullbound.diagnostics.Draws d = org.hullbound.diagnostics.Draws.of(draws);
    VariableSummary s = org.hullbound.diagnostics.PosteriorSummary.of("x", d);
    SummaryTable ninety = SummaryTable.of(List.of(s)).withIntervalLevel(0.9, List.of(d));
    assertEquals(0.9, ninety.intervalLevel());
    assertTrue(ninety.text().contains("90% interval"), ninety.text());
    // Reference: commons-math3 Percentile, R_7 (Hyndman and Fan type 7), of the pooled draws.
    org.apache.commons.math3.stat.descriptive.rank.Percentile reference =
        new org.apache.commons.math3.stat.descriptive.rank.Percentile()
            .withEstimationType(
                org.apache.commons.math3.stat.descriptive.rank.Percentile.EstimationType.R_7);
    String[] header = ninety.csv().lines().findFirst().orElseThrow().split(",");
    String[] row = ninety.csv().lines().skip(1).findFirst().orElseThrow().split(",", -1);
    java.util.Map<String, String> cells = new java.util.HashMap<>();
    for (int k = 0; k < header.length; k++) {
      cells.put(header[k], row[k]);
    }
    assertEquals(reference.evaluate(d.pooled(), 5), Double.parseDouble(cells.get("lower")), 1e-12);
    assertEquals(reference.evaluate(d.pooled(), 95), Double.parseDouble(cells.get("upper")), 1e-12);
    assertEquals(0.9, Double.parseDouble(cells.get("level")));
    assertEquals("", cells.get("lower_mcse"), "the MCSE is of the 2.5% quantile, not the 5%");
    assertEquals("", cells.get("upper_mcse"));
    SummaryTable same = SummaryTable.of(List.of(s)).withIntervalLevel(0.95, List.of(d));
    assertEquals(SummaryTable.of(List.of(s)).csv(), same.csv());
  }
}

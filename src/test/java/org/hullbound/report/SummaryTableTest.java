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
          "unknown", "mean", "sd", "2.5%", "median", "97.5%", "R-hat", "ess bulk", "ess tail",
          "mcse", "update", "evals/draw");

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

  @Test
  void headingsAreOursInOrderUnderACaption() {
    List<String> lines = lines(sample().text());
    assertEquals(
        "4 chains of 1000 draws; R-hat and ess from rank-normalised split chains", lines.get(0));
    List<String> headings = List.of(lines.get(1).trim().split(" {2,}"));
    assertEquals(HEADINGS, headings);
  }

  @Test
  void everyRowHasTheWidthOfTheRuleAndColumnsLineUp() {
    List<String> lines = lines(sample().text());
    String rule = lines.get(2);
    assertTrue(rule.matches("[- ]+"), rule);
    // The rule marks each column's extent; right-aligned cells end where their dashes end.
    for (String line : lines.subList(1, lines.size())) {
      assertEquals(rule.length(), line.length(), "line '" + line + "'");
    }
    int sdEnd = lines.get(1).indexOf("  sd") + 4;
    for (String line : lines.subList(3, lines.size())) {
      assertTrue(line.charAt(sdEnd - 1) != ' ', "sd column ends at " + sdEnd + " in '" + line + "'");
      assertEquals(' ', line.charAt(sdEnd), line);
    }
    assertEquals(5 + 3, lines.size());
  }

  @Test
  void cellsShowNegativesScientificFormAndNaNAsNotAvailable() {
    String text = sample().text();
    List<String> beta = List.of(lines(text).get(4).split(" {2,}"));
    assertEquals(
        List.of(
            "beta[3]", "-1.616", "1.204", "-3.837", "-1.656", "0.9015", "1.001", "3800", "3500",
            "0.33", "adaptive rejection", "3.27"),
        beta);
    List<String> total = List.of(lines(text).get(5).trim().split(" {2,}"));
    assertEquals("4.990e+06", total.get(1));
    assertEquals("15000", total.get(9));
    assertEquals("n/a", total.get(10));
    List<String> sigma = List.of(lines(text).get(6).trim().split(" {2,}"));
    assertEquals("-6.300e-07", sigma.get(1));
    assertEquals("3.5e-07", sigma.get(9));
    assertEquals("ARMS fallback", sigma.get(10));
    assertEquals("11.5", sigma.get(11));
    List<String> broken = List.of(lines(text).get(7).trim().split(" {2,}"));
    assertEquals("broken", broken.get(0));
    assertTrue(broken.subList(1, broken.size()).stream().allMatch("n/a"::equals), broken.toString());
    assertEquals("0", List.of(lines(text).get(3).trim().split(" {2,}")).get(11));
  }

  @Test
  void aLongNameWidensItsColumn() {
    String name = "a_rather_long_unknown_name[12,7]";
    String text = SummaryTable.of(List.of(Summaries.fine(name), Summaries.fine("x"))).text();
    List<String> lines = lines(text);
    assertTrue(lines.get(3).startsWith(name + "  "));
    assertTrue(lines.get(4).startsWith("x" + " ".repeat(name.length() - 1) + "  "));
  }

  @Test
  void mixedChainLayoutsDropTheCaptionAndAnEmptyTableSaysSo() {
    VariableSummary short1 =
        PosteriorSummary.of("a", new double[][] {{1, 2, 3, 4, 5}, {2, 3, 4, 5, 6}});
    String text = SummaryTable.of(List.of(Summaries.fine("b"), short1)).text();
    assertTrue(text.startsWith("unknown "), text);
    assertEquals("no unknowns to summarise\n" + "unknown  mean  sd  2.5%  median  97.5%  R-hat"
        + "  ess bulk  ess tail  mcse  update  evals/draw\n"
        + "-------  ----  --  ----  ------  -----  -----  --------  --------  ----  ------"
        + "  ----------\n", SummaryTable.of(List.of()).text());
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
      assertEquals(-Double.MAX_VALUE, Double.parseDouble(x.get("2.5%")));
      assertEquals(Math.PI, Double.parseDouble(x.get("median")));
      assertEquals("NaN", x.get("mcse mean"));
      assertEquals("", x.get("update"));
      assertEquals("complete", x.get("state"));
      CSVRecord stuck = records.get(1);
      assertEquals("Inf", stuck.get("R-hat"));
      assertEquals("slice, stepped", stuck.get("update"));
      assertEquals("4.25", stuck.get("evals/draw"));
      assertEquals("switched during run", stuck.get("fallback"));
      assertEquals("90", stuck.get("switch sweep"));
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
}

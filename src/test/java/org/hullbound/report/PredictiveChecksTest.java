package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.StringReader;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;

/**
 * Posterior predictive p-values from given draws: the mid-p share worked out by hand, the MCSE,
 * the flags in plain words, the CSV and the report's panels.
 */
class PredictiveChecksTest {

  private static PredictiveChecks.Input input(
      String quantity, double[][] observed, double[][] replicated) {
    return new PredictiveChecks.Input("y", quantity, false, observed, replicated);
  }

  @Test
  void aTieCountsOneHalf() {
    // Replicates 1, 2, 2, 3 against an observed 2: one above, two tied, one below, so the mid-p
    // share is (1 + 2 / 2) / 4 = 0.5 (Lancaster 1961); counting ties whole would give 0.75.
    PredictiveChecks.Row row =
        PredictiveChecks.of(List.of(input("max", new double[][] {{2, 2, 2, 2}},
            new double[][] {{1, 2, 2, 3}}))).rows().get(0);
    assertEquals(0.5, row.pValue());
    assertEquals(0.5, row.tieShare());
    assertEquals(2, row.observed());
    assertFalse(row.observedVaries());
    assertEquals(2, row.replicatedMean());
    assertEquals(Math.sqrt(2.0 / 3), row.replicatedSd(), 1e-15);
  }

  @Test
  void theMcseIsThatOfTheIndicatorsMeanAndNaNWhenEverySweepAgrees() {
    double[] above = new double[400];
    double[] observed = new double[400];
    for (int d = 0; d < above.length; d++) {
      above[d] = d % 2 == 0 ? 1 : -1;
    }
    PredictiveChecks.Row alternating =
        PredictiveChecks.of(List.of(input("mean", new double[][] {observed},
            new double[][] {above}))).rows().get(0);
    assertEquals(0.5, alternating.pValue());
    // Alternating indicators are anti-correlated: their mean's MCSE is below the independent
    // sd / sqrt(n) = 0.5 / 20 (common practice: a negative lag-1 autocorrelation raises the ess).
    assertTrue(alternating.pValueMcse() < 0.025, "mcse " + alternating.pValueMcse());
    PredictiveChecks.Row never =
        PredictiveChecks.of(List.of(input("mean", new double[][] {observed},
            new double[][] {new double[400]}))).rows().get(0);
    assertEquals(0.5, never.pValue(), "every sweep tied");
    assertTrue(Double.isNaN(never.pValueMcse()));
  }

  @Test
  void aPValueBelowOneInTwentyOrAboveNineteenInTwentyIsFlaggedInPlainWords() {
    double[][] observed = {{10, 10, 10, 10}};
    PredictiveChecks checks = PredictiveChecks.of(List.of(
        input("max", observed, new double[][] {{1, 2, 3, 4}}),
        input("min", observed, new double[][] {{11, 12, 13, 14}}),
        input("mean", observed, new double[][] {{9, 11, 9, 11}})));
    assertEquals(List.of("high", "low", ""), checks.rows().stream().map(r -> r.flag()).toList());
    assertEquals(2, checks.flags().size());
    assertEquals(
        "the model rarely reproduces the max of y: replicates reach the observed value in none of"
            + " the 4 sweeps",
        checks.flags().get(0));
    assertTrue(checks.flags().get(1).contains("fall as low as the observed value"), checks.text());
    assertTrue(checks.text().contains("! the model rarely reproduces the min of y"), checks.text());
    assertTrue(checks.text().contains("<<"), checks.text());
  }

  @Test
  void aQuantityThatReadsUnknownsReportsItsMeanObservedValueAndIsMarked() {
    PredictiveChecks checks = PredictiveChecks.of(List.of(new PredictiveChecks.Input(
        "y", "chi_square", true, new double[][] {{1, 3}, {5, 7}}, new double[][] {{2, 2}, {2, 9}})));
    PredictiveChecks.Row row = checks.rows().get(0);
    assertTrue(row.observedVaries());
    assertEquals(4, row.observed());
    assertEquals(0.5, row.pValue(), "above in sweeps 1 and 4 of the 4");
    assertTrue(checks.text().contains("chi_square (check)"), checks.text());
    assertTrue(checks.text().contains("4.000*"), checks.text());
  }

  @Test
  void theCsvHasItsHeaderAndOneFullPrecisionRecordPerQuantity() throws IOException {
    PredictiveChecks checks = PredictiveChecks.of(List.of(
        input("mean", new double[][] {{0.1, 0.1}}, new double[][] {{0.3, -1}})));
    List<CSVRecord> records =
        CSVFormat.RFC4180.parse(new StringReader(checks.csv())).getRecords();
    assertEquals(PredictiveChecks.CSV_HEADER, records.get(0).toList());
    assertEquals(
        List.of("y", "mean", "default", "0.1", "no", "-0.35", "0.9192388155425117", "0.5", "NaN",
            "0.0", "2", ""),
        records.get(1).toList());
  }

  @Test
  void theCsvReadsBackToTheSameRowsWithoutTheirDraws() {
    PredictiveChecks checks = PredictiveChecks.of(List.of(
        input("mean", new double[][] {{0.1, 0.1, 0.1, 0.1}}, new double[][] {{0.3, -1, 2, 0.1}}),
        new PredictiveChecks.Input("y", "t", true, new double[][] {{1, 2, 3, 4}},
            new double[][] {{5, 5, 5, 5}})));
    PredictiveChecks read = PredictiveChecks.fromCsv(checks.csv());
    assertEquals(checks.csv(), read.csv());
    assertEquals(0, read.rows().get(0).replicated().length);
    StringBuilder html = new StringBuilder();
    read.section(html);
    assertTrue(html.toString().contains("(no histogram: the run folder has no predictive_sweeps.csv)"));
  }

  @Test
  void theReportHasAPanelPerQuantityGroupedByNameAndNothingWithoutChecks() {
    PredictiveChecks checks = PredictiveChecks.of(List.of(
        input("mean", new double[][] {{2, 2, 2, 2}}, new double[][] {{1, 2, 3, 4}}),
        input("max", new double[][] {{9, 9, 9, 9}}, new double[][] {{1, 2, 3, 4}})));
    StringBuilder html = new StringBuilder();
    checks.section(html);
    assertEquals(2, Xml.inlineSvgs(html.toString()).size());
    for (String svg : Xml.inlineSvgs(html.toString())) {
      Xml.parse(svg);
    }
    assertEquals(1, Xml.count(html.toString(), "<h3>y</h3>"));
    assertTrue(html.toString().contains("the model rarely reproduces the max of y"));
    StringBuilder empty = new StringBuilder();
    PredictiveChecks.none().section(empty);
    assertEquals("", empty.toString());
  }

  @Test
  void thePageListsTheChecksAfterTheSummaryAndOnlyWhenThereAreAny() {
    PredictiveChecks checks = PredictiveChecks.of(List.of(
        input("mean", new double[][] {{2, 2, 2, 2}}, new double[][] {{1, 2, 3, 4}})));
    ReportInput input = SampleReports.cheap(2, 2, 50, ReportOptions.defaults());
    String page = HtmlReport.render(input, checks);
    assertTrue(page.contains("<a href=\"#predictive\">Posterior predictive checks</a>"));
    assertTrue(page.indexOf("id=\"summary\"") < page.indexOf("id=\"predictive\""));
    Xml.parse(page);
    String without = HtmlReport.render(input);
    assertFalse(without.contains("predictive"));
  }

  @Test
  void theReplicatesPanelMarksTheObservedValueAndBinsWholeNumbersOneEach() {
    String svg = SvgPlot.replicates(
        new PanelLabels("predictive", "max", "replicated max", "sweeps"),
        new double[] {3, 4, 4, 5, 7}, 9, 30);
    Xml.parse(svg);
    // Whole numbers 3 .. 7: five unit bins, one filled column each, and one upright line.
    assertEquals(5, Xml.count(svg, "<rect x="));
    assertEquals(1, Xml.count(svg, "stroke=\"" + Palette.ACCENT + "\" stroke-width=\"2\""));
    assertTrue(SvgPlot.replicates(new PanelLabels("predictive", "t", "", ""),
        new double[] {Double.NaN}, 1, 30).contains("no finite replicate"));
  }
}

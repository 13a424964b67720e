package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.stat.correlation.PearsonsCorrelation;
import org.junit.jupiter.api.Test;

/** The most correlated pairs of plotted unknowns, with a hint when a strong one slows a chain. */
class PairPlotsTest {

  @Test
  void theCorrelationIsPearsonsOfThePooledDrawsAndTheStrongestPairComesFirst() {
    ReportInput input = SampleReports.hierarchical();
    List<PairPlots.Pair> pairs = PairPlots.strongest(input);
    assertEquals(3, pairs.size());
    PairPlots.Pair first = pairs.get(0);
    assertEquals(List.of(0, 1), List.of(first.first(), first.second()), "mu and tau");
    // Reference: commons-math3 PearsonsCorrelation on the same pooled draws.
    double expected =
        new PearsonsCorrelation()
            .correlation(
                input.unknowns().get(0).draws().pooled(), input.unknowns().get(1).draws().pooled());
    assertEquals(expected, first.correlation(), 1e-12);
    for (int k = 1; k < pairs.size(); k++) {
      assertTrue(Math.abs(pairs.get(k).correlation()) <= Math.abs(pairs.get(k - 1).correlation()));
    }
  }

  @Test
  void aStrongCorrelationOfASlowUnknownGetsTheReparametrisationHint() {
    ReportInput input = SampleReports.hierarchical();
    PairPlots.Pair first = PairPlots.strongest(input).get(0);
    assertTrue(Math.abs(first.correlation()) > PairPlots.STRONG);
    String hint =
        PairPlots.hint(first, input.unknowns().get(0).summary(), input.unknowns().get(1).summary(),
            400);
    assertTrue(hint.contains("slows these chains") && hint.contains("Reparametrise"), hint);
    String calm =
        PairPlots.hint(first, input.unknowns().get(0).summary(), input.unknowns().get(1).summary(),
            1);
    assertTrue(calm.contains("still reached"), calm);
    assertEquals("", PairPlots.hint(new PairPlots.Pair(0, 1, 0.5), null, null, 400));
  }

  @Test
  void eachScatterHoldsAtMostTheCapOfPoints() {
    String html = HtmlReport.render(SampleReports.hierarchical());
    for (String svg : Xml.inlineSvgs(html)) {
      if (svg.contains("plot-pair")) {
        assertTrue(Xml.count(svg, "<circle") <= PairPlots.MAX_POINTS);
        assertTrue(Xml.count(svg, "<circle") >= PairPlots.MAX_POINTS / 2);
      }
    }
    assertEquals(3, Xml.count(html, "class=\"plot plot-pair\""));
  }

  @Test
  void onlyThePlottedUnknownsAreCompared() {
    ReportInput input = SampleReports.hierarchical();
    ReportInput two =
        new ReportInput(input.header(), List.of(), "", input.unknowns(),
            ReportOptions.defaults().withPlotCap(2));
    assertEquals(1, PairPlots.strongest(two).size());
    ReportInput one =
        new ReportInput(input.header(), List.of(), "", input.unknowns(),
            ReportOptions.defaults().withPlotCap(1));
    assertTrue(PairPlots.strongest(one).isEmpty());
    assertTrue(!HtmlReport.render(one).contains("id=\"pairs\""));
  }
}

package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.w3c.dom.Document;

/** One interval plot per indexed unknown, in index order and sorted by mean behind a toggle. */
class IndexedIntervalsTest {

  private static UnknownReport shifted(String name, double mean) {
    return UnknownReport.of(name, SampleReports.ar1(name.hashCode(), 2, 200, mean, 1, 0.1), null);
  }

  @Test
  void unknownsAreGroupedByTheNameBeforeTheirIndex() {
    List<UnknownReport> unknowns =
        List.of(
            shifted("mu", 0),
            shifted("b[1]", 0),
            shifted("a[1,2]", 0),
            shifted("b[2]", 0),
            shifted("a[2,1]", 0),
            shifted("lonely[1]", 0));
    Map<String, List<Integer>> groups = IndexedIntervals.groups(unknowns);
    assertEquals(List.of("b", "a"), List.copyOf(groups.keySet()));
    assertEquals(List.of(1, 3), groups.get("b"));
    assertEquals(List.of(2, 4), groups.get("a"));
  }

  /** The y coordinates of the circles (means) in order, and their x coordinates. */
  private static List<double[]> dots(String svg) {
    List<double[]> out = new ArrayList<>();
    Matcher m = Pattern.compile("<circle cx=\"([-0-9.]+)\" cy=\"([-0-9.]+)\"").matcher(svg);
    while (m.find()) {
      out.add(new double[] {Double.parseDouble(m.group(1)), Double.parseDouble(m.group(2))});
    }
    return out;
  }

  @Test
  void theSortedPlotPutsTheMeansInOrderAndTheIndexedOneKeepsTheIndexOrder() {
    List<UnknownReport> unknowns = new ArrayList<>();
    double[] means = {3, -2, 5, 0, 1};
    for (int j = 0; j < means.length; j++) {
      unknowns.add(shifted("effect[" + (j + 1) + "]", means[j]));
    }
    String html =
        HtmlReport.render(
            new ReportInput(
                SampleReports.header("x", 2, 200), List.of(), "", unknowns,
                ReportOptions.defaults().withSortByMean(true)));
    List<String> svgs = new ArrayList<>();
    for (String svg : Xml.inlineSvgs(html)) {
      if (svg.contains("plot-intervals")) {
        Document doc = Xml.parse(svg);
        assertEquals("svg", doc.getDocumentElement().getLocalName());
        svgs.add(svg);
      }
    }
    assertEquals(2, svgs.size());
    List<double[]> byIndex = dots(svgs.get(0));
    List<double[]> byMean = dots(svgs.get(1));
    assertEquals(5, byIndex.size());
    // In index order the dots' x follow the means 3, -2, 5, 0, 1; sorted they increase downwards.
    assertTrue(byIndex.get(0)[0] > byIndex.get(1)[0] && byIndex.get(2)[0] > byIndex.get(0)[0]);
    for (int k = 1; k < byMean.size(); k++) {
      assertTrue(byMean.get(k)[0] > byMean.get(k - 1)[0], "sorted by mean");
      assertTrue(byMean.get(k)[1] > byMean.get(k - 1)[1], "one row further down each");
    }
    // The option opens the page sorted; the toggle is a checkbox, no script.
    assertTrue(html.contains("<input type=\"checkbox\" id=\"sort0\" checked=\"checked\"/>"));
    assertTrue(html.contains("input:checked~.by-mean{display:block}"));
    assertTrue(!html.contains("<script"));
  }

  @Test
  void rowsWithoutFiniteDrawsStayEmptyAndAllEmptyGivesANote() {
    String svg =
        IndexedIntervals.svg(
            "v",
            List.of("v[1]", "v[2]"),
            List.of(new double[] {Double.NaN, Double.NaN, Double.NaN}, new double[] {1, 0, 2}),
            List.of(0, 1),
            "95%");
    assertEquals(1, dots(svg).size());
    String none =
        IndexedIntervals.svg(
            "v",
            List.of("v[1]"),
            List.<double[]>of(new double[] {Double.NaN, Double.NaN, Double.NaN}),
            List.of(0),
            "95%");
    assertTrue(none.contains("no finite intervals to draw"));
    Xml.parse(none);
  }
}

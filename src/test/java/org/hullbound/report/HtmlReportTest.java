package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.PosteriorSummary;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.w3c.dom.Document;
import org.w3c.dom.NodeList;

/** The report page: self-contained, well-formed, escaped, capped, and calm about odd draws. */
class HtmlReportTest {
  private static String showcase;

  @BeforeAll
  static void renderOnce() {
    showcase = HtmlReport.render(SampleReports.showcase());
  }

  @Test
  void everyInlineSvgIsWellFormedXmlInTheSvgNamespace() {
    List<String> svgs = Xml.inlineSvgs(showcase);
    // 6 unknowns, 4 panels each (a panel that cannot be drawn is a note, still an svg), and a
    // scatter for each of the 3 pairs among mu, sigma and tau (the others are not all finite,
    // constant, or of another length).
    assertEquals(24 + 3, svgs.size());
    for (String svg : svgs) {
      Document doc = Xml.parse(svg);
      assertEquals("http://www.w3.org/2000/svg", doc.getDocumentElement().getNamespaceURI());
    }
  }

  @Test
  void theWholePageIsWellFormedXmlToo() {
    Document doc = Xml.parse(showcase);
    assertEquals("html", doc.getDocumentElement().getNodeName());
  }

  @Test
  void theTableHasTheTerminalTablesColumnsAndOneRowPerUnknown() {
    Document doc = Xml.parse(showcase);
    NodeList headings = doc.getElementsByTagName("th");
    List<String> texts = new ArrayList<>();
    for (int i = 0; i < headings.getLength(); i++) {
      texts.add(headings.item(i).getTextContent());
    }
    assertEquals(
        List.of(
            "",
            "estimate",
            "trust",
            "cost",
            "unknown",
            "mean \u00b1 MCSE",
            "sd",
            "95% interval",
            "R-hat",
            "bulk-ESS",
            "tail-ESS",
            "update",
            "evals per draw"),
        texts);
    assertEquals(2 + 6, doc.getElementsByTagName("tr").getLength());
  }

  @Test
  void oneTracePlotPerUnknownUpToTheCap() {
    String html =
        HtmlReport.render(SampleReports.cheap(8, 3, 200, ReportOptions.defaults().withPlotCap(5)));
    assertEquals(5, Xml.count(html, "class=\"plot plot-trace\""));
    assertEquals(5, Xml.count(html, "class=\"plot plot-density\""));
    assertEquals(5, Xml.count(html, "class=\"unknown\""));
    assertTrue(html.contains("Plots are drawn for the first 5 of 8 unknowns"), "cap sentence");
    assertTrue(html.contains(">beta[8]</td>"), "unknowns past the cap are still in the table");
    assertFalse(html.contains("id=\"u5\""), "no section past the cap");
  }

  @Test
  void twoHundredUnknownsStayASaneSizeWithThinnedTraces() {
    String html = HtmlReport.render(SampleReports.cheap(200, 4, 3000, ReportOptions.defaults()));
    assertEquals(ReportOptions.DEFAULT_PLOT_CAP, Xml.count(html, "class=\"plot plot-trace\""));
    assertEquals(200, Xml.count(html, "<td class=\"name\">"));
    int bytes = html.getBytes(StandardCharsets.UTF_8).length;
    assertTrue(bytes < 4_000_000, "report of " + bytes + " bytes");
    Matcher polyline = Pattern.compile("<polyline[^>]*points=\"([^\"]*)\"").matcher(html);
    int longest = 0;
    while (polyline.find()) {
      longest = Math.max(longest, polyline.group(1).split(" ").length);
    }
    assertTrue(longest <= 1000, "a line of " + longest + " points");
    assertTrue(longest > 900, "traces use the budget: " + longest);
  }

  @Test
  void namesAreEscapedEverywhere() {
    assertTrue(showcase.contains("tau &lt;&amp;&gt; &quot;odd&quot;"));
    assertFalse(showcase.contains("tau <&>"));
    assertTrue(
        showcase.contains("<title>hullbound report: invented reef survey &lt;&amp;&gt;</title>"));
    assertFalse(showcase.contains("survey <&>"));
  }

  @Test
  void nothingIsFetchedFromAnywhere() {
    Matcher url = Pattern.compile("(?i)https?://[^\"' <)]*").matcher(showcase);
    while (url.find()) {
      assertEquals("http://www.w3.org/2000/svg", url.group(), "only the SVG namespace is a URL");
    }
    for (String fetching :
        List.of("<script", "<link", "@import", "url(", "src=", "<img", "<iframe")) {
      assertFalse(showcase.toLowerCase().contains(fetching), fetching);
    }
  }

  @Test
  void awkwardDrawsRenderWithPlainNotes() {
    assertTrue(showcase.contains("draws are NaN or infinite; the plots leave them out"));
    assertTrue(showcase.contains("every draw equals 3"));
    assertTrue(showcase.contains("needs 4 draws per chain, has 1"));
    assertTrue(showcase.contains("one chain: rank plots compare chains"));
    assertTrue(showcase.contains("not drawn: some draws are NaN or infinite"));
  }

  @Test
  void aSingleChainOfOneDrawAndChainsStuckApartStillRender() {
    List<UnknownReport> unknowns =
        List.of(
            UnknownReport.of(
                "alone",
                SampleReports.ar1(9, 1, 300, 0, 1, 0.4),
                UpdateFacts.fallback("slice", 8.0)),
            UnknownReport.of(
                "one", new double[][] {{1.5}, {2.5}}, UpdateFacts.fallback("slice", 8.0)),
            UnknownReport.of(
                "stuck",
                new double[][] {{1, 1, 1, 1, 1}, {2, 2, 2, 2, 2}},
                UpdateFacts.fallback("slice", 1)),
            UnknownReport.of(
                "all NaN",
                new double[][] {{Double.NaN, Double.NaN}},
                UpdateFacts.fallback("slice", 1)));
    String html =
        HtmlReport.render(
            new ReportInput(
                SampleReports.header("", 2, 5), List.of(), "", unknowns, ReportOptions.defaults()));
    for (String svg : Xml.inlineSvgs(html)) {
      Xml.parse(svg);
    }
    Xml.parse(html);
    assertEquals(4, Xml.count(html, "class=\"plot plot-trace\""));
    assertTrue(html.contains("unnamed model"));
    assertTrue(html.contains("chain 1 is constant at 1.000; chain 2 is"), "density note");
    assertTrue(html.contains("not drawn: every chain is constant"), "autocorrelation note");
  }

  @Test
  void hugeAndTinyScalesRenderWithoutOverflow() {
    double[][] huge = SampleReports.ar1(41, 2, 300, 0, 1, 0.3);
    double[][] tiny = SampleReports.ar1(42, 2, 300, 0, 1, 0.3);
    for (int c = 0; c < 2; c++) {
      for (int i = 0; i < 300; i++) {
        huge[c][i] *= 4e307;
        tiny[c][i] *= 1e-300;
      }
    }
    huge[0][7] = Double.MAX_VALUE;
    huge[1][9] = -Double.MAX_VALUE;
    // Summaries made up: the plots are under test here, not the diagnostics.
    List<UnknownReport> unknowns =
        List.of(SampleReports.madeUp("huge", huge), SampleReports.madeUp("tiny", tiny));
    String html =
        HtmlReport.render(
            new ReportInput(
                SampleReports.header("scales", 2, 300),
                List.of(),
                "",
                unknowns,
                ReportOptions.defaults()));
    Xml.parse(html);
    assertEquals(8, Xml.inlineSvgs(html).size());
    assertFalse(html.contains("NaN,") || html.contains(",NaN") || html.contains("Infinity"));
    assertTrue(html.contains("values span more than double precision can label"), "huge: note");
    // tiny: trace, density and ranks of both chains; huge: only its ranks (the rest are notes).
    assertEquals(8, Xml.count(html, "<polyline"), "lines drawn");
  }

  @Test
  void warningsComeFirstInTheGivenOrderAndNoneIsSaidPlainly() {
    int first = showcase.indexOf("R-hat is 1.41");
    int second = showcase.indexOf("2 draws are NaN or infinite; no diagnostics");
    int table = showcase.indexOf("<table");
    assertTrue(first > 0 && first < second && second < table, "warnings before the table");
    String calm = HtmlReport.render(SampleReports.cheap(1, 2, 50, ReportOptions.defaults()));
    assertTrue(calm.contains("No warnings were raised for this run."));
  }

  @Test
  void theHeaderCarriesTheRunsFacts() {
    assertTrue(showcase.contains("2026-03-14 09:26:53 UTC"));
    assertTrue(showcase.contains("<dd>20260314</dd>"));
    assertTrue(showcase.contains("<dd>12.3 s</dd>"));
    assertTrue(showcase.contains("<dd>500</dd>"));
  }

  @Test
  void aPlotCapOfZeroDrawsNoPlotsAndSaysSo() {
    String html =
        HtmlReport.render(SampleReports.cheap(3, 2, 50, ReportOptions.defaults().withPlotCap(0)));
    // Only the interval plot of beta[1..3], in index order and sorted, which the cap does not limit.
    assertEquals(2, Xml.inlineSvgs(html).size());
    assertEquals(2, Xml.count(html, "class=\"plot plot-intervals\""));
    assertTrue(html.contains("No per-unknown plots are drawn: the plot cap is 0."));
  }

  @Test
  void aRunWithoutUnknownsStillRenders() {
    String html =
        HtmlReport.render(
            new ReportInput(
                SampleReports.header("empty", 1, 0),
                List.of(),
                "",
                List.of(),
                ReportOptions.defaults()));
    Xml.parse(html);
    assertTrue(html.contains("This run has no unknowns."));
  }

  @Test
  void theTerminalSummaryObjectsMakeTheReportInput() {
    double[][] good = SampleReports.ar1(31, 4, 400, 0, 1, 0.0);
    double[][] apart = SampleReports.ar1(32, 4, 400, 0, 1, 0.0);
    for (int i = 0; i < apart[0].length; i++) {
      apart[0][i] += 5; // chain 1 sits far from the others
    }
    Draws goodDraws = Draws.of(good);
    Draws apartDraws = Draws.of(apart);
    SummaryTable table =
        SummaryTable.of(
            List.of(
                PosteriorSummary.of("good", goodDraws),
                PosteriorSummary.of("apart<1>", apartDraws)),
            Map.of("good", UpdateFacts.exact("conjugate", 0)));
    Verdicts verdicts = Verdicts.of(table);
    ReportInput input =
        ReportInput.of(
            SampleReports.header("m", 4, 400),
            table,
            verdicts,
            List.of(goodDraws, apartDraws),
            ReportOptions.defaults());
    String html = HtmlReport.render(input);
    assertFalse(verdicts.allWell());
    for (Verdict v : verdicts.verdicts()) {
      assertTrue(html.contains(Markup.escape(v.text())), v.text());
    }
    List<String> lines = verdicts.lines();
    assertTrue(html.contains(Markup.escape(lines.get(lines.size() - 1))), "closing line");
    assertTrue(html.contains("<td class=\"flag\">"), "the far chain's R-hat is marked");
    assertTrue(html.contains("<td class=\"text\">conjugate</td>"));
    assertTrue(html.contains("<td class=\"text\">n/a</td>"), "no update facts for 'apart'");
  }

  @Test
  void runTimesReadNaturally() {
    assertEquals("0.42 s", HtmlReport.duration(Duration.ofMillis(420)));
    assertEquals("12.3 s", HtmlReport.duration(Duration.ofMillis(12_345)));
    assertEquals("4 min 05 s", HtmlReport.duration(Duration.ofSeconds(245)));
    assertEquals("2 h 03 min", HtmlReport.duration(Duration.ofMinutes(123)));
  }
}

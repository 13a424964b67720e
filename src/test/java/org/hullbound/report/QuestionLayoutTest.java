package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The page is arranged around a reader's questions: contents first, then the model and data, the
 * table, interval plots of indexed unknowns, the most correlated pairs, and per unknown four
 * labelled blocks (where, agreement, speed, cost), each answered in words before its plots.
 */
class QuestionLayoutTest {
  private static String page;

  @BeforeAll
  static void renderOnce() {
    page = HtmlReport.render(SampleReports.hierarchical());
  }

  @Test
  void everyUnknownCardAsksTheFourQuestionsInOrderWithAnAnswerEach() {
    assertEquals(14, Xml.count(page, "<section class=\"unknown\""));
    for (String kind : List.of("where", "agree", "speed", "cost")) {
      assertEquals(14, Xml.count(page, "<div class=\"question q-" + kind + "\">"), kind);
    }
    assertEquals(14 * 4, Xml.count(page, "<p class=\"answer\">"));
    String mu = page.substring(page.indexOf("id=\"u0\""), page.indexOf("id=\"u1\""));
    int where = mu.indexOf("Where is it?");
    int agree = mu.indexOf("Did the chains agree?");
    int speed = mu.indexOf("How fast did it move?");
    int cost = mu.indexOf("What did it cost?");
    assertTrue(0 < where && where < agree && agree < speed && speed < cost);
    // Each block holds its own panels: density under where, ranks under agree, trace and
    // autocorrelation under speed.
    assertTrue(mu.substring(where, agree).contains("plot-density"));
    assertTrue(mu.substring(agree, speed).contains("plot-ranks"));
    assertTrue(mu.substring(agree, speed).contains("chain 4 mean"));
    assertTrue(mu.substring(speed, cost).contains("plot-trace"));
    assertTrue(mu.substring(speed, cost).contains("plot-autocorrelation"));
    assertTrue(mu.contains("Drawn by conjugate normal: a direct draw"));
  }

  @Test
  void theContentsLinkEverySectionAndEveryPlottedUnknown() {
    int nav = page.indexOf("<nav class=\"contents\"");
    assertTrue(nav > 0 && nav < page.indexOf("id=\"warnings\""), "contents come first");
    for (String target : List.of("warnings", "sources", "summary", "intervals", "pairs", "plots")) {
      assertTrue(page.contains("<a href=\"#" + target + "\">"), target);
      assertTrue(page.contains("id=\"" + target + "\""), target);
    }
    for (int i = 0; i < 14; i++) {
      assertTrue(page.contains("<li><a href=\"#u" + i + "\">"), "unknown " + i);
    }
  }

  @Test
  void theModelTextAndDataFactsComeBeforeTheTable() {
    int sources = page.indexOf("id=\"sources\"");
    assertTrue(sources > 0 && sources < page.indexOf("id=\"summary\""));
    assertTrue(page.contains("<pre class=\"model\"># invented scenario\nmodel schools\n"));
    assertTrue(page.contains("param effect[school] ~ normal(mean = mu, sd = tau)"));
    assertTrue(page.contains("schools.csv</span>: 12 rows, 1 missing cell imputed"));
    assertTrue(page.contains("inline</span>: 1 row, no missing cells"));
    // Without sources there is no such section and no link to it.
    String plain = HtmlReport.render(SampleReports.showcase());
    assertFalse(plain.contains("id=\"sources\""));
    assertFalse(plain.contains("href=\"#sources\""));
  }

  @Test
  void longHeaderValuesWrapInsideTheirCell() {
    // A 20-character seed in a 120-pixel cell: the cell may shrink below its content (min-width
    // 0) and the value breaks anywhere, so it never runs into the next cell.
    assertTrue(page.contains("<dd>-8765432109876543210</dd>"));
    assertTrue(page.contains("dl.facts div{min-width:0}"));
    assertTrue(page.contains("overflow-wrap:anywhere}"));
  }

  @Test
  void theIntervalLevelOptionReachesTableIntervalPlotsAndAnswers() {
    String ninety =
        HtmlReport.render(
            new ReportInput(
                SampleReports.header("x", 4, 1000),
                List.of(),
                "",
                SampleReports.hierarchical().unknowns(),
                ReportOptions.defaults().withIntervalLevel(0.9)));
    assertTrue(ninety.contains("<th>90% interval</th>"));
    assertTrue(ninety.contains("the line the 90% central interval"));
    assertTrue(ninety.contains("90% of the draws lie between"));
    assertFalse(ninety.contains("95% interval") || ninety.contains("95% of the draws"));
    UnknownReport mu = SampleReports.hierarchical().unknowns().get(0);
    CentralInterval interval = CentralInterval.of(mu.draws(), 0.9);
    assertTrue(
        ninety.contains(
            NumberText.significant(interval.lower(), 4)
                + " .. "
                + NumberText.significant(interval.upper(), 4)));
  }

  @Test
  void aFitOf3600UnknownsStaysUnderFiveMegabytes() {
    // 3,600 unknowns beta[1..3600] x 4 chains x 250 draws: the table has every row, 50 cards are
    // drawn (the plot cap), and the one interval plot of 3,600 rows is drawn twice with rows of
    // 0.25 units and no labels.
    String html =
        HtmlReport.render(SampleReports.cheap(3600, 4, 250, ReportOptions.defaults()));
    long bytes = html.getBytes(StandardCharsets.UTF_8).length;
    assertEquals(3600, Xml.count(html, "<td class=\"name\">"));
    assertEquals(50, Xml.count(html, "<section class=\"unknown\""));
    assertEquals(2, Xml.count(html, "class=\"plot plot-intervals\""));
    assertTrue(bytes < 5_000_000, "report of " + bytes + " bytes");
  }
}

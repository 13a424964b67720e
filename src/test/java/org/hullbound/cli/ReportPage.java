package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.xml.parsers.DocumentBuilderFactory;
import org.w3c.dom.Document;

/**
 * Checks on a {@code report.html} written by {@code fit}: its SVGs are XML, one trace per unknown.
 */
final class ReportPage {
  private static final Pattern SVG = Pattern.compile("<svg\\b.*?</svg>", Pattern.DOTALL);
  private static final String TRACE = "class=\"plot plot-trace\"";

  private ReportPage() {}

  /**
   * Asserts that every inline SVG of {@code html} parses as namespaced XML (the JDK's parser) and
   * that each of {@code unknowns} has its own card with a trace plot, in order.
   */
  static void assertOneTracePerUnknown(String html, List<String> unknowns) throws Exception {
    Matcher svgs = SVG.matcher(html);
    int count = 0;
    while (svgs.find()) {
      Document doc = parse(svgs.group());
      assertEquals("http://www.w3.org/2000/svg", doc.getDocumentElement().getNamespaceURI());
      count++;
    }
    // Four panels per card, plus the interval plots (two per indexed unknown) and pair scatters.
    int extra =
        html.split("class=\"plot plot-intervals\"", -1).length - 1
            + html.split("class=\"plot plot-pair\"", -1).length - 1;
    assertEquals(4 * unknowns.size(), count - extra, "four panels per unknown");
    String[] cards = html.split("<section class=\"unknown\"", -1);
    assertEquals(unknowns.size() + 1, cards.length, "one card per unknown");
    List<String> named = new ArrayList<>();
    for (int k = 1; k < cards.length; k++) {
      Matcher heading = Pattern.compile("<h3>(.*?)</h3>").matcher(cards[k]);
      assertTrue(heading.find(), "card " + k + " has a heading");
      named.add(heading.group(1));
      assertEquals(1, cards[k].split(TRACE, -1).length - 1,
          "one trace in the card of " + heading.group(1));
    }
    assertEquals(unknowns, named);
  }

  private static Document parse(String xml) throws Exception {
    DocumentBuilderFactory factory = DocumentBuilderFactory.newInstance();
    factory.setNamespaceAware(true);
    factory.setFeature("http://apache.org/xml/features/disallow-doctype-decl", true);
    return factory.newDocumentBuilder()
        .parse(new ByteArrayInputStream(xml.getBytes(StandardCharsets.UTF_8)));
  }
}

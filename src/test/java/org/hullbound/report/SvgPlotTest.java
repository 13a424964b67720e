package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Optional;
import org.junit.jupiter.api.Test;
import org.w3c.dom.Document;

/** SVG panels are well-formed XML in the SVG namespace and draw what they are given. */
class SvgPlotTest {
  private static final String SVG_NAMESPACE = "http://www.w3.org/2000/svg";
  private static final PanelLabels TRACE = new PanelLabels("trace", "trace", "draw", "value");

  private static Document parsed(String svg) {
    Document doc = Xml.parse(svg);
    assertEquals("svg", doc.getDocumentElement().getLocalName());
    assertEquals(SVG_NAMESPACE, doc.getDocumentElement().getNamespaceURI());
    return doc;
  }

  @Test
  void aTraceIsOnePolylinePerChainWithALegend() {
    Series a = Series.ofValues("chain 1", new double[] {1, 3, 2, 5});
    Series b = Series.ofValues("chain 2", new double[] {2, 2, 4, 1});
    Document doc = parsed(SvgPlot.trace(TRACE, List.of(a, b)));
    assertEquals(2, doc.getElementsByTagNameNS(SVG_NAMESPACE, "polyline").getLength());
    String text = doc.getDocumentElement().getTextContent();
    assertTrue(text.contains("chain 1") && text.contains("chain 2"), text);
    assertEquals("plot plot-trace", doc.getDocumentElement().getAttribute("class"));
  }

  @Test
  void nonFiniteValuesBreakTheLineAndALonePointIsADot() {
    Series s =
        Series.ofValues(
            "chain 1", new double[] {1, 2, Double.NaN, 3, 4, Double.POSITIVE_INFINITY, 5});
    Document doc = parsed(SvgPlot.trace(TRACE, List.of(s)));
    assertEquals(2, doc.getElementsByTagNameNS(SVG_NAMESPACE, "polyline").getLength());
    assertEquals(1, doc.getElementsByTagNameNS(SVG_NAMESPACE, "circle").getLength());
  }

  @Test
  void nothingFiniteGivesANoteInsteadOfAPlot() {
    Series s = Series.ofValues("chain 1", new double[] {Double.NaN, Double.NEGATIVE_INFINITY});
    Document doc = parsed(SvgPlot.trace(TRACE, List.of(s)));
    assertEquals(0, doc.getElementsByTagNameNS(SVG_NAMESPACE, "polyline").getLength());
    assertTrue(doc.getDocumentElement().getTextContent().contains("no finite values"));
    assertTrue(
        parsed(SvgPlot.trace(TRACE, List.of()))
            .getDocumentElement()
            .getTextContent()
            .contains("no finite values"));
  }

  @Test
  void valuesBeyondLabellableRangeGiveANote() {
    Series s = Series.ofValues("chain 1", new double[] {-Double.MAX_VALUE, Double.MAX_VALUE});
    Document doc = parsed(SvgPlot.trace(TRACE, List.of(s)));
    assertTrue(doc.getDocumentElement().getTextContent().contains("double precision"));
  }

  @Test
  void labelsAreEscaped() {
    PanelLabels labels = new PanelLabels("density", "a<b & c>d \"q\" 'r'", "x<&>", "y\u0000z");
    Series s = new Series("n<&>", new double[] {0, 1}, new double[] {0, 1});
    String svg = SvgPlot.curves(labels, List.of(s), true);
    Document doc = parsed(svg);
    String text = doc.getDocumentElement().getTextContent();
    assertTrue(text.contains("a<b & c>d \"q\" 'r'"), text);
    assertTrue(text.contains("x<&>") && text.contains("n<&>"), text);
    assertFalse(svg.contains("a<b"), svg);
  }

  @Test
  void barsAndStepsAndNotesAreWellFormed() {
    double[] lags = {0, 1, 2, 3};
    double[] rho = {1, 0.5, 0.2, -0.1};
    Document bars =
        parsed(
            SvgPlot.bars(
                new PanelLabels("autocorrelation", "acf", "lag", ""),
                lags,
                rho,
                Optional.of(new ReferenceBand(-0.1, 0, 0.1))));
    // One bar per lag plus the band.
    assertEquals(5, bars.getElementsByTagNameNS(SVG_NAMESPACE, "rect").getLength());

    Document steps =
        parsed(
            SvgPlot.steps(
                new PanelLabels("ranks", "ranks", "rank", ""),
                new double[] {0, 1, 2, 3},
                List.of(new double[] {3, 4, 5}, new double[] {5, 4, 3}),
                List.of("chain 1", "chain 2"),
                Optional.empty()));
    assertEquals(2, steps.getElementsByTagNameNS(SVG_NAMESPACE, "polyline").getLength());

    Document note =
        parsed(SvgPlot.note(new PanelLabels("density", "density", "", ""), "why <not>"));
    assertTrue(note.getDocumentElement().getTextContent().contains("why <not>"));
  }

  @Test
  void mismatchedArraysAreRefusedByName() {
    IllegalArgumentException e =
        assertThrows(
            IllegalArgumentException.class,
            () ->
                SvgPlot.bars(
                    new PanelLabels("autocorrelation", "", "", ""),
                    new double[2],
                    new double[3],
                    Optional.empty()));
    assertTrue(e.getMessage().contains("equal length"), e.getMessage());
    e =
        assertThrows(
            IllegalArgumentException.class, () -> new Series("s", new double[2], new double[1]));
    assertTrue(e.getMessage().contains("equal lengths"), e.getMessage());
    e =
        assertThrows(
            IllegalArgumentException.class, () -> new PanelLabels("Not A Word", "", "", ""));
    assertTrue(e.getMessage().contains("kind"), e.getMessage());
  }

  @Test
  void longNotesAreWrappedNotCut() {
    List<String> lines = SvgPlot.wrap("one two three four five six seven eight nine ten", 14, 5);
    assertEquals(List.of("one two three", "four five six", "seven eight", "nine ten"), lines);
    List<String> capped = SvgPlot.wrap("aaaa bbbb cccc dddd", 4, 2);
    assertEquals(2, capped.size());
    assertTrue(capped.get(1).endsWith("..."), capped.toString());
  }
}

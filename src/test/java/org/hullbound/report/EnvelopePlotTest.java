package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/** The envelope picture: nice ticks, escaping, clipping of curves that fall off the frame. */
class EnvelopePlotTest {

  private static final EnvelopePlot.Curve EMPTY = new EnvelopePlot.Curve(new double[0], new double[0]);

  @Test
  void niceNumbersAreOneTwoOrFiveTimesAPowerOfTen() {
    // Heckbert (1990), Nice numbers for graph labels: rounded 1.4 -> 1, 2.9 -> 2, 6.9 -> 5, 7 -> 10.
    assertEquals(1, EnvelopePlot.Ticks.niceNumber(1.4, true));
    assertEquals(2, EnvelopePlot.Ticks.niceNumber(2.9, true));
    assertEquals(5, EnvelopePlot.Ticks.niceNumber(6.9, true));
    assertEquals(10, EnvelopePlot.Ticks.niceNumber(7, true));
    assertEquals(0.05, EnvelopePlot.Ticks.niceNumber(0.031, false), 1e-17);
    assertEquals(List.of(0.0, 2.0, 4.0, 6.0, 8.0, 10.0), EnvelopePlot.Ticks.of(-0.3, 10.2, 6).values());
    EnvelopePlot.Ticks tenths = EnvelopePlot.Ticks.of(0, 1, 5);
    assertEquals(6, tenths.values().size());
    assertEquals("0.2", tenths.label(tenths.values().get(1)));
    assertEquals("1.0", tenths.label(tenths.values().get(5)));
    assertEquals("0.005", EnvelopePlot.Ticks.of(0, 0.01, 3).label(0.005));
  }

  @Test
  void aNarrowRangeFarFromZeroIsLabelledRelativeToAnOffset() {
    EnvelopePlot.Ticks ticks = EnvelopePlot.Ticks.of(1e6 - 3e-6, 1e6 + 3e-6, 7);
    assertEquals("999999.999997", ticks.offsetText());
    assertEquals("0", ticks.label(ticks.values().get(0)));
    assertEquals("1.00e-06", ticks.label(ticks.values().get(1)));
    String svg = EnvelopePlot.svg("t", 1e6 - 3e-6, 1e6 + 3e-6, EMPTY, EMPTY, EMPTY, EMPTY,
        new double[0], 0);
    assertTrue(svg.contains(">x \u2212 999999.999997<"), svg);
    assertEquals("", EnvelopePlot.Ticks.of(-3, 3, 7).offsetText());
  }

  @Test
  void titleTextIsEscapedForXml() {
    assertEquals("a &lt; b &amp; &quot;c&quot;", EnvelopePlot.escape("a < b & \"c\"\u0001"));
  }

  @Test
  void curvesBelowTheFrameAreCutAtItsEdgeAndNonFiniteValuesBreakThem() {
    EnvelopePlot.Curve density =
        new EnvelopePlot.Curve(
            new double[] {0, 1, 2, 3, 4},
            new double[] {-1000, 0, Double.NEGATIVE_INFINITY, -1, Double.NaN});
    String svg = EnvelopePlot.svg("t", 0, 4, EMPTY, EMPTY, density, EMPTY, new double[] {1, 9}, 2);
    String d = svg.substring(svg.indexOf("id=\"log-density\""));
    d = d.substring(d.indexOf(" d=\"") + 4, d.indexOf("\"/>"));
    // Starts at the frame's lower edge, not at -1000; two pieces since -inf breaks the curve.
    assertEquals(2, d.split("M").length - 1, d);
    assertFalse(d.contains("-"), "no coordinate far off the picture: " + d);
    // The draw at 9 lies outside [0, 4] and gets no tick.
    assertTrue(svg.contains("2 draws made, 1 shown<"), svg);
  }

  @Test
  void aRangeMustBeFiniteAndIncreasing() {
    assertThrows(IllegalArgumentException.class,
        () -> EnvelopePlot.svg("t", 1, 1, EMPTY, EMPTY, EMPTY, EMPTY, new double[0], 0));
    assertThrows(IllegalArgumentException.class,
        () -> EnvelopePlot.svg("t", 0, Double.POSITIVE_INFINITY, EMPTY, EMPTY, EMPTY, EMPTY,
            new double[0], 0));
  }
}

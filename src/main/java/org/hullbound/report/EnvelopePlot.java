package org.hullbound.report;

import java.math.BigDecimal;
import java.math.RoundingMode;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * A small self-contained SVG picture of an adaptive rejection sampler's envelope in log space:
 * the upper hull as a piecewise-linear curve, the squeeze below it, the log-density sampled on a
 * grid, the abscissae on the density, and a tick for each shown draw along the bottom.
 *
 * <p>Why: a look at hull, squeeze and density shows at once whether the envelope fits, where the
 * density is evaluated and where the draws fell, the picture Gilks and Wild (1992, figure 1)
 * draw to explain the method. Axis ticks are "nice numbers" (1, 2 or 5 times a power of ten;
 * Heckbert 1990, Nice numbers for graph labels, Graphics Gems). The caller computes the curves
 * (from a {@code hull.HullSnapshot}); this class only draws them, so it needs no sampler.
 */
public final class EnvelopePlot {
  private static final int WIDTH = 720;
  private static final int HEIGHT = 440;
  private static final double LEFT = 72;
  private static final double RIGHT = WIDTH - 24;
  private static final double TOP = 62;
  private static final double BOTTOM = HEIGHT - 64;
  private static final double RUG_HEIGHT = 10;
  private static final double SHOWN_DEPTH = 12;
  private static final String HULL_COLOUR = "#c2410c";
  private static final String SQUEEZE_COLOUR = "#0f766e";
  private static final String DENSITY_COLOUR = "#1e293b";
  private static final String DRAW_COLOUR = "#6366f1";

  private EnvelopePlot() {}

  /**
   * A curve through points in increasing x; a non-finite y breaks it.
   *
   * @param x abscissae, increasing
   * @param y values, same length
   */
  public record Curve(double[] x, double[] y) {
    /** Validates the lengths and copies the arrays. */
    public Curve {
      if (x == null || y == null || x.length != y.length) {
        throw new IllegalArgumentException(
            "x and y must be non-null arrays of one length, got " + (x == null ? null : x.length)
                + " and " + (y == null ? null : y.length));
      }
      x = x.clone();
      y = y.clone();
    }
  }

  /**
   * The SVG document.
   *
   * @param title shown above the plot (escaped for XML)
   * @param xLow left end of the x axis
   * @param xHigh right end, greater than {@code xLow}; both finite
   * @param hull the upper hull at its breakpoints (and the range ends)
   * @param squeeze the squeeze at the abscissae inside the range
   * @param logDensity the log-density on a grid over the range
   * @param abscissae the abscissae and the log-density there, drawn as dots
   * @param draws draws to mark with ticks along the bottom: the first of {@code drawsMade}
   * @param drawsMade the draws made, which the legend states (with how many the ticks show, when
   *     fewer)
   */
  public static String svg(
      String title,
      double xLow,
      double xHigh,
      Curve hull,
      Curve squeeze,
      Curve logDensity,
      Curve abscissae,
      double[] draws,
      long drawsMade) {
    if (!(Double.isFinite(xLow) && Double.isFinite(xHigh) && xLow < xHigh)) {
      throw new IllegalArgumentException(
          "x range must be finite with xLow < xHigh, got [" + xLow + ", " + xHigh + "]");
    }
    if (title == null || hull == null || squeeze == null || logDensity == null
        || abscissae == null || draws == null) {
      throw new IllegalArgumentException("title, curves and draws must not be null");
    }
    double top = Math.max(highest(hull), highest(logDensity));
    if (top == Double.NEGATIVE_INFINITY) {
      top = 0;
    }
    double bottom = Math.max(lowest(logDensity), top - SHOWN_DEPTH);
    if (!(bottom < top)) {
      bottom = top - 1;
    }
    double pad = 0.06 * (top - bottom);
    Frame frame = new Frame(xLow, xHigh, bottom - pad, top + pad);
    Ticks xTicks = Ticks.of(xLow, xHigh, 8);
    Ticks yTicks = Ticks.of(frame.yLow, frame.yHigh, 6);

    StringBuilder svg = new StringBuilder(16_384);
    svg.append("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    svg.append("<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"").append(WIDTH)
        .append("\" height=\"").append(HEIGHT).append("\" viewBox=\"0 0 ").append(WIDTH)
        .append(' ').append(HEIGHT).append("\" font-family=\"Helvetica, Arial, sans-serif\""
            + " font-size=\"12\">\n");
    svg.append("<title>").append(escape(title)).append("</title>\n");
    svg.append("<defs><clipPath id=\"plot-area\"><rect x=\"").append(n(LEFT)).append("\" y=\"")
        .append(n(TOP)).append("\" width=\"").append(n(RIGHT - LEFT)).append("\" height=\"")
        .append(n(BOTTOM - TOP)).append("\"/></clipPath></defs>\n");
    svg.append("<rect width=\"100%\" height=\"100%\" fill=\"#ffffff\"/>\n");
    svg.append("<text x=\"").append(n(LEFT)).append("\" y=\"24\" font-size=\"14\""
        + " font-weight=\"bold\" fill=\"#0f172a\">").append(escape(shorten(title)))
        .append("</text>\n");
    axes(svg, frame, xTicks, yTicks);

    svg.append("<g clip-path=\"url(#plot-area)\" fill=\"none\" stroke-linejoin=\"round\">\n");
    path(svg, "log-density", logDensity, frame, DENSITY_COLOUR, "1.6", null);
    path(svg, "squeeze", squeeze, frame, SQUEEZE_COLOUR, "1.4", "5 3");
    path(svg, "hull", hull, frame, HULL_COLOUR, "1.8", null);
    svg.append("<g id=\"abscissae\" fill=\"").append(DENSITY_COLOUR).append("\" stroke=\"#ffffff\""
        + " stroke-width=\"1\">\n");
    for (int i = 0; i < abscissae.x().length; i++) {
      double x = abscissae.x()[i];
      double y = abscissae.y()[i];
      if (Double.isFinite(y) && x >= xLow && x <= xHigh && y >= frame.yLow) {
        svg.append("<circle cx=\"").append(n(frame.px(x))).append("\" cy=\"")
            .append(n(frame.py(y))).append("\" r=\"3\"/>\n");
      }
    }
    svg.append("</g>\n</g>\n");

    svg.append("<path id=\"draws\" stroke=\"").append(DRAW_COLOUR)
        .append("\" stroke-opacity=\"0.45\" stroke-width=\"1\" d=\"");
    int shown = 0;
    for (double x : draws) {
      if (x >= xLow && x <= xHigh) {
        svg.append(shown == 0 ? "" : " ").append('M').append(n(frame.px(x))).append(',')
            .append(n(BOTTOM)).append('v').append(n(-RUG_HEIGHT));
        shown++;
      }
    }
    svg.append("\"/>\n");
    legend(svg, shown, Math.max(drawsMade, shown), abscissae.x().length);
    svg.append("</svg>\n");
    return svg.toString();
  }

  private static void axes(StringBuilder svg, Frame frame, Ticks xTicks, Ticks yTicks) {
    svg.append("<g id=\"axes\" stroke=\"#94a3b8\" stroke-width=\"1\">\n");
    svg.append("<rect x=\"").append(n(LEFT)).append("\" y=\"").append(n(TOP))
        .append("\" width=\"").append(n(RIGHT - LEFT)).append("\" height=\"")
        .append(n(BOTTOM - TOP)).append("\" fill=\"#f8fafc\"/>\n");
    for (double t : xTicks.values()) {
      double px = frame.px(t);
      svg.append("<line x1=\"").append(n(px)).append("\" y1=\"").append(n(BOTTOM))
          .append("\" x2=\"").append(n(px)).append("\" y2=\"").append(n(BOTTOM + 5))
          .append("\"/>\n");
    }
    for (double t : yTicks.values()) {
      double py = frame.py(t);
      svg.append("<line x1=\"").append(n(LEFT - 5)).append("\" y1=\"").append(n(py))
          .append("\" x2=\"").append(n(RIGHT)).append("\" y2=\"").append(n(py))
          .append("\" stroke=\"#e2e8f0\"/>\n");
    }
    svg.append("</g>\n<g fill=\"#334155\">\n");
    for (double t : xTicks.values()) {
      svg.append("<text x=\"").append(n(frame.px(t))).append("\" y=\"").append(n(BOTTOM + 19))
          .append("\" text-anchor=\"middle\">").append(xTicks.label(t)).append("</text>\n");
    }
    for (double t : yTicks.values()) {
      svg.append("<text x=\"").append(n(LEFT - 8)).append("\" y=\"").append(n(frame.py(t) + 4))
          .append("\" text-anchor=\"end\">").append(yTicks.label(t)).append("</text>\n");
    }
    svg.append("<text x=\"").append(n((LEFT + RIGHT) / 2)).append("\" y=\"").append(n(BOTTOM + 40))
        .append("\" text-anchor=\"middle\">x").append(offsetSuffix(xTicks)).append("</text>\n");
    svg.append("<text transform=\"translate(18,").append(n((TOP + BOTTOM) / 2))
        .append(") rotate(-90)\" text-anchor=\"middle\">log-density").append(offsetSuffix(yTicks))
        .append(" (up to a constant)</text>\n");
    svg.append("</g>\n");
  }

  /** " − 1000000" or " + 1000000" when the labels are relative to an offset. */
  private static String offsetSuffix(Ticks ticks) {
    String text = ticks.offsetText();
    if (text.isEmpty()) {
      return "";
    }
    return text.startsWith("-") ? " + " + text.substring(1) : " \u2212 " + text;
  }

  private static void legend(StringBuilder svg, int shownDraws, long drawsMade, int abscissae) {
    String[][] entries = {
      {HULL_COLOUR, "upper hull", ""},
      {SQUEEZE_COLOUR, "squeeze", "5 3"},
      {DENSITY_COLOUR, "log-density", ""},
      {DENSITY_COLOUR, abscissae + (abscissae == 1 ? " abscissa" : " abscissae"), "dot"},
      {DRAW_COLOUR, drawsMade + " draw" + (drawsMade == 1 ? "" : "s") + " made"
          + (shownDraws == drawsMade ? "" : ", " + shownDraws + " shown"), "tick"},
    };
    double x = LEFT;
    double y = 44;
    svg.append("<g id=\"legend\">\n");
    for (String[] entry : entries) {
      if (entry[2].equals("dot")) {
        svg.append("<circle cx=\"").append(n(x + 12)).append("\" cy=\"").append(n(y))
            .append("\" r=\"3\" fill=\"").append(entry[0]).append("\"/>\n");
      } else if (entry[2].equals("tick")) {
        svg.append("<path d=\"M").append(n(x + 12)).append(',').append(n(y + 5))
            .append("v-10\" stroke=\"").append(entry[0]).append("\" stroke-width=\"1.5\"/>\n");
      } else {
        svg.append("<line x1=\"").append(n(x)).append("\" y1=\"").append(n(y)).append("\" x2=\"")
            .append(n(x + 24)).append("\" y2=\"").append(n(y)).append("\" stroke=\"")
            .append(entry[0]).append("\" stroke-width=\"1.8\"")
            .append(entry[2].isEmpty() ? "" : " stroke-dasharray=\"" + entry[2] + "\"")
            .append("/>\n");
      }
      svg.append("<text x=\"").append(n(x + 32)).append("\" y=\"").append(n(y + 4))
          .append("\" fill=\"#334155\">").append(escape(entry[1])).append("</text>\n");
      x += 40 + 7 * entry[1].length();
    }
    svg.append("</g>\n");
  }

  /** One curve as an SVG path; segments dipping below the frame are cut at its lower edge. */
  private static void path(
      StringBuilder svg, String id, Curve curve, Frame frame, String colour, String width,
      String dash) {
    svg.append("<path id=\"").append(id).append("\" stroke=\"").append(colour)
        .append("\" stroke-width=\"").append(width).append('"');
    if (dash != null) {
      svg.append(" stroke-dasharray=\"").append(dash).append('"');
    }
    svg.append(" d=\"");
    double[] xs = curve.x();
    double[] ys = curve.y();
    boolean open = false;
    double floor = frame.yLow - 0.05 * (frame.yHigh - frame.yLow);
    for (int i = 0; i < xs.length; i++) {
      double x = xs[i];
      double y = ys[i];
      if (!Double.isFinite(x) || !Double.isFinite(y)) {
        open = false;
        continue;
      }
      boolean previousFinite = i > 0 && Double.isFinite(xs[i - 1]) && Double.isFinite(ys[i - 1]);
      if (y < floor) {
        if (open && previousFinite) {
          double cut = xs[i - 1] + (x - xs[i - 1]) * (floor - ys[i - 1]) / (y - ys[i - 1]);
          svg.append('L').append(n(frame.px(cut))).append(',').append(n(frame.py(floor)));
        }
        open = false;
        continue;
      }
      if (!open) {
        if (previousFinite && ys[i - 1] < floor) {
          double cut = xs[i - 1] + (x - xs[i - 1]) * (floor - ys[i - 1]) / (y - ys[i - 1]);
          svg.append('M').append(n(frame.px(cut))).append(',').append(n(frame.py(floor)));
          svg.append('L');
        } else {
          svg.append('M');
        }
        open = true;
      } else {
        svg.append('L');
      }
      svg.append(n(frame.px(x))).append(',').append(n(frame.py(y)));
    }
    svg.append("\"/>\n");
  }

  private static double highest(Curve curve) {
    double best = Double.NEGATIVE_INFINITY;
    for (double y : curve.y()) {
      if (Double.isFinite(y)) {
        best = Math.max(best, y);
      }
    }
    return best;
  }

  private static double lowest(Curve curve) {
    double best = Double.POSITIVE_INFINITY;
    for (double y : curve.y()) {
      if (Double.isFinite(y)) {
        best = Math.min(best, y);
      }
    }
    return best == Double.POSITIVE_INFINITY ? Double.NEGATIVE_INFINITY : best;
  }

  /** Pixel coordinates to one decimal, never in exponent form. */
  private static String n(double value) {
    double rounded = Math.round(value * 10) / 10.0;
    if (rounded == Math.rint(rounded)) {
      return Long.toString((long) rounded);
    }
    return String.format(Locale.ROOT, "%.1f", rounded);
  }

  private static String shorten(String title) {
    return title.codePointCount(0, title.length()) <= 90
        ? title
        : title.substring(0, title.offsetByCodePoints(0, 87)) + "...";
  }

  /** Escapes text for XML 1.0, dropping characters it cannot hold. */
  static String escape(String text) {
    StringBuilder out = new StringBuilder(text.length());
    text.codePoints()
        .forEach(
            c -> {
              switch (c) {
                case '&' -> out.append("&amp;");
                case '<' -> out.append("&lt;");
                case '>' -> out.append("&gt;");
                case '"' -> out.append("&quot;");
                default -> {
                  boolean allowed =
                      c == 0x9 || c == 0xA || c == 0xD || (c >= 0x20 && c <= 0xD7FF)
                          || (c >= 0xE000 && c <= 0xFFFD) || (c >= 0x10000 && c <= 0x10FFFF);
                  if (allowed) {
                    out.appendCodePoint(c);
                  }
                }
              }
            });
    return out.toString();
  }

  /** Maps data coordinates to pixels. */
  private static final class Frame {
    final double xLow;
    final double xHigh;
    final double yLow;
    final double yHigh;

    Frame(double xLow, double xHigh, double yLow, double yHigh) {
      this.xLow = xLow;
      this.xHigh = xHigh;
      this.yLow = yLow;
      this.yHigh = yHigh;
    }

    double px(double x) {
      return LEFT + (x - xLow) / (xHigh - xLow) * (RIGHT - LEFT);
    }

    double py(double y) {
      return BOTTOM - (y - yLow) / (yHigh - yLow) * (BOTTOM - TOP);
    }
  }

  /**
   * Axis ticks at 1, 2 or 5 times a power of ten (Heckbert 1990), with labels that show just the
   * digits the step needs.
   */
  record Ticks(List<Double> values, double step, BigDecimal offset) {

    /**
     * About {@code wanted} ticks inside [low, high] at a rounded nice step. Heckbert first rounds
     * the range up to a nice number, which can halve the ticks (10.5 becomes 20); the step alone
     * is rounded here so that the count stays near the one wanted. When the ticks would need more
     * than five significant digits (a narrow range far from zero), they are labelled relative to
     * an offset, the first tick.
     */
    static Ticks of(double low, double high, int wanted) {
      double step = niceNumber((high - low) / Math.max(1, wanted - 1), true);
      List<Double> values = new ArrayList<>();
      double first = Math.ceil(low / step) * step;
      for (int i = 0; i < 100; i++) {
        double t = first + i * step;
        if (t > high + 1e-9 * step) {
          break;
        }
        values.add(Math.abs(t) < 1e-9 * step ? 0.0 : t);
      }
      BigDecimal offset = BigDecimal.ZERO;
      double largest = Math.max(Math.abs(low), Math.abs(high));
      if (largest / step >= 1e5 && !values.isEmpty()) {
        offset = multiple(values.get(0), step);
      }
      return new Ticks(List.copyOf(values), step, offset);
    }

    /** The multiple of {@code step} nearest {@code t}, exactly in decimal. */
    private static BigDecimal multiple(double t, double step) {
      return new BigDecimal(Double.toString(step))
          .multiply(BigDecimal.valueOf(Math.round(t / step)))
          .stripTrailingZeros();
    }

    /** The offset subtracted from every label, as text such as {@code 1000000}; empty if none. */
    String offsetText() {
      return offset.signum() == 0 ? "" : offset.toPlainString();
    }

    /** The label of tick {@code t}: the nearest multiple of the step, less the offset. */
    String label(double t) {
      BigDecimal shown = multiple(t - offset.doubleValue(), step);
      double magnitude = Math.abs(shown.doubleValue());
      if (magnitude == 0) {
        return "0";
      }
      if (magnitude >= 1e6 || step < 1e-4) {
        return String.format(Locale.ROOT, "%.3g", shown.doubleValue());
      }
      int decimals = (int) Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
      return shown.setScale(decimals, RoundingMode.HALF_UP).toPlainString();
    }

    /**
     * 1, 2, 5 or 10 times a power of ten near {@code raw}: the nearest when {@code round}, else
     * the smallest at least {@code raw} (Heckbert 1990).
     */
    static double niceNumber(double raw, boolean round) {
      if (!(raw > 0) || !Double.isFinite(raw)) {
        return 1;
      }
      double power = Math.pow(10, Math.floor(Math.log10(raw)));
      double fraction = raw / power;
      double nice;
      if (round) {
        nice = fraction < 1.5 ? 1 : fraction < 3 ? 2 : fraction < 7 ? 5 : 10;
      } else {
        nice = fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10;
      }
      return nice * power;
    }
  }
}

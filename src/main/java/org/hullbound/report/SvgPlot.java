package org.hullbound.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

/**
 * Small self-contained SVG plot panels: traces, smooth curves, bars and step histograms, each with
 * round axis ticks ({@link NiceScale}, after Heckbert 1990) and a quiet frame.
 *
 * <p>Every factory returns one complete {@code <svg>} element as a string, well-formed XML with
 * presentation attributes only, so a panel reads the same inline in the report or saved alone. When
 * the data cannot be drawn (nothing finite, a range beyond double precision) the panel is a framed
 * note saying why; a factory never throws for the data's values, only for null arguments or
 * mismatched lengths.
 *
 * <table>
 *   <caption>Factories</caption>
 *   <tr><td>{@link #trace}</td><td>solid lines, a legend, y range from the data</td></tr>
 *   <tr><td>{@link #curves}</td><td>dashed lines per series, y from zero</td></tr>
 *   <tr><td>{@link #bars}</td><td>thin bars from zero, with an optional reference band</td></tr>
 *   <tr><td>{@link #steps}</td><td>step lines per series over shared bin edges, optional band</td></tr>
 *   <tr><td>{@link #replicates}</td><td>a filled histogram with one value marked by a line</td></tr>
 *   <tr><td>{@link #note}</td><td>an empty frame with a message</td></tr>
 * </table>
 */
public final class SvgPlot {
  /** The width of every panel in SVG user units; heights vary with the legend. */
  public static final double WIDTH = 320;

  private static final double PLOT_HEIGHT = 124;
  private static final double RIGHT_MARGIN = 12;
  private static final double TITLE_BASELINE = 14;
  private static final double LEGEND_ROW = 13;
  private static final double TICK_FONT = 10.5;
  private static final double CHAR_WIDTH = 5.9;
  private static final String FONT = "system-ui, -apple-system, 'Segoe UI', Roboto, sans-serif";

  private SvgPlot() {}

  /** Solid lines, one colour per series, with a legend of the series names; y from the data. */
  public static String trace(PanelLabels labels, List<Series> series) {
    return lines(labels, series, false, true, false);
  }

  /** Smooth curves such as densities: one colour and dash pattern per series, y from zero. */
  public static String curves(PanelLabels labels, List<Series> series, boolean legend) {
    return lines(labels, series, true, legend, true);
  }

  /**
   * Thin bars of {@code heights} at {@code x}, from zero, with an optional band behind them.
   *
   * @throws IllegalArgumentException if the arrays are null or differ in length
   */
  public static String bars(
      PanelLabels labels, double[] x, double[] heights, Optional<ReferenceBand> band) {
    requireLabels(labels);
    if (x == null || heights == null || x.length != heights.length) {
      throw new IllegalArgumentException(
          "x and heights must be non-null arrays of equal length, got "
              + (x == null ? "null" : x.length)
              + " and "
              + (heights == null ? "null" : heights.length));
    }
    Range xs = Range.empty();
    Range ys = Range.empty().include(0);
    for (int i = 0; i < x.length; i++) {
      if (Double.isFinite(x[i]) && Double.isFinite(heights[i])) {
        xs = xs.include(x[i]);
        ys = ys.include(heights[i]);
      }
    }
    if (xs.isEmpty()) {
      return note(labels, "nothing finite to draw");
    }
    if (band.isPresent()) {
      ys = ys.include(band.get().low()).include(band.get().high());
    }
    double halfGap = x.length > 1 ? spacing(x) / 2 : 0.5;
    xs = xs.include(xs.min - halfGap).include(xs.max + halfGap);
    Canvas canvas = Canvas.open(labels, xs, ys, List.of());
    if (canvas == null) {
      return note(labels, "values span more than double precision can label");
    }
    band.ifPresent(canvas::band);
    double width = Math.max(1, Math.min(4, 0.5 * canvas.pixelsPerX() * 2 * halfGap));
    for (int i = 0; i < x.length; i++) {
      if (Double.isFinite(x[i]) && Double.isFinite(heights[i])) {
        canvas.bar(x[i], heights[i], width, Palette.ACCENT);
      }
    }
    return canvas.close();
  }

  /**
   * Step lines over shared bin {@code edges}: series {@code s} has height {@code heights.get(s)[b]}
   * on bin {@code b}, from {@code edges[b]} to {@code edges[b + 1]}. Colours and dashes follow the
   * series order, as in {@link #trace}; {@code names} label them in a legend when not empty.
   *
   * @throws IllegalArgumentException if the arrays are null or a series does not have one height
   *     per bin
   */
  public static String steps(
      PanelLabels labels,
      double[] edges,
      List<double[]> heights,
      List<String> names,
      Optional<ReferenceBand> band) {
    requireLabels(labels);
    if (edges == null || edges.length < 2 || heights == null || names == null) {
      throw new IllegalArgumentException(
          "edges must hold at least two values and heights and names must not be null");
    }
    Range xs = Range.empty();
    for (double e : edges) {
      if (Double.isFinite(e)) {
        xs = xs.include(e);
      }
    }
    Range ys = Range.empty().include(0);
    for (int s = 0; s < heights.size(); s++) {
      double[] h = heights.get(s);
      if (h == null || h.length != edges.length - 1) {
        throw new IllegalArgumentException(
            "series "
                + s
                + " must have one height per bin ("
                + (edges.length - 1)
                + "), got "
                + (h == null ? "null" : h.length));
      }
      for (double v : h) {
        if (Double.isFinite(v)) {
          ys = ys.include(v);
        }
      }
    }
    if (xs.isEmpty() || xs.min == xs.max) {
      return note(labels, "no bins to draw");
    }
    if (band.isPresent()) {
      ys = ys.include(band.get().low()).include(band.get().high());
    }
    Canvas canvas = Canvas.open(labels, xs, ys, names);
    if (canvas == null) {
      return note(labels, "values span more than double precision can label");
    }
    band.ifPresent(canvas::band);
    for (int s = 0; s < heights.size(); s++) {
      double[] h = heights.get(s);
      List<double[]> points = new ArrayList<>();
      for (int b = 0; b < h.length; b++) {
        points.add(new double[] {edges[b], h[b]});
        points.add(new double[] {edges[b + 1], h[b]});
      }
      canvas.polyline(points, Palette.colour(s), Palette.dash(s), 1.2);
    }
    return canvas.close();
  }

  /**
   * A filled histogram of {@code values} in about {@code bins} equal bins (one bin per whole number
   * when the values are whole and span few of them), and {@code mark} as an upright line: the
   * replicated test quantities of a predictive check against the observed one. Values that are not
   * finite are left out.
   *
   * @throws IllegalArgumentException if {@code values} is null or {@code bins < 1}
   */
  public static String replicates(PanelLabels labels, double[] values, double mark, int bins) {
    requireLabels(labels);
    if (values == null || bins < 1) {
      throw new IllegalArgumentException("values must not be null and bins must be >= 1");
    }
    Range data = Range.empty();
    boolean whole = true;
    for (double v : values) {
      if (Double.isFinite(v)) {
        data = data.include(v);
        whole &= v == Math.rint(v);
      }
    }
    if (data.isEmpty()) {
      return note(labels, "no finite replicate to draw");
    }
    double low;
    double width;
    int count;
    if (whole && data.max - data.min <= 2 * bins) {
      low = data.min - 0.5;
      width = 1;
      count = (int) (data.max - data.min) + 1;
    } else if (data.max == data.min) {
      low = data.min - 0.5;
      width = 1;
      count = 1;
    } else {
      low = data.min;
      width = (data.max - data.min) / bins;
      count = bins;
    }
    double[] heights = new double[count];
    for (double v : values) {
      if (Double.isFinite(v)) {
        heights[Math.min(count - 1, Math.max(0, (int) Math.floor((v - low) / width)))]++;
      }
    }
    Range xs = Range.empty().include(low).include(low + count * width);
    if (Double.isFinite(mark)) {
      xs = xs.include(mark);
    }
    Range ys = Range.empty().include(0);
    for (double h : heights) {
      ys = ys.include(h);
    }
    Canvas canvas = Canvas.open(labels, xs, ys, List.of());
    if (canvas == null) {
      return note(labels, "values span more than double precision can label");
    }
    for (int b = 0; b < count; b++) {
      canvas.column(low + b * width, low + (b + 1) * width, heights[b]);
    }
    if (Double.isFinite(mark)) {
      canvas.upright(mark, Palette.ACCENT);
    }
    return canvas.close();
  }

  /**
   * A scatter of the points {@code (x[i], y[i])} as small translucent dots; pairs with a value that
   * is not finite are left out.
   *
   * @throws IllegalArgumentException if the arrays are null or differ in length
   */
  public static String scatter(PanelLabels labels, double[] x, double[] y) {
    requireLabels(labels);
    if (x == null || y == null || x.length != y.length) {
      throw new IllegalArgumentException("x and y must be non-null arrays of equal length");
    }
    Range xs = Range.empty();
    Range ys = Range.empty();
    for (int i = 0; i < x.length; i++) {
      if (Double.isFinite(x[i]) && Double.isFinite(y[i])) {
        xs = xs.include(x[i]);
        ys = ys.include(y[i]);
      }
    }
    if (xs.isEmpty()) {
      return note(labels, "no finite values to draw");
    }
    Canvas canvas = Canvas.open(labels, xs, ys, List.of());
    if (canvas == null) {
      return note(labels, "values span more than double precision can label");
    }
    canvas.dots(x, y, Palette.ACCENT);
    return canvas.close();
  }

  /** An empty frame with the title and a one-line message, for data that cannot be drawn. */
  public static String note(PanelLabels labels, String message) {
    requireLabels(labels);
    double height = TITLE_BASELINE + 8 + PLOT_HEIGHT + 30;
    StringBuilder svg = new StringBuilder(512);
    openSvg(svg, labels, height);
    svg.append("<rect x=\"8\" y=\"24\" width=\"")
        .append((int) (WIDTH - 16))
        .append("\" height=\"")
        .append((int) PLOT_HEIGHT)
        .append("\" fill=\"none\" stroke=\"")
        .append(Palette.GRID)
        .append("\" stroke-dasharray=\"4 3\"/>");
    List<String> lines = wrap(message == null ? "" : message, 52, 4);
    double firstBaseline = 24 + PLOT_HEIGHT / 2 - (lines.size() - 1) * 7 + 3;
    svg.append("<text font-size=\"10.5\" fill=\"")
        .append(Palette.MUTED)
        .append("\" text-anchor=\"middle\">");
    for (int i = 0; i < lines.size(); i++) {
      svg.append("<tspan x=\"").append((int) (WIDTH / 2)).append("\" y=\"");
      Markup.coordinate(svg, firstBaseline + 14 * i)
          .append("\">")
          .append(Markup.escape(lines.get(i)))
          .append("</tspan>");
    }
    svg.append("</text></svg>");
    return svg.toString();
  }

  private static String lines(
      PanelLabels labels, List<Series> series, boolean fromZero, boolean legend, boolean dashed) {
    requireLabels(labels);
    if (series == null || series.stream().anyMatch(java.util.Objects::isNull)) {
      throw new IllegalArgumentException("series must be a list without null entries");
    }
    Range xs = Range.empty();
    Range ys = fromZero ? Range.empty().include(0) : Range.empty();
    boolean anyPoint = false;
    for (Series s : series) {
      for (int i = 0; i < s.size(); i++) {
        if (Double.isFinite(s.xAt(i)) && Double.isFinite(s.yAt(i))) {
          xs = xs.include(s.xAt(i));
          ys = ys.include(s.yAt(i));
          anyPoint = true;
        }
      }
    }
    if (!anyPoint) {
      return note(labels, "no finite values to draw");
    }
    List<String> names = new ArrayList<>();
    if (legend) {
      series.forEach(s -> names.add(s.name()));
    }
    Canvas canvas = Canvas.open(labels, xs, ys, names);
    if (canvas == null) {
      return note(labels, "values span more than double precision can label");
    }
    double strokeWidth = dashed ? 1.3 : 0.8;
    for (int s = 0; s < series.size(); s++) {
      Series line = series.get(s);
      List<double[]> run = new ArrayList<>();
      for (int i = 0; i <= line.size(); i++) {
        boolean gap =
            i == line.size() || !Double.isFinite(line.xAt(i)) || !Double.isFinite(line.yAt(i));
        if (!gap) {
          run.add(new double[] {line.xAt(i), line.yAt(i)});
        } else if (!run.isEmpty()) {
          canvas.polyline(run, Palette.colour(s), dashed ? Palette.dash(s) : "", strokeWidth);
          run = new ArrayList<>();
        }
      }
    }
    return canvas.close();
  }

  /** Breaks {@code text} at spaces into at most {@code maxLines} lines of about {@code width}. */
  static List<String> wrap(String text, int width, int maxLines) {
    List<String> lines = new ArrayList<>();
    StringBuilder line = new StringBuilder();
    for (String word : text.trim().split("\\s+")) {
      if (line.length() > 0 && line.length() + 1 + word.length() > width) {
        lines.add(line.toString());
        line.setLength(0);
      }
      if (line.length() > 0) {
        line.append(' ');
      }
      line.append(word);
    }
    lines.add(line.toString());
    if (lines.size() > maxLines) {
      List<String> kept = new ArrayList<>(lines.subList(0, maxLines));
      String last = kept.get(maxLines - 1);
      kept.set(
          maxLines - 1, (last.length() > width - 3 ? last.substring(0, width - 3) : last) + "...");
      return kept;
    }
    return lines;
  }

  private static void requireLabels(PanelLabels labels) {
    if (labels == null) {
      throw new IllegalArgumentException("labels must not be null");
    }
  }

  private static double spacing(double[] x) {
    double smallest = Double.POSITIVE_INFINITY;
    for (int i = 1; i < x.length; i++) {
      double d = Math.abs(x[i] - x[i - 1]);
      if (d > 0 && d < smallest) {
        smallest = d;
      }
    }
    return Double.isFinite(smallest) ? smallest : 1;
  }

  private static void openSvg(StringBuilder svg, PanelLabels labels, double height) {
    svg.append("<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"plot plot-")
        .append(labels.kind())
        .append("\" viewBox=\"0 0 ")
        .append((int) WIDTH)
        .append(' ')
        .append((int) Math.ceil(height))
        .append("\" role=\"img\" font-family=\"")
        .append(FONT)
        .append("\"><title>")
        .append(Markup.escape(labels.title()))
        .append("</title>");
    svg.append("<text x=\"8\" y=\"")
        .append((int) TITLE_BASELINE)
        .append("\" font-size=\"12.5\" font-weight=\"600\" fill=\"")
        .append(Palette.INK)
        .append("\">")
        .append(Markup.escape(labels.title()))
        .append("</text>");
  }

  /** A growing closed interval of data values; empty until the first value. */
  private record Range(double min, double max) {
    static Range empty() {
      return new Range(Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY);
    }

    Range include(double v) {
      return new Range(Math.min(min, v), Math.max(max, v));
    }

    boolean isEmpty() {
      return min > max;
    }
  }

  /** The drawn span of one axis and the round ticks inside it. */
  private static final class Axis {
    final NiceScale scale;
    final double low;
    final double high;
    final double[] ticks;

    private Axis(NiceScale scale, double low, double high, double[] ticks) {
      this.scale = scale;
      this.low = low;
      this.high = high;
      this.ticks = ticks;
    }

    /** The span of the data widened by {@code pad} of its width at each end, or null. */
    static Axis of(double min, double max, double pad) {
      NiceScale scale;
      try {
        scale = NiceScale.of(min, max, 5);
      } catch (IllegalArgumentException e) {
        return null;
      }
      double low = min;
      double high = max;
      if (!(low < high)) {
        low = scale.low();
        high = scale.high();
      } else {
        double room = (high - low) * pad;
        low -= room;
        high += room;
      }
      if (!Double.isFinite(low) || !Double.isFinite(high) || !(high - low > 0)) {
        return null;
      }
      double from = low - (high - low) * 1e-9;
      double to = high + (high - low) * 1e-9;
      double[] ticks =
          java.util.Arrays.stream(scale.ticks()).filter(t -> t >= from && t <= to).toArray();
      return new Axis(scale, low, high, ticks);
    }
  }

  /** One panel being written: scales, plot area and the growing SVG text. */
  private static final class Canvas {
    private final StringBuilder svg = new StringBuilder(4096);
    private final Axis xAxis;
    private final Axis yAxis;
    private final double left;
    private final double right;
    private final double top;
    private final double bottom;

    private Canvas(Axis xAxis, Axis yAxis, double left, double top) {
      this.xAxis = xAxis;
      this.yAxis = yAxis;
      this.left = left;
      this.right = WIDTH - RIGHT_MARGIN;
      this.top = top;
      this.bottom = top + PLOT_HEIGHT;
    }

    /**
     * Opens the panel, or returns null when the ranges cannot be given round ticks. The axes span
     * the data (y with a little room above and below); the ticks are Heckbert's loose labelling of
     * that span, keeping those that fall inside it.
     */
    static Canvas open(PanelLabels labels, Range xs, Range ys, List<String> legend) {
      Axis xAxis = Axis.of(xs.min, xs.max, 0.0);
      Axis yAxis = Axis.of(ys.min, ys.max, 0.05);
      if (xAxis == null || yAxis == null) {
        return null;
      }
      int widestTick = 0;
      for (double t : yAxis.ticks) {
        widestTick = Math.max(widestTick, yAxis.scale.label(t).length());
      }
      double left = 12 + widestTick * CHAR_WIDTH + (labels.yLabel().isEmpty() ? 0 : 13);
      List<List<String>> rows = legendRows(legend);
      double top = TITLE_BASELINE + 10 + rows.size() * LEGEND_ROW;
      Canvas canvas = new Canvas(xAxis, yAxis, left, top);
      openSvg(canvas.svg, labels, top + PLOT_HEIGHT + (labels.xLabel().isEmpty() ? 18 : 30));
      canvas.legend(rows);
      canvas.axes(labels);
      return canvas;
    }

    private static double itemWidth(String name) {
      return 18 + name.length() * CHAR_WIDTH + 10;
    }

    private static List<List<String>> legendRows(List<String> names) {
      List<List<String>> rows = new ArrayList<>();
      double available = WIDTH - RIGHT_MARGIN - 8;
      List<String> row = new ArrayList<>();
      double used = 0;
      for (String name : names) {
        double w = itemWidth(name);
        if (!row.isEmpty() && used + w > available) {
          rows.add(row);
          row = new ArrayList<>();
          used = 0;
        }
        row.add(name);
        used += w;
      }
      if (!row.isEmpty()) {
        rows.add(row);
      }
      return rows;
    }

    private void legend(List<List<String>> rows) {
      int index = 0;
      for (int r = 0; r < rows.size(); r++) {
        double y = TITLE_BASELINE + 4 + (r + 1) * LEGEND_ROW - 3;
        double x = 8;
        for (String name : rows.get(r)) {
          svg.append("<line x1=\"");
          Markup.coordinate(svg, x).append("\" y1=\"");
          Markup.coordinate(svg, y - 3.5).append("\" x2=\"");
          Markup.coordinate(svg, x + 14).append("\" y2=\"");
          Markup.coordinate(svg, y - 3.5)
              .append("\" stroke=\"")
              .append(Palette.colour(index))
              .append("\" stroke-width=\"2.2\"");
          dashAttribute(Palette.dash(index));
          svg.append("/><text x=\"");
          Markup.coordinate(svg, x + 18).append("\" y=\"");
          Markup.coordinate(svg, y)
              .append("\" font-size=\"")
              .append(TICK_FONT)
              .append("\" fill=\"")
              .append(Palette.MUTED)
              .append("\">")
              .append(Markup.escape(name))
              .append("</text>");
          x += itemWidth(name);
          index++;
        }
      }
    }

    private void axes(PanelLabels labels) {
      svg.append("<g stroke=\"").append(Palette.GRID).append("\" stroke-width=\"0.7\">");
      for (double t : yAxis.ticks) {
        double y = sy(t);
        svg.append("<line x1=\"");
        Markup.coordinate(svg, left).append("\" x2=\"");
        Markup.coordinate(svg, right).append("\" y1=\"");
        Markup.coordinate(svg, y).append("\" y2=\"");
        Markup.coordinate(svg, y).append("\"/>");
      }
      svg.append("</g>");
      svg.append("<g font-size=\"")
          .append(TICK_FONT)
          .append("\" fill=\"")
          .append(Palette.MUTED)
          .append("\">");
      for (double t : yAxis.ticks) {
        svg.append("<text x=\"");
        Markup.coordinate(svg, left - 4).append("\" y=\"");
        Markup.coordinate(svg, sy(t) + 3.2)
            .append("\" text-anchor=\"end\">")
            .append(Markup.escape(yAxis.scale.label(t)))
            .append("</text>");
      }
      for (double t : xAxis.ticks) {
        // Keep the last label inside the panel rather than cut at its edge.
        double half = xAxis.scale.label(t).length() * CHAR_WIDTH / 2;
        svg.append("<text x=\"");
        Markup.coordinate(svg, Math.min(sx(t), WIDTH - 2 - half)).append("\" y=\"");
        Markup.coordinate(svg, bottom + 12)
            .append("\" text-anchor=\"middle\">")
            .append(Markup.escape(xAxis.scale.label(t)))
            .append("</text>");
      }
      if (!labels.xLabel().isEmpty()) {
        svg.append("<text x=\"");
        Markup.coordinate(svg, (left + right) / 2).append("\" y=\"");
        Markup.coordinate(svg, bottom + 25)
            .append("\" text-anchor=\"middle\">")
            .append(Markup.escape(labels.xLabel()))
            .append("</text>");
      }
      if (!labels.yLabel().isEmpty()) {
        double cy = (top + bottom) / 2;
        svg.append("<text transform=\"translate(11 ");
        Markup.coordinate(svg, cy)
            .append(") rotate(-90)\" text-anchor=\"middle\">")
            .append(Markup.escape(labels.yLabel()))
            .append("</text>");
      }
      svg.append("</g>");
      svg.append("<g stroke=\"").append(Palette.MUTED).append("\" stroke-width=\"0.8\">");
      svg.append("<line x1=\"");
      Markup.coordinate(svg, left).append("\" x2=\"");
      Markup.coordinate(svg, left).append("\" y1=\"");
      Markup.coordinate(svg, top).append("\" y2=\"");
      Markup.coordinate(svg, bottom).append("\"/>");
      svg.append("<line x1=\"");
      Markup.coordinate(svg, left).append("\" x2=\"");
      Markup.coordinate(svg, right).append("\" y1=\"");
      Markup.coordinate(svg, bottom).append("\" y2=\"");
      Markup.coordinate(svg, bottom).append("\"/>");
      for (double t : xAxis.ticks) {
        svg.append("<line x1=\"");
        Markup.coordinate(svg, sx(t)).append("\" x2=\"");
        Markup.coordinate(svg, sx(t)).append("\" y1=\"");
        Markup.coordinate(svg, bottom).append("\" y2=\"");
        Markup.coordinate(svg, bottom + 3).append("\"/>");
      }
      svg.append("</g>");
    }

    double pixelsPerX() {
      return (right - left) / (xAxis.high - xAxis.low);
    }

    double sx(double x) {
      return left + (x - xAxis.low) / (xAxis.high - xAxis.low) * (right - left);
    }

    double sy(double y) {
      return bottom - (y - yAxis.low) / (yAxis.high - yAxis.low) * (bottom - top);
    }

    void band(ReferenceBand band) {
      double yHigh = sy(band.high());
      double yLow = sy(band.low());
      svg.append("<rect x=\"");
      Markup.coordinate(svg, left).append("\" y=\"");
      Markup.coordinate(svg, yHigh).append("\" width=\"");
      Markup.coordinate(svg, right - left).append("\" height=\"");
      Markup.coordinate(svg, Math.max(0, yLow - yHigh))
          .append("\" fill=\"")
          .append(Palette.BAND)
          .append("\"/>");
      double yc = sy(band.centre());
      svg.append("<line x1=\"");
      Markup.coordinate(svg, left).append("\" x2=\"");
      Markup.coordinate(svg, right).append("\" y1=\"");
      Markup.coordinate(svg, yc).append("\" y2=\"");
      Markup.coordinate(svg, yc)
          .append("\" stroke=\"")
          .append(Palette.MUTED)
          .append("\" stroke-width=\"0.8\" stroke-dasharray=\"3 2\"/>");
    }

    void bar(double x, double height, double width, String colour) {
      double y0 = sy(0);
      double y1 = sy(height);
      svg.append("<rect x=\"");
      Markup.coordinate(svg, sx(x) - width / 2).append("\" y=\"");
      Markup.coordinate(svg, Math.min(y0, y1)).append("\" width=\"");
      Markup.coordinate(svg, width).append("\" height=\"");
      Markup.coordinate(svg, Math.max(0.6, Math.abs(y1 - y0)))
          .append("\" fill=\"")
          .append(colour)
          .append("\"/>");
    }

    /** A filled histogram column over {@code [from, to]}, outlined. */
    void column(double from, double to, double height) {
      double y0 = sy(0);
      double y1 = sy(height);
      svg.append("<rect x=\"");
      Markup.coordinate(svg, sx(from)).append("\" y=\"");
      Markup.coordinate(svg, Math.min(y0, y1)).append("\" width=\"");
      Markup.coordinate(svg, Math.max(0.5, sx(to) - sx(from))).append("\" height=\"");
      Markup.coordinate(svg, Math.abs(y1 - y0))
          .append("\" fill=\"")
          .append(Palette.BAND)
          .append("\" stroke=\"")
          .append(Palette.MUTED)
          .append("\" stroke-width=\"0.5\"/>");
    }

    /** An upright line across the plot at {@code x}. */
    void upright(double x, String colour) {
      svg.append("<line x1=\"");
      Markup.coordinate(svg, sx(x)).append("\" x2=\"");
      Markup.coordinate(svg, sx(x)).append("\" y1=\"");
      Markup.coordinate(svg, top).append("\" y2=\"");
      Markup.coordinate(svg, bottom)
          .append("\" stroke=\"")
          .append(colour)
          .append("\" stroke-width=\"2\"/>");
    }

    void polyline(List<double[]> points, String colour, String dash, double strokeWidth) {
      if (points.size() == 1) {
        svg.append("<circle cx=\"");
        Markup.coordinate(svg, sx(points.get(0)[0])).append("\" cy=\"");
        Markup.coordinate(svg, sy(points.get(0)[1]))
            .append("\" r=\"1.8\" fill=\"")
            .append(colour)
            .append("\"/>");
        return;
      }
      svg.append("<polyline fill=\"none\" stroke=\"")
          .append(colour)
          .append("\" stroke-width=\"")
          .append(strokeWidth)
          .append("\" stroke-linejoin=\"round\"");
      dashAttribute(dash);
      svg.append(" points=\"");
      for (int i = 0; i < points.size(); i++) {
        if (i > 0) {
          svg.append(' ');
        }
        Markup.coordinate(svg, sx(points.get(i)[0])).append(',');
        Markup.coordinate(svg, sy(points.get(i)[1]));
      }
      svg.append("\"/>");
    }

    void dots(double[] x, double[] y, String colour) {
      svg.append("<g fill=\"").append(colour).append("\" fill-opacity=\"0.35\">");
      for (int i = 0; i < x.length; i++) {
        if (Double.isFinite(x[i]) && Double.isFinite(y[i])) {
          svg.append("<circle cx=\"");
          Markup.coordinate(svg, sx(x[i])).append("\" cy=\"");
          Markup.coordinate(svg, sy(y[i])).append("\" r=\"1.4\"/>");
        }
      }
      svg.append("</g>");
    }

    private void dashAttribute(String dash) {
      if (!dash.isEmpty()) {
        svg.append(" stroke-dasharray=\"").append(dash).append('"');
      }
    }

    String close() {
      return svg.append("</svg>").toString();
    }
  }
}

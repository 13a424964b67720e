package org.hullbound.report;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * One interval plot per indexed unknown (e.g. {@code effect[1]} .. {@code effect[36]}): every
 * element's mean as a dot and its central interval as a line, one row per element on a shared
 * axis, so the elements can be compared at a glance.
 *
 * <p>Each plot is rendered twice, in index order and sorted by mean, and a checkbox shows one or
 * the other through CSS alone (the page carries no script); {@link ReportOptions#sortByMean()}
 * sets which one shows first. Rows shrink for long vectors (labels are left out below 10 units a
 * row), so a vector of thousands of elements stays a few hundred kilobytes.
 */
final class IndexedIntervals {
  private static final Pattern INDEXED = Pattern.compile("^(.+?)\\[[^\\]]+\\]$");
  private static final double WIDTH = 640;
  private static final double RIGHT = 14;
  private static final double TOP = 10;
  private static final double AXIS = 26;
  private static final double CHAR_WIDTH = 6.2;
  private static final double TALL = 12;
  private static final double LABELLED = 10;
  /** The most height a plot takes before its rows shrink below {@link #TALL}. */
  private static final double MAX_ROWS_HEIGHT = 900;

  private IndexedIntervals() {}

  /** The indexed unknowns by base name, in table order; each entry holds at least two elements. */
  static Map<String, List<Integer>> groups(List<UnknownReport> unknowns) {
    Map<String, List<Integer>> groups = new LinkedHashMap<>();
    for (int i = 0; i < unknowns.size(); i++) {
      Matcher m = INDEXED.matcher(unknowns.get(i).name());
      if (m.matches()) {
        groups.computeIfAbsent(m.group(1), k -> new ArrayList<>()).add(i);
      }
    }
    groups.values().removeIf(members -> members.size() < 2);
    return groups;
  }

  /** The section of interval plots, or nothing when no unknown is indexed. */
  static void section(StringBuilder html, ReportInput input) {
    Map<String, List<Integer>> groups = groups(input.unknowns());
    if (groups.isEmpty()) {
      return;
    }
    ReportOptions options = input.options();
    String level = CentralInterval.percent(options.intervalLevel());
    html.append("<section id=\"intervals\"><h2>Intervals of indexed unknowns</h2>")
        .append("<p class=\"lead\">One row per element: the dot is the mean, the line the ")
        .append(level)
        .append(" central interval. Tick the box to sort the rows by mean.</p>\n");
    int k = 0;
    for (Map.Entry<String, List<Integer>> group : groups.entrySet()) {
      List<String> names = new ArrayList<>();
      List<double[]> rows = new ArrayList<>();
      for (int index : group.getValue()) {
        UnknownReport u = input.unknowns().get(index);
        CentralInterval interval = u.interval(options.intervalLevel());
        names.add(u.name());
        rows.add(new double[] {u.summary().mean(), interval.lower(), interval.upper()});
      }
      List<Integer> byIndex = new ArrayList<>();
      for (int i = 0; i < rows.size(); i++) {
        byIndex.add(i);
      }
      List<Integer> byMean = new ArrayList<>(byIndex);
      // NaN means sort last, so the undefined rows gather at the bottom.
      byMean.sort(Comparator.comparingDouble(i -> Double.isNaN(rows.get(i)[0])
          ? Double.POSITIVE_INFINITY : rows.get(i)[0]));
      String id = "sort" + k++;
      html.append("<div class=\"interval-plot\" id=\"iv-")
          .append(id)
          .append("\"><h3>")
          .append(Markup.escape(group.getKey()))
          .append(" (")
          .append(rows.size())
          .append(" elements)</h3><input type=\"checkbox\" id=\"")
          .append(id)
          .append('"')
          .append(options.sortByMean() ? " checked=\"checked\"" : "")
          .append("/><label for=\"")
          .append(id)
          .append("\"> sorted by mean</label><div class=\"by-index\">")
          .append(svg(group.getKey(), names, rows, byIndex, level))
          .append("</div><div class=\"by-mean\">")
          .append(svg(group.getKey(), names, rows, byMean, level))
          .append("</div></div>\n");
    }
    html.append("</section>\n");
  }

  /**
   * One interval plot: rows in {@code order}, each {@code {mean, lower, upper}}; rows with a NaN
   * end are left empty.
   */
  static String svg(
      String base, List<String> names, List<double[]> rows, List<Integer> order, String level) {
    double min = Double.POSITIVE_INFINITY;
    double max = Double.NEGATIVE_INFINITY;
    int widest = 0;
    for (int i = 0; i < rows.size(); i++) {
      double[] r = rows.get(i);
      if (Double.isFinite(r[1]) && Double.isFinite(r[2])) {
        min = Math.min(min, r[1]);
        max = Math.max(max, r[2]);
      }
      widest = Math.max(widest, names.get(i).length());
    }
    double rowHeight = Math.min(TALL, Math.max(1, MAX_ROWS_HEIGHT / rows.size()));
    boolean labelled = rowHeight >= LABELLED;
    double left = labelled ? 10 + Math.min(widest, 24) * CHAR_WIDTH : 16;
    double height = TOP + rows.size() * rowHeight + AXIS;
    StringBuilder svg = new StringBuilder(128 * rows.size() + 1024);
    svg.append("<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"plot plot-intervals\" ")
        .append("viewBox=\"0 0 ")
        .append((int) WIDTH)
        .append(' ')
        .append((int) Math.ceil(height))
        .append("\" role=\"img\" font-family=\"system-ui, sans-serif\"><title>")
        .append(Markup.escape(base + ": mean and " + level + " interval per element"))
        .append("</title>");
    NiceScale scale = null;
    if (min <= max && Double.isFinite(max - min)) {
      try {
        scale = NiceScale.of(min, max, 6);
      } catch (IllegalArgumentException tooWide) {
        scale = null;
      }
    }
    if (scale == null) {
      return svg.append("<text x=\"10\" y=\"20\" font-size=\"11\" fill=\"")
          .append(Palette.MUTED)
          .append("\">no finite intervals to draw</text></svg>")
          .toString();
    }
    double low = Math.min(min, scale.low());
    double high = Math.max(max, scale.high());
    double plotWidth = WIDTH - RIGHT - left;
    double bottom = TOP + rows.size() * rowHeight;
    for (double t : scale.ticks()) {
      double x = left + (t - low) / (high - low) * plotWidth;
      svg.append("<line x1=\"");
      Markup.coordinate(svg, x).append("\" x2=\"");
      Markup.coordinate(svg, x).append("\" y1=\"").append((int) TOP).append("\" y2=\"");
      Markup.coordinate(svg, bottom)
          .append("\" stroke=\"")
          .append(Palette.GRID)
          .append("\" stroke-width=\"0.8\"/><text x=\"");
      Markup.coordinate(svg, x).append("\" y=\"");
      Markup.coordinate(svg, bottom + 14)
          .append("\" font-size=\"10.5\" text-anchor=\"middle\" fill=\"")
          .append(Palette.MUTED)
          .append("\">")
          .append(Markup.escape(scale.label(t)))
          .append("</text>");
    }
    double stroke = Math.max(0.6, Math.min(1.6, rowHeight * 0.35));
    double radius = Math.max(0.8, Math.min(2.8, rowHeight * 0.3));
    svg.append("<g stroke=\"").append(Palette.ACCENT).append("\" stroke-width=\"");
    Markup.coordinate(svg, stroke).append("\" fill=\"").append(Palette.ACCENT).append("\">");
    for (int k = 0; k < order.size(); k++) {
      double[] r = rows.get(order.get(k));
      double y = TOP + (k + 0.5) * rowHeight;
      if (Double.isFinite(r[1]) && Double.isFinite(r[2])) {
        svg.append("<line x1=\"");
        Markup.coordinate(svg, left + (r[1] - low) / (high - low) * plotWidth).append("\" x2=\"");
        Markup.coordinate(svg, left + (r[2] - low) / (high - low) * plotWidth).append("\" y1=\"");
        Markup.coordinate(svg, y).append("\" y2=\"");
        Markup.coordinate(svg, y).append("\"/>");
      }
      if (Double.isFinite(r[0])) {
        svg.append("<circle cx=\"");
        Markup.coordinate(svg, left + (r[0] - low) / (high - low) * plotWidth).append("\" cy=\"");
        Markup.coordinate(svg, y).append("\" r=\"");
        Markup.coordinate(svg, radius).append("\"/>");
      }
    }
    svg.append("</g>");
    if (labelled) {
      svg.append("<g font-size=\"10.5\" text-anchor=\"end\" fill=\"")
          .append(Palette.INK)
          .append("\" stroke=\"none\">");
      for (int k = 0; k < order.size(); k++) {
        String name = names.get(order.get(k));
        svg.append("<text x=\"");
        Markup.coordinate(svg, left - 6).append("\" y=\"");
        Markup.coordinate(svg, TOP + (k + 0.5) * rowHeight + 3.5)
            .append("\">")
            .append(Markup.escape(name.length() > 24 ? name.substring(0, 23) + "\u2026" : name))
            .append("</text>");
      }
      svg.append("</g>");
    }
    return svg.append("</svg>").toString();
  }
}

package org.hullbound.validation;

import java.util.Locale;
import org.apache.commons.math3.distribution.BinomialDistribution;

/**
 * One unknown's rank histogram as a small standalone SVG: a bar per bin, the expected count as a
 * line, and the band within which each bin's count falls with probability 0.99 when the ranks are
 * uniform (binomial(N, 1/B) quantiles 0.005 and 0.995, as Talts et al. 2018 draw it).
 *
 * <p>Why: a uniformity p-value says whether, the picture says how: a U shape is a posterior too
 * narrow, a hump one too wide, a slope a bias.
 */
final class RankHistogramSvg {
  private static final int WIDTH = 520;
  private static final int HEIGHT = 280;
  private static final int LEFT = 56;
  private static final int RIGHT = 16;
  private static final int TOP = 40;
  private static final int BOTTOM = 44;

  private RankHistogramSvg() {}

  static String of(RankUniformity test, int replicates, int draws) {
    int[] counts = test.counts();
    int bins = counts.length;
    double expected = replicates / (double) bins;
    BinomialDistribution uniform = new BinomialDistribution(null, replicates, 1.0 / bins);
    int low = uniform.inverseCumulativeProbability(0.005);
    int high = uniform.inverseCumulativeProbability(0.995);
    int max = high;
    for (int c : counts) {
      max = Math.max(max, c);
    }
    double top = Math.max(1, Math.ceil(max * 1.1));
    double plotWidth = WIDTH - LEFT - RIGHT;
    double plotHeight = HEIGHT - TOP - BOTTOM;
    StringBuilder svg = new StringBuilder();
    svg.append(String.format(Locale.ROOT,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%d\" height=\"%d\" viewBox=\"0 0 %d %d\""
            + " font-family=\"sans-serif\" font-size=\"12\">%n", WIDTH, HEIGHT, WIDTH, HEIGHT));
    svg.append(String.format(Locale.ROOT,
        "  <rect x=\"0\" y=\"0\" width=\"%d\" height=\"%d\" fill=\"#ffffff\"/>%n", WIDTH, HEIGHT));
    svg.append(String.format(Locale.ROOT,
        "  <text x=\"%d\" y=\"22\" font-size=\"14\" font-weight=\"bold\">%s</text>%n", LEFT,
        escape("ranks of " + test.label())));
    svg.append(String.format(Locale.ROOT,
        "  <text x=\"%d\" y=\"22\" text-anchor=\"end\" fill=\"#444444\">chi-square p = %s</text>%n",
        WIDTH - RIGHT, pValueText(test.pValue())));
    // The 99% band of a uniform histogram, then the expected count.
    double bandTop = TOP + plotHeight * (1 - high / top);
    double bandBottom = TOP + plotHeight * (1 - low / top);
    svg.append(String.format(Locale.ROOT,
        "  <rect x=\"%d\" y=\"%.2f\" width=\"%.2f\" height=\"%.2f\" fill=\"#e4e4e4\"/>%n", LEFT,
        bandTop, plotWidth, bandBottom - bandTop));
    double barWidth = plotWidth / bins;
    for (int b = 0; b < bins; b++) {
      double h = plotHeight * counts[b] / top;
      boolean outside = counts[b] < low || counts[b] > high;
      svg.append(String.format(Locale.ROOT,
          "  <rect x=\"%.2f\" y=\"%.2f\" width=\"%.2f\" height=\"%.2f\" fill=\"%s\"/>%n",
          LEFT + b * barWidth + 1, TOP + plotHeight - h, Math.max(barWidth - 2, 0.5), h,
          outside ? "#c0504d" : "#4f81bd"));
    }
    double expectedY = TOP + plotHeight * (1 - expected / top);
    svg.append(String.format(Locale.ROOT,
        "  <line x1=\"%d\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\" stroke=\"#222222\" stroke-dasharray=\"5 3\"/>%n",
        LEFT, expectedY, LEFT + plotWidth, expectedY));
    // Axes and their labels.
    svg.append(String.format(Locale.ROOT,
        "  <line x1=\"%d\" y1=\"%d\" x2=\"%d\" y2=\"%.2f\" stroke=\"#222222\"/>%n", LEFT, TOP, LEFT, TOP + plotHeight));
    svg.append(String.format(Locale.ROOT,
        "  <line x1=\"%d\" y1=\"%.2f\" x2=\"%.2f\" y2=\"%.2f\" stroke=\"#222222\"/>%n", LEFT,
        TOP + plotHeight, LEFT + plotWidth, TOP + plotHeight));
    for (double tick : new double[] {0, Math.round(expected), top}) {
      double y = TOP + plotHeight * (1 - tick / top);
      svg.append(String.format(Locale.ROOT,
          "  <text x=\"%d\" y=\"%.2f\" text-anchor=\"end\">%d</text>%n", LEFT - 6, y + 4, (long) tick));
    }
    svg.append(String.format(Locale.ROOT,
        "  <text x=\"%d\" y=\"%.2f\">0</text>%n", LEFT, TOP + plotHeight + 16));
    svg.append(String.format(Locale.ROOT,
        "  <text x=\"%.2f\" y=\"%.2f\" text-anchor=\"end\">%d</text>%n", LEFT + plotWidth,
        TOP + plotHeight + 16, draws));
    svg.append(String.format(Locale.ROOT,
        "  <text x=\"%.2f\" y=\"%d\" text-anchor=\"middle\" fill=\"#444444\">rank among %d posterior draws,"
            + " %d bins; band: 99%% range if uniform</text>%n",
        LEFT + plotWidth / 2, HEIGHT - 10, draws, bins));
    svg.append(String.format(Locale.ROOT,
        "  <text x=\"14\" y=\"%.2f\" transform=\"rotate(-90 14 %.2f)\" text-anchor=\"middle\""
            + " fill=\"#444444\">replicates</text>%n", TOP + plotHeight / 2, TOP + plotHeight / 2));
    svg.append("</svg>\n");
    return svg.toString();
  }

  static String pValueText(double p) {
    return p < 1e-4 ? String.format(Locale.ROOT, "%.1e", p) : String.format(Locale.ROOT, "%.4f", p);
  }

  private static String escape(String text) {
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
  }
}

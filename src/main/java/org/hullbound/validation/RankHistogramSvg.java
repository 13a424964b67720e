package org.hullbound.validation;

import java.util.List;
import java.util.Locale;
import java.util.Optional;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.hullbound.report.PanelLabels;
import org.hullbound.report.ReferenceBand;
import org.hullbound.report.SvgPlot;

/**
 * One unknown's rank histogram as a standalone SVG panel of the report package ({@link
 * SvgPlot#steps}): the counts per bin as steps, the expected count as a dashed line, and behind
 * them the band within which each bin's count falls with probability 0.99 when the ranks are
 * uniform (binomial(N, 1/B) quantiles 0.005 and 0.995, as Talts et al. 2018 draw it).
 *
 * <p>Why: a uniformity p-value says whether, the picture says how: a U shape is a posterior too
 * narrow, a hump one too wide, a slope a bias.
 */
final class RankHistogramSvg {
  private RankHistogramSvg() {}

  static String of(RankUniformity test, int replicates, int draws) {
    int[] counts = test.counts();
    int bins = counts.length;
    int width = (draws + 1) / bins;
    double[] edges = new double[bins + 1];
    double[] heights = new double[bins];
    for (int b = 0; b <= bins; b++) {
      edges[b] = b * width;
    }
    for (int b = 0; b < bins; b++) {
      heights[b] = counts[b];
    }
    BinomialDistribution uniform = new BinomialDistribution(null, replicates, 1.0 / bins);
    ReferenceBand band =
        new ReferenceBand(
            uniform.inverseCumulativeProbability(0.005), replicates / (double) bins,
            uniform.inverseCumulativeProbability(0.995));
    PanelLabels labels =
        new PanelLabels(
            "calibration-ranks",
            "ranks of " + test.label() + " (chi-square p = " + pValueText(test.pValue()) + ")",
            "rank (0 .. " + draws + "), " + bins + " bins; band: 99% if uniform",
            "replicates");
    return SvgPlot.steps(labels, edges, List.of(heights), List.of(), Optional.of(band));
  }

  static String pValueText(double p) {
    return p < 1e-4 ? String.format(Locale.ROOT, "%.1e", p) : String.format(Locale.ROOT, "%.4f", p);
  }
}

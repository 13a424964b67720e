package org.hullbound.report;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.VariableSummary;

/**
 * Scatter plots of the draws of the most correlated pairs of unknowns, with a plain-words hint
 * when a strong correlation is what slows a chain.
 *
 * <p>A single-site Gibbs sampler moves along one axis at a time, so two unknowns with a posterior
 * correlation near one make it crawl along a narrow ridge (common practice; e.g. Gelfand, Sahu and
 * Carlin 1995 on centring). The correlation is Pearson's, of all draws pooled, computed only among
 * the plotted unknowns (the plot cap) so a fit of thousands of unknowns does not spend quadratic
 * time here. Each scatter shows at most {@link #MAX_POINTS} draws, every k-th of the pooled draws.
 */
final class PairPlots {
  /** The number of pairs shown. */
  static final int PAIRS = 3;

  /** The most points in one scatter. */
  static final int MAX_POINTS = 800;

  /** A correlation above this in absolute value gets the hint. */
  static final double STRONG = 0.9;

  private PairPlots() {}

  /** Two unknowns (indices into the input's list) and the correlation of their draws. */
  record Pair(int first, int second, double correlation) {}

  /** Whether the page will show a pairs section. */
  static boolean hasPairs(ReportInput input) {
    return !strongest(input).isEmpty();
  }

  /** The {@link #PAIRS} pairs of largest absolute correlation among the plotted unknowns. */
  static List<Pair> strongest(ReportInput input) {
    List<UnknownReport> unknowns = input.unknowns();
    int cap = Math.min(input.options().plotCap(), unknowns.size());
    List<Integer> usable = new ArrayList<>();
    List<double[]> centred = new ArrayList<>();
    for (int i = 0; i < cap; i++) {
      Draws d = unknowns.get(i).draws();
      if (d.isFinite() && !d.isConstant() && d.totalCount() >= 3) {
        usable.add(i);
        centred.add(standardised(d.pooled()));
      }
    }
    List<Pair> pairs = new ArrayList<>();
    for (int a = 0; a < usable.size(); a++) {
      for (int b = a + 1; b < usable.size(); b++) {
        double[] x = centred.get(a);
        double[] y = centred.get(b);
        if (x.length != y.length) {
          continue;
        }
        double r = 0;
        for (int i = 0; i < x.length; i++) {
          r += x[i] * y[i];
        }
        if (Double.isFinite(r)) {
          pairs.add(new Pair(usable.get(a), usable.get(b), Math.max(-1, Math.min(1, r))));
        }
      }
    }
    pairs.sort(Comparator.comparingDouble((Pair p) -> -Math.abs(p.correlation())));
    return pairs.subList(0, Math.min(PAIRS, pairs.size()));
  }

  /** Draws centred and scaled to unit length, so a dot product is Pearson's correlation. */
  private static double[] standardised(double[] values) {
    double mean = 0;
    for (int i = 0; i < values.length; i++) {
      mean += values[i] / values.length;
    }
    double max = 0;
    double[] out = new double[values.length];
    for (int i = 0; i < values.length; i++) {
      out[i] = values[i] - mean;
      max = Math.max(max, Math.abs(out[i]));
    }
    // Scaled by the largest deviation first, so squares cannot overflow or underflow.
    double sum = 0;
    for (int i = 0; i < out.length; i++) {
      out[i] /= max;
      sum += out[i] * out[i];
    }
    double norm = Math.sqrt(sum);
    for (int i = 0; i < out.length; i++) {
      out[i] /= norm;
    }
    return out;
  }

  /** The hint for a pair: empty unless the correlation is strong. */
  static String hint(Pair pair, VariableSummary first, VariableSummary second, double minEss) {
    if (Math.abs(pair.correlation()) <= STRONG) {
      return "";
    }
    boolean slow = first.essBulk() < minEss || second.essBulk() < minEss;
    String r = NumberText.fixed(pair.correlation(), 2);
    if (slow) {
      return "A correlation of "
          + r
          + " is likely what slows these chains: the sampler moves one unknown at a time along"
          + " a narrow ridge. Reparametrise (e.g. write the one as an offset from the other) or"
          + " centre a covariate.";
    }
    return "A correlation of " + r + ", but both unknowns still reached the effective sample"
        + " size asked for.";
  }

  /** The pairs section, or nothing when fewer than two unknowns can be compared. */
  static void section(StringBuilder html, ReportInput input) {
    List<Pair> pairs = strongest(input);
    if (pairs.isEmpty()) {
      return;
    }
    html.append("<section id=\"pairs\"><h2>Most correlated pairs</h2><p class=\"lead\">")
        .append("The ")
        .append(pairs.size() == 1 ? "pair" : pairs.size() + " pairs")
        .append(" of plotted unknowns whose draws are most correlated (Pearson, all chains")
        .append(" pooled), at most ")
        .append(MAX_POINTS)
        .append(" draws each.</p><div class=\"pairs\">");
    for (Pair pair : pairs) {
      UnknownReport a = input.unknowns().get(pair.first());
      UnknownReport b = input.unknowns().get(pair.second());
      double[] x = a.draws().pooled();
      double[] y = b.draws().pooled();
      int step = Math.max(1, (x.length + MAX_POINTS - 1) / MAX_POINTS);
      int n = (x.length + step - 1) / step;
      double[] tx = new double[n];
      double[] ty = new double[n];
      for (int i = 0; i < n; i++) {
        tx[i] = x[i * step];
        ty[i] = y[i * step];
      }
      String title = a.name() + " and " + b.name();
      html.append("<figure class=\"pair-plot\">")
          .append(SvgPlot.scatter(new PanelLabels("pair", title, a.name(), b.name()), tx, ty))
          .append("<figcaption>correlation ")
          .append(NumberText.fixed(pair.correlation(), 2));
      String hint = hint(pair, a.summary(), b.summary(), input.options().minEss());
      if (!hint.isEmpty()) {
        html.append("<br/><span class=\"hint\">").append(Markup.escape(hint)).append("</span>");
      }
      html.append("</figcaption></figure>");
    }
    html.append("</div></section>\n");
  }
}

package org.hullbound.report;

import java.util.Optional;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.VariableSummary;

/**
 * The one-line plain-words answers that head the four question blocks of an unknown's card, each
 * computed from the numbers shown under it.
 *
 * <p>The questions are those a reader brings to a fit: where is the unknown, did the chains agree,
 * how fast did the chain move, and what did the draws cost. The answer comes first so a reader who
 * trusts the numbers need not read the plots.
 */
final class Answers {
  /** Autocorrelation below this counts as gone (common practice for reading a correlogram). */
  static final double SMALL_AUTOCORRELATION = 0.1;

  private Answers() {}

  /** "Mean 1.234 ± 0.0051 (MCSE); 95% of the draws lie between 0.9 and 1.6." */
  static String where(VariableSummary s, CentralInterval interval) {
    if (Double.isNaN(s.mean()) || Double.isNaN(interval.lower())) {
      return "No estimate: some draws are NaN or infinite.";
    }
    return "Mean "
        + NumberText.significant(s.mean(), 4)
        + (Double.isNaN(s.mcseMean()) ? "" : " \u00b1 " + NumberText.significant(s.mcseMean(), 2))
        + " (MCSE); "
        + interval.percent()
        + " of the draws lie between "
        + NumberText.significant(interval.lower(), 4)
        + " and "
        + NumberText.significant(interval.upper(), 4)
        + ".";
  }

  /**
   * Whether the chains agree: the largest distance of a chain's mean from the pooled mean, in
   * units of the pooled mean's MCSE, and R-hat against its limit.
   */
  static String agreement(VariableSummary s, double[] chainMeans, double maxRhat) {
    if (chainMeans.length < 2) {
      return "One chain: there is nothing to compare it with; run several chains to check.";
    }
    if (Double.isNaN(s.rhat()) || Double.isNaN(s.mean())) {
      return "Not judged: R-hat is not defined for these draws.";
    }
    double furthest = 0;
    for (double m : chainMeans) {
      furthest = Math.max(furthest, Math.abs(m - s.mean()));
    }
    String spread =
        s.mcseMean() > 0
            ? "the "
                + chainMeans.length
                + " chains\u2019 means lie within "
                + NumberText.significant(furthest / s.mcseMean(), 2)
                + " MCSE of the pooled mean"
            : "the " + chainMeans.length + " chains\u2019 means differ by up to "
                + NumberText.significant(furthest, 3);
    String rhat = "R-hat " + NumberText.fixed(s.rhat(), 3);
    if (s.rhat() > maxRhat) {
      return "Not yet: "
          + rhat
          + " is above "
          + plain(maxRhat)
          + " and "
          + spread
          + "; run longer or look at the rank lines below.";
    }
    return "Yes: " + spread + "; " + rhat + ".";
  }

  /** How fast the chain moved: bulk-ESS per 100 draws and the first lag of small autocorrelation. */
  static String speed(VariableSummary s, Optional<double[]> autocorrelation, double minEss) {
    if (Double.isNaN(s.essBulk())) {
      return "Not judged: the effective sample size is not defined for these draws.";
    }
    long total = (long) s.chains() * s.drawsPerChain();
    StringBuilder line = new StringBuilder();
    line.append(s.essBulk() < minEss ? "Slowly: " : "")
        .append("bulk-ESS ")
        .append(NumberText.count(s.essBulk()))
        .append(" from ")
        .append(total)
        .append(" draws (")
        .append(NumberText.significant(100 * s.essBulk() / total, 2))
        .append(" per 100)");
    autocorrelation.ifPresent(
        rho -> {
          int lag = -1;
          for (int t = 1; t < rho.length; t++) {
            if (Math.abs(rho[t]) < SMALL_AUTOCORRELATION) {
              lag = t;
              break;
            }
          }
          line.append(
              lag > 0
                  ? "; the autocorrelation falls below 0.1 by lag " + lag
                  : "; the autocorrelation stays above 0.1 to lag " + (rho.length - 1));
        });
    if (s.essBulk() < minEss) {
      line.append("; below the ").append(plain(minEss)).append(" a stable summary needs");
    }
    return line.append('.').toString();
  }

  /** What the draws cost: the update, evaluations per draw and per effective draw. */
  static String cost(VariableSummary s, Optional<UpdateFacts> update) {
    if (update.isEmpty()) {
      return "Not recorded: these draws came without update facts.";
    }
    UpdateFacts f = update.get();
    if (f.isDerived()) {
      return "Not drawn: a let quantity, computed from the unknowns at each kept draw.";
    }
    StringBuilder line = new StringBuilder("Drawn by ").append(f.update());
    switch (f.fallback()) {
      case CHOSEN -> line.append(" (a fallback, chosen before the run)");
      case SWITCHED_DURING_RUN ->
          line.append(" (switched to this fallback")
              .append(f.switchSweep() > 0 ? " at sweep " + f.switchSweep() : "")
              .append(')');
      default -> {}
    }
    double e = f.evaluationsPerDraw();
    if (Double.isNaN(e)) {
      return line.append("; evaluations not counted.").toString();
    }
    if (e == 0) {
      return line.append(": a direct draw, no density evaluations.").toString();
    }
    line.append(": ").append(NumberText.significant(e, 3)).append(" density evaluations per draw");
    long total = (long) s.chains() * s.drawsPerChain();
    if (s.essBulk() > 0) {
      line.append(", about ")
          .append(NumberText.significant(e * total / s.essBulk(), 2))
          .append(" per effective draw");
    }
    return line.append('.').toString();
  }

  /** Each chain's mean of its finite draws (NaN for a chain with none). */
  static double[] chainMeans(Draws draws) {
    double[] means = new double[draws.chainCount()];
    for (int c = 0; c < means.length; c++) {
      // A running mean, so draws near the largest doubles cannot overflow a sum.
      double mean = 0;
      int n = 0;
      for (double v : draws.chain(c)) {
        if (Double.isFinite(v)) {
          n++;
          mean += v / n - mean / n;
        }
      }
      means[c] = n == 0 ? Double.NaN : mean;
    }
    return means;
  }

  /** A threshold as typed: 1.01, 400. */
  static String plain(double x) {
    return new java.math.BigDecimal(Double.toString(x)).stripTrailingZeros().toPlainString();
  }
}

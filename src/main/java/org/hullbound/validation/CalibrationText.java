package org.hullbound.validation;

import java.util.Locale;

/**
 * The plain-text account of a calibration: one line per unknown with the chi-square statistic,
 * its degrees of freedom, the p-value and a flag, then a note on testing many unknowns at once.
 */
public final class CalibrationText {
  /** The per-unknown level at which a p-value is flagged. */
  public static final double LEVEL = 0.01;

  private CalibrationText() {}

  public static String of(CalibrationResult result) {
    CalibrationSettings s = result.settings();
    StringBuilder out = new StringBuilder();
    out.append(String.format(Locale.ROOT,
        "Simulation-based calibration of %s: %d replicates, ranks among %d draws (thinned by %d,"
            + " after %d burn-in), %d bins, seed %d%n%n",
        result.modelName(), s.replicates(), s.draws(), s.thin(), s.burnIn(), s.binCount(), s.seed()));
    int width = Math.max(8, result.labels().stream().mapToInt(String::length).max().orElse(8));
    out.append(String.format(Locale.ROOT, "  %-" + width + "s %12s %4s %10s  %s%n",
        "unknown", "chi-square", "df", "p-value", "ranks uniform?"));
    int flagged = 0;
    for (RankUniformity test : result.tests()) {
      boolean low = test.pValue() < LEVEL;
      flagged += low ? 1 : 0;
      out.append(String.format(Locale.ROOT, "  %-" + width + "s %12.2f %4d %10s  %s%n",
          test.label(), test.chiSquare(), test.degreesOfFreedom(), RankHistogramSvg.pValueText(test.pValue()),
          low ? "NO (p < " + LEVEL + ")" : "yes"));
    }
    int m = result.tests().size();
    out.append('\n');
    out.append(String.format(Locale.ROOT,
        "Note: %d unknown%s tested at once. With exact sampling each p-value is uniform, so about"
            + " %s of them fall below %s by chance; for a verdict on the whole model compare the"
            + " smallest p-value (%s) with %s / %d = %s (Bonferroni).%n",
        m, m == 1 ? "" : "s", percent(LEVEL), LEVEL, RankHistogramSvg.pValueText(result.smallestPValue()),
        LEVEL, m, number(LEVEL / m)));
    out.append(result.passes(LEVEL)
        ? "Verdict: no sign of miscalibration at family-wise level " + LEVEL + ".\n"
        : "Verdict: the ranks are not uniform at family-wise level " + LEVEL
            + " (" + flagged + " unknown" + (flagged == 1 ? "" : "s") + " flagged); see the histograms.\n");
    return out.toString();
  }

  /** A share as a whole percentage where it is one ({@code 1%}), else with its digits. */
  private static String percent(double share) {
    double percent = 100 * share;
    return (percent == Math.rint(percent)
        ? Long.toString(Math.round(percent)) : String.format(Locale.ROOT, "%.3g", percent)) + "%";
  }

  private static String number(double v) {
    return String.format(Locale.ROOT, "%.3g", v);
  }
}

package org.hullbound.report;

/**
 * How much the report draws and what it marks: how many unknowns get plots, how fine each plot is,
 * and the thresholds above or below which table cells are marked.
 *
 * <p>The defaults keep a report of hundreds of unknowns to a few megabytes while every plot still
 * shows what matters; a caller may raise the plot cap to see more. The marking thresholds default
 * to those of {@link Verdicts}, so marks and verdict lines agree; a caller who judges with other
 * thresholds passes the same ones here.
 *
 * @param plotCap the first this many unknowns get plots, the rest appear in the table only
 * @param maxTracePoints the most points a trace keeps per chain (minimum and maximum per bucket)
 * @param maxLag the largest lag of the autocorrelation plot
 * @param rankBins the most bins of a rank histogram (fewer when there are few draws)
 * @param densityPoints the number of grid points of each density curve
 * @param maxRhat R-hat above this is marked in the table
 * @param minEss bulk or tail ess below this is marked in the table
 * @param intervalLevel the probability of the central intervals shown (0.95 by default)
 * @param sortByMean whether the interval plots of indexed unknowns open sorted by mean (the page
 *     has a toggle either way)
 */
public record ReportOptions(
    int plotCap,
    int maxTracePoints,
    int maxLag,
    int rankBins,
    int densityPoints,
    double maxRhat,
    double minEss,
    double intervalLevel,
    boolean sortByMean) {

  /** Default plot cap: the first 50 unknowns get plots. */
  public static final int DEFAULT_PLOT_CAP = 50;

  /** Default probability of the central intervals. */
  public static final double DEFAULT_INTERVAL_LEVEL = SummaryTable.INTERVAL_LEVEL;

  /** Checks every option against its least sensible value. */
  public ReportOptions {
    if (plotCap < 0) {
      throw new IllegalArgumentException("plotCap must be >= 0, got " + plotCap);
    }
    if (maxTracePoints < 2) {
      throw new IllegalArgumentException("maxTracePoints must be >= 2, got " + maxTracePoints);
    }
    if (maxLag < 1) {
      throw new IllegalArgumentException("maxLag must be >= 1, got " + maxLag);
    }
    if (rankBins < 1) {
      throw new IllegalArgumentException("rankBins must be >= 1, got " + rankBins);
    }
    if (densityPoints < 2) {
      throw new IllegalArgumentException("densityPoints must be >= 2, got " + densityPoints);
    }
    if (!(maxRhat > 1) || Double.isInfinite(maxRhat)) {
      throw new IllegalArgumentException("maxRhat must be finite and > 1, got " + maxRhat);
    }
    if (!(minEss > 0) || Double.isInfinite(minEss)) {
      throw new IllegalArgumentException("minEss must be finite and > 0, got " + minEss);
    }
    if (!(intervalLevel > 0 && intervalLevel < 1)) {
      throw new IllegalArgumentException(
          "intervalLevel must lie strictly between 0 and 1, got " + intervalLevel);
    }
  }

  /**
   * Plots for 50 unknowns, traces of at most 1000 points per chain, lags to 40, at most 20 rank
   * bins, densities on 120 points; marks at the {@link Verdicts} defaults.
   */
  public static ReportOptions defaults() {
    return new ReportOptions(
        DEFAULT_PLOT_CAP,
        1000,
        40,
        20,
        120,
        Verdicts.DEFAULT_MAX_RHAT,
        Verdicts.DEFAULT_MIN_ESS,
        DEFAULT_INTERVAL_LEVEL,
        false);
  }

  /** These options with another plot cap. */
  public ReportOptions withPlotCap(int cap) {
    return new ReportOptions(
        cap, maxTracePoints, maxLag, rankBins, densityPoints, maxRhat, minEss,
        intervalLevel, sortByMean);
  }

  /** These options with another trace point budget. */
  public ReportOptions withMaxTracePoints(int points) {
    return new ReportOptions(
        plotCap, points, maxLag, rankBins, densityPoints, maxRhat, minEss,
        intervalLevel, sortByMean);
  }

  /** These options with other marking thresholds, e.g. those given to {@link Verdicts#of}. */
  public ReportOptions withThresholds(double rhat, double ess) {
    return new ReportOptions(
        plotCap, maxTracePoints, maxLag, rankBins, densityPoints, rhat, ess,
        intervalLevel, sortByMean);
  }

  /** These options with central intervals of probability {@code level}, e.g. 0.9. */
  public ReportOptions withIntervalLevel(double level) {
    return new ReportOptions(
        plotCap, maxTracePoints, maxLag, rankBins, densityPoints, maxRhat, minEss, level,
        sortByMean);
  }

  /** These options with the interval plots opening sorted by mean ({@code true}) or by index. */
  public ReportOptions withSortByMean(boolean sorted) {
    return new ReportOptions(
        plotCap, maxTracePoints, maxLag, rankBins, densityPoints, maxRhat, minEss, intervalLevel,
        sorted);
  }
}

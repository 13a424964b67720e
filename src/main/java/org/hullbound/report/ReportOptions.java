package org.hullbound.report;

/**
 * How much the report draws: how many unknowns get plots, and how fine each plot is.
 *
 * <p>The defaults keep a report of hundreds of unknowns to a few megabytes while every plot still
 * shows what matters; a caller may raise the plot cap to see more.
 *
 * @param plotCap the first this many unknowns get plots, the rest appear in the table only
 * @param maxTracePoints the most points a trace keeps per chain (minimum and maximum per bucket)
 * @param maxLag the largest lag of the autocorrelation plot
 * @param rankBins the most bins of a rank histogram (fewer when there are few draws)
 * @param densityPoints the number of grid points of each density curve
 */
public record ReportOptions(
    int plotCap, int maxTracePoints, int maxLag, int rankBins, int densityPoints) {

  /** Default plot cap: the first 50 unknowns get plots. */
  public static final int DEFAULT_PLOT_CAP = 50;

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
  }

  /** Plots for 50 unknowns, traces of at most 1000 points, lags to 40, 20 rank bins, 120 points. */
  public static ReportOptions defaults() {
    return new ReportOptions(DEFAULT_PLOT_CAP, 1000, 40, 20, 120);
  }

  /** These options with another plot cap. */
  public ReportOptions withPlotCap(int cap) {
    return new ReportOptions(cap, maxTracePoints, maxLag, rankBins, densityPoints);
  }

  /** These options with another trace point budget. */
  public ReportOptions withMaxTracePoints(int points) {
    return new ReportOptions(plotCap, points, maxLag, rankBins, densityPoints);
  }
}

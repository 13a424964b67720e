package org.hullbound.hull;

/**
 * Counters of one adaptive rejection sampler since it was made.
 *
 * <p>They say how well the hull fits: after adaptation almost every proposal should pass the
 * squeeze test without a density evaluation (Gilks and Wild 1992, section 2.3).
 *
 * @param evaluations calls of the log density, including those that built the starting hull
 * @param proposals points drawn from the hull
 * @param squeezeAcceptances proposals accepted by the squeeze test, without an evaluation
 * @param densityAcceptances proposals accepted after evaluating the density
 * @param rejections proposals rejected
 * @param hullSize current number of abscissae
 * @param hullRejections of the rejections, those the hull made itself before evaluating the
 *     density (a proposal above the lower hull of a settled staircase step)
 */
public record SamplerStatistics(
    long evaluations,
    long proposals,
    long squeezeAcceptances,
    long densityAcceptances,
    long rejections,
    int hullSize,
    long hullRejections) {

  /** Draws returned so far. */
  public long draws() {
    return squeezeAcceptances + densityAcceptances;
  }

  /** Density evaluations per returned draw (starting evaluations included); NaN before any draw. */
  public double evaluationsPerDraw() {
    long draws = draws();
    return draws == 0 ? Double.NaN : (double) evaluations / draws;
  }

  /** Share of proposals that were accepted; NaN before any proposal. */
  public double acceptanceRate() {
    return proposals == 0 ? Double.NaN : (double) draws() / proposals;
  }
}

package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.hullbound.diagnostics.Draws;
import org.junit.jupiter.api.Test;

/** The central interval at any level: its ends are the (1 -+ level)/2 quantiles of the draws. */
class CentralIntervalTest {

  @Test
  void theEndsAreTheType7QuantilesOfThePooledDraws() {
    double[][] draws = SampleReports.ar1(7, 3, 801, 1.5, 2.0, 0.4);
    double[] pooled = Draws.of(draws).pooled();
    // Reference: commons-math3 Percentile with R_7 estimation, Hyndman and Fan (1996) type 7.
    Percentile reference = new Percentile().withEstimationType(Percentile.EstimationType.R_7);
    for (double level : new double[] {0.5, 0.8, 0.9, 0.95, 0.99}) {
      CentralInterval interval = CentralInterval.of(Draws.of(draws), level);
      assertEquals(reference.evaluate(pooled, 100 * (1 - level) / 2), interval.lower(), 1e-12);
      assertEquals(reference.evaluate(pooled, 100 * (1 + level) / 2), interval.upper(), 1e-12);
    }
  }

  @Test
  void atTheDefaultLevelTheReportUsesTheSummarysOwnQuantiles() {
    UnknownReport u =
        UnknownReport.of("x", SampleReports.ar1(8, 2, 400, 0, 1, 0.2), null);
    CentralInterval fromDraws = CentralInterval.of(u.draws(), 0.95);
    assertEquals(u.summary().q025(), fromDraws.lower(), 1e-12);
    assertEquals(u.summary().q975(), fromDraws.upper(), 1e-12);
    CentralInterval ninety = u.interval(0.9);
    assertTrue(ninety.lower() > u.summary().q025() && ninety.upper() < u.summary().q975());
  }

  @Test
  void nonFiniteDrawsGiveNaNEnds() {
    CentralInterval interval =
        CentralInterval.of(Draws.of(new double[][] {{1, 2, Double.NaN, 4}}), 0.9);
    assertTrue(Double.isNaN(interval.lower()) && Double.isNaN(interval.upper()));
  }

  @Test
  void theLevelIsWrittenAsAReaderWritesIt() {
    assertEquals("95%", CentralInterval.percent(0.95));
    assertEquals("90%", CentralInterval.percent(0.9));
    assertEquals("99.5%", CentralInterval.percent(0.995));
    assertEquals("50%", CentralInterval.percent(0.5));
  }

  @Test
  void aLevelOutsideZeroToOneIsRefused() {
    Draws d = Draws.of(new double[][] {{1, 2, 3}});
    assertThrows(IllegalArgumentException.class, () -> CentralInterval.of(d, 1.0));
    assertThrows(IllegalArgumentException.class, () -> CentralInterval.of(d, 0.0));
    assertThrows(IllegalArgumentException.class, () -> CentralInterval.of(d, Double.NaN));
    assertThrows(
        IllegalArgumentException.class,
        () -> ReportOptions.defaults().withIntervalLevel(1.5));
  }
}

package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Optional;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.VariableSummary;
import org.junit.jupiter.api.Test;

/** The plain-words answers of the four question blocks follow from the numbers under them. */
class AnswersTest {

  /** A summary with the given mean, MCSE, R-hat and bulk-ESS of 4 x 1000 draws. */
  private static VariableSummary summary(double mean, double mcse, double rhat, double ess) {
    return new VariableSummary(
        "theta", 4, 1000, mean, 1, -1.9, 0, 1.9, rhat, rhat, rhat, ess, ess, ess, mcse, 0.05, 0.04,
        0.05, VariableSummary.State.COMPLETE, List.of());
  }

  @Test
  void whereGivesTheMeanItsMcseAndTheIntervalAtTheLevelAsked() {
    String line =
        Answers.where(summary(0.123456, 0.0042, 1.0, 900), new CentralInterval(0.9, -1.5, 1.75));
    assertEquals("Mean 0.1235 \u00b1 0.0042 (MCSE); 90% of the draws lie between -1.500 and 1.750.",
        line);
  }

  @Test
  void agreementMeasuresTheFurthestChainMeanInMcseOfThePooledMean() {
    // Means 1.00, 1.01, 0.97, 1.02 around the pooled 1.00, MCSE 0.1: furthest 0.03 -> 0.3 MCSE.
    String line =
        Answers.agreement(summary(1.0, 0.1, 1.002, 900), new double[] {1.0, 1.01, 0.97, 1.02},
            1.01);
    assertEquals("Yes: the 4 chains\u2019 means lie within 0.30 MCSE of the pooled mean; R-hat"
        + " 1.002.", line);
  }

  @Test
  void agreementSaysNotYetWhenRhatIsAboveTheLimit() {
    String line =
        Answers.agreement(summary(1.0, 0.1, 1.08, 900), new double[] {0.5, 1.5}, 1.01);
    assertTrue(line.startsWith("Not yet: R-hat 1.080 is above 1.01 and the 2 chains\u2019 means"
        + " lie within 5.0 MCSE"), line);
  }

  @Test
  void oneChainHasNothingToAgreeWith() {
    assertTrue(Answers.agreement(summary(1, 0.1, Double.NaN, 900), new double[] {1}, 1.01)
        .startsWith("One chain"));
  }

  @Test
  void speedGivesEssPerHundredDrawsAndTheFirstLagOfSmallAutocorrelation() {
    double[] rho = {1, 0.5, 0.25, 0.125, 0.0625, 0.03};
    String line = Answers.speed(summary(0, 0.01, 1, 1200), Optional.of(rho), 400);
    assertEquals("bulk-ESS 1200 from 4000 draws (30 per 100); the autocorrelation falls below 0.1"
        + " by lag 4.", line);
    String slow = Answers.speed(summary(0, 0.01, 1, 100), Optional.empty(), 400);
    assertEquals("Slowly: bulk-ESS 100 from 4000 draws (2.5 per 100); below the 400 a stable"
        + " summary needs.", slow);
  }

  @Test
  void costGivesEvaluationsPerDrawAndPerEffectiveDraw() {
    // 4.4 evaluations x 4000 draws / 1100 effective = 16 per effective draw.
    String line =
        Answers.cost(summary(0, 0.01, 1, 1100),
            Optional.of(UpdateFacts.exact("adaptive rejection", 4.4)));
    assertEquals("Drawn by adaptive rejection: 4.40 density evaluations per draw, about 16 per"
        + " effective draw.", line);
    assertEquals("Drawn by conjugate normal: a direct draw, no density evaluations.",
        Answers.cost(summary(0, 0.01, 1, 1100),
            Optional.of(UpdateFacts.exact("conjugate normal", 0))));
    assertTrue(Answers.cost(summary(0, 0.01, 1, 1100),
            Optional.of(UpdateFacts.switchedToFallback("slice", 9, 120)))
        .startsWith("Drawn by slice (switched to this fallback at sweep 120)"));
    assertTrue(Answers.cost(summary(0, 0.01, 1, 1100), Optional.empty()).startsWith("Not"));
  }

  @Test
  void chainMeansLeaveOutNonFiniteDrawsAndDoNotOverflow() {
    double big = Double.MAX_VALUE;
    double[] means =
        Answers.chainMeans(Draws.of(new double[][] {{1, 2, Double.NaN}, {big, big, big}}));
    assertArrayEquals(new double[] {1.5, big}, means, 1e-12 * big);
    assertEquals(1.5, means[0], 1e-15);
  }
}

package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.junit.jupiter.api.Test;

class VerdictsTest {

  private static Verdicts judge(VariableSummary... summaries) {
    return Verdicts.of(SummaryTable.of(List.of(summaries)));
  }

  private static List<Verdict.Kind> kinds(Verdicts verdicts) {
    return verdicts.verdicts().stream().map(Verdict::kind).toList();
  }

  @Test
  void allWellGivesOneOverallLine() {
    Verdicts verdicts = judge(Summaries.fine("a"), Summaries.fine("b"), Summaries.fine("c"));
    assertTrue(verdicts.allWell());
    assertEquals(
        List.of(
            "All 3 unknowns look converged: R-hat at most 1.01, bulk-ESS and tail-ESS at least 400,"
                + " no fallback update."),
        verdicts.lines());
  }

  @Test
  void chainsDisagreeAboveTheRhatThreshold() {
    Verdicts verdicts = judge(Summaries.converged("beta[3]", 1.08, 1.02, 3000, 3000));
    assertEquals(List.of(Verdict.Kind.CHAINS_DISAGREE), kinds(verdicts));
    assertEquals(
        "beta[3]: chains disagree (R-hat 1.080 > 1.01); run longer or check the starting values",
        verdicts.verdicts().get(0).text());
    assertEquals(
        "The unknown needs attention (see above).",
        verdicts.lines().get(1));
  }

  @Test
  void oneChainIsJudgedByItsTwoHalves() {
    // Split R-hat compares the halves of each chain (Gelman et al., Bayesian Data Analysis, 3rd
    // ed., section 11.4), so with one chain it is its halves that disagree.
    double[][] draws = new double[1][40];
    for (int i = 0; i < 40; i++) {
      draws[0][i] = (i < 20 ? 0 : 10) + (i % 5) * 0.1;
    }
    Verdict first = judge(PosteriorSummary.of("mu", draws)).verdicts().get(0);
    assertEquals(Verdict.Kind.CHAINS_DISAGREE, first.kind());
    assertTrue(first.text().startsWith("mu: the two halves of the chain disagree (R-hat "),
        first.text());
  }

  @Test
  void theClosingLineCountsInPlainWords() {
    assertEquals(
        List.of("Both unknowns look converged: R-hat at most 1.01, bulk-ESS and tail-ESS at least"
            + " 400, no fallback update."),
        judge(Summaries.fine("a"), Summaries.fine("b")).lines());
    Verdicts oneOfThree =
        judge(Summaries.fine("a"), Summaries.converged("b", 1.08, 1.0, 3000, 3000),
            Summaries.fine("c"));
    assertEquals("1 of 3 unknowns needs attention (see above); the others look converged.",
        oneOfThree.lines().get(1));
    Verdicts bothBad =
        judge(Summaries.converged("a", 1.08, 1.0, 3000, 3000),
            Summaries.converged("b", 1.08, 1.0, 3000, 3000));
    assertEquals("Both unknowns need attention (see above).", bothBad.lines().get(2));
  }

  @Test
  void derivedQuantitiesAreCountedApartFromTheUnknowns() {
    SummaryTable table =
        SummaryTable.of(
            List.of(Summaries.fine("alpha"), Summaries.fine("beta"), Summaries.fine("ld50")),
            Map.of(
                "alpha", UpdateFacts.exact("adaptive rejection", 2.9),
                "beta", UpdateFacts.exact("adaptive rejection", 2.9),
                "ld50", UpdateFacts.derived()));
    assertEquals(
        "All 3 quantities (2 unknowns, 1 derived) look converged: R-hat at most 1.01, bulk-ESS"
            + " and tail-ESS at least 400, no fallback update.",
        Verdicts.of(table).lines().get(0));
  }

  @Test
  void anUnknownNamedLikeTheWordingStillReadsOnce() {
    // The bulk finding once said "for the centre", which read twice for an unknown called centre.
    String text = judge(Summaries.converged("centre", 1.0, 1.0, 212, 3000)).verdicts().get(0).text();
    assertEquals(1, text.split("centre", -1).length - 1, text);
  }

  @Test
  void theThresholdItselfPassesAndJustAboveShowsEnoughDigits() {
    assertTrue(judge(Summaries.converged("a", 1.01, 1.0, 400, 400)).allWell());
    Verdicts verdicts = judge(Summaries.converged("a", 1.0104, 1.0, 400, 400));
    assertEquals(
        "a: chains disagree (R-hat 1.0104 > 1.01); run longer or check the starting values",
        verdicts.verdicts().get(0).text());
  }

  @Test
  void aScaleOnlyDisagreementIsNamedAsSuch() {
    Verdicts verdicts = judge(Summaries.converged("sigma", 1.001, 1.16, 4000, 3000));
    assertTrue(
        verdicts.verdicts().get(0).text().startsWith("sigma: chains disagree in spread (R-hat 1.160"),
        verdicts.verdicts().get(0).text());
  }

  @Test
  void stuckChainsAreNamedAsSuch() {
    double[][] draws = new double[3][10];
    for (int c = 0; c < 3; c++) {
      Arrays.fill(draws[c], c);
    }
    Verdicts verdicts = judge(PosteriorSummary.of("tau", draws));
    Verdict first = verdicts.verdicts().get(0);
    assertEquals(Verdict.Kind.CHAINS_DISAGREE, first.kind());
    assertTrue(first.text().contains("stuck at different values (R-hat inf > 1.01)"), first.text());
    assertTrue(kinds(verdicts).contains(Verdict.Kind.FEW_BULK_DRAWS));
  }

  @Test
  void fewEffectiveDrawsSayHowMuchLongerToRun() {
    Verdicts verdicts = judge(Summaries.converged("mu", 1.001, 1.001, 212, 399));
    assertEquals(
        List.of(Verdict.Kind.FEW_BULK_DRAWS, Verdict.Kind.FEW_TAIL_DRAWS), kinds(verdicts));
    // 400 / 212 = 1.887, rounded up to 1.9; 400 / 399 = 1.0025, rounded up to 1.1.
    assertEquals(
        "mu: few effective draws in the bulk (bulk-ESS 212 < 400); mean and median are"
            + " imprecise; run about 1.9 times longer",
        verdicts.verdicts().get(0).text());
    assertEquals(
        "mu: few effective draws in the tails (tail-ESS 399 < 400); the 2.5% and 97.5% points are"
            + " imprecise; run about 1.1 times longer",
        verdicts.verdicts().get(1).text());
    assertTrue(
        judge(Summaries.converged("mu", 1.001, 1.001, 12, 1000))
            .verdicts()
            .get(0)
            .text()
            .endsWith("run over 10 times longer or improve mixing"));
  }

  @Test
  void fallbackAndARunTimeSwitchAreReported() {
    SummaryTable table =
        SummaryTable.of(
            List.of(Summaries.fine("a"), Summaries.fine("b"), Summaries.fine("c")),
            Map.of(
                "a", UpdateFacts.exact("adaptive rejection", 4.1),
                "b", UpdateFacts.fallback("ARMS fallback", 9),
                "c", UpdateFacts.switchedToFallback("ARMS fallback", 9, 1234)));
    Verdicts verdicts = Verdicts.of(table);
    assertEquals(
        List.of(Verdict.Kind.FALLBACK_USED, Verdict.Kind.SWITCHED_TO_FALLBACK), kinds(verdicts));
    assertEquals("b", verdicts.verdicts().get(0).unknown());
    assertTrue(verdicts.verdicts().get(0).text().startsWith("b: drawn by ARMS fallback because"));
    assertTrue(
        verdicts.verdicts().get(1).text().startsWith("c: switched to ARMS fallback at sweep 1234"));
    assertEquals(
        "2 of 3 unknowns need attention (see above); the others look converged.",
        verdicts.lines().get(2));
  }

  @Test
  void undefinedSummariesGetTheirOwnVerdicts() {
    double[][] constant = new double[2][8];
    for (double[] chain : constant) {
      Arrays.fill(chain, 2.5);
    }
    double[][] withNaN = {{1, 2, Double.NaN, 4}, {1, 2, 3, 4}};
    Verdicts verdicts =
        judge(
            PosteriorSummary.of("k", constant),
            PosteriorSummary.of("bad", withNaN),
            PosteriorSummary.of("brief", new double[][] {{1, 2}, {3, 4}}));
    assertEquals(
        List.of(Verdict.Kind.CONSTANT, Verdict.Kind.NON_FINITE, Verdict.Kind.TOO_SHORT),
        kinds(verdicts));
    assertTrue(verdicts.verdicts().get(0).text().startsWith("k: every draw equals 2.5,"));
    assertTrue(
        verdicts.verdicts().get(1).text().contains("draw 2 of chain 0 (0-based) is NaN"),
        verdicts.verdicts().get(1).text());
    assertTrue(verdicts.verdicts().get(2).text().startsWith("brief: only 2 draws per chain"));
  }

  @Test
  void twoValuedUnknownsAreJudgedWithoutTailEssAndTheClosingLineSaysSo() {
    double[][] indicator = new double[4][400];
    for (double[] chain : indicator) {
      for (int i = 0; i < chain.length; i++) {
        chain[i] = (i * 7 + 3) % 5 < 2 ? 1 : 0;
      }
    }
    VariableSummary flag = PosteriorSummary.of("flag", indicator);
    assertEquals(VariableSummary.State.TWO_VALUED, flag.state());
    Verdicts verdicts = judge(Summaries.fine("a"), flag);
    assertTrue(verdicts.allWell(), verdicts.lines().toString());
    assertEquals(
        List.of("Both unknowns look converged: R-hat at most 1.01, bulk-ESS and tail-ESS at least"
            + " 400 (flag takes two values only: tail-ESS is not defined there, so it is judged on"
            + " bulk-ESS and R-hat alone), no fallback update."),
        verdicts.lines());
    // A nearly discrete unknown of more values with an undefined tail-ESS is still flagged.
    VariableSummary piled = Summaries.converged("piled", 1.001, 1.001, 3000, Double.NaN);
    assertEquals(List.of(Verdict.Kind.FEW_TAIL_DRAWS), kinds(judge(piled)));
  }

  @Test
  void chosenThresholdsApplyAndAreValidated() {
    VariableSummary s = Summaries.converged("a", 1.03, 1.0, 150, 150);
    assertTrue(Verdicts.of(SummaryTable.of(List.of(s)), 1.05, 100).allWell());
    assertEquals(3, Verdicts.of(SummaryTable.of(List.of(s))).verdicts().size());
    assertThrows(
        IllegalArgumentException.class, () -> Verdicts.of(SummaryTable.of(List.of(s)), 1, 100));
    assertThrows(
        IllegalArgumentException.class,
        () -> Verdicts.of(SummaryTable.of(List.of(s)), 1.01, Double.NaN));
  }
}

package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.junit.jupiter.api.Test;

/**
 * Label switching: chains that order a mixture's components differently get a verdict that says
 * so instead of a bare "chains disagree", and chains that disagree without a different ordering
 * keep the usual verdict. Draws are made up: four chains of 1000 normal draws around the stated
 * means with sd 0.3 (fixed seed), so that R-hat is far above 1.01 whenever two chains' means
 * differ by 4.
 */
class LabelSwitchingTest {
  private static final List<List<String>> COMPONENTS = List.of(List.of("centre[1]", "centre[2]"));

  /** Draws of {@code centre[1]} and {@code centre[2]}: chain c has means {@code means[c]}. */
  private static Map<String, Draws> draws(double[][] means) {
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(11L);
    Map<String, Draws> draws = new LinkedHashMap<>();
    for (int m = 0; m < 2; m++) {
      double[][] chains = new double[means.length][1000];
      for (int c = 0; c < means.length; c++) {
        for (int i = 0; i < 1000; i++) {
          chains[c][i] = means[c][m] + 0.3 * random.nextGaussian();
        }
      }
      draws.put("centre[" + (m + 1) + "]", Draws.of(chains));
    }
    return draws;
  }

  /** The summary table of the draws, in their order. */
  private static SummaryTable table(Map<String, Draws> draws) {
    List<VariableSummary> summaries = new ArrayList<>();
    for (Map.Entry<String, Draws> entry : draws.entrySet()) {
      summaries.add(PosteriorSummary.of(entry.getKey(), entry.getValue()));
    }
    return SummaryTable.of(summaries);
  }

  private static Verdicts verdicts(Map<String, Draws> draws) {
    return Verdicts.of(table(draws)).withLabelSwitching(COMPONENTS, draws);
  }

  /**
   * The kinds of the verdicts about agreement between chains (the few-effective-draws verdicts
   * that the pooled draws also earn are not the subject here).
   */
  private static List<Verdict.Kind> kinds(Verdicts verdicts) {
    return verdicts.verdicts().stream().map(Verdict::kind)
        .filter(k -> k == Verdict.Kind.CHAINS_DISAGREE || k == Verdict.Kind.LABEL_SWITCHING)
        .toList();
  }

  @Test
  void chainsOnSwappedLabelsAreCalledLabelSwitching() {
    Verdicts verdicts = verdicts(draws(new double[][] {{1, 5}, {1, 5}, {5, 1}, {1, 5}}));
    assertEquals(List.of(Verdict.Kind.LABEL_SWITCHING, Verdict.Kind.LABEL_SWITCHING),
        kinds(verdicts), verdicts.lines().toString());
    String text = verdicts.verdicts().get(0).text();
    assertTrue(text.startsWith("centre[1]: the chains sit on different labellings"), text);
    assertTrue(text.contains("chain 1 has centre[1] < centre[2], chain 3 centre[2] < centre[1]"),
        text);
    List<String> lines = verdicts.lines();
    assertTrue(lines.get(lines.size() - 1).startsWith("Both unknowns need attention"),
        lines.toString());
  }

  @Test
  void chainsThatDisagreeInTheSameOrderKeepTheDisagreementVerdict() {
    Verdicts verdicts = verdicts(draws(new double[][] {{1, 5}, {1, 5}, {3, 9}, {1, 5}}));
    assertEquals(List.of(Verdict.Kind.CHAINS_DISAGREE, Verdict.Kind.CHAINS_DISAGREE),
        kinds(verdicts), verdicts.lines().toString());
  }

  @Test
  void swappedChainsOfNamesThatAreNoComponentsKeepTheDisagreementVerdict() {
    Map<String, Draws> draws = draws(new double[][] {{1, 5}, {5, 1}, {1, 5}, {5, 1}});
    Verdicts verdicts = Verdicts.of(table(draws)).withLabelSwitching(List.of(), draws);
    assertEquals(List.of(Verdict.Kind.CHAINS_DISAGREE, Verdict.Kind.CHAINS_DISAGREE),
        kinds(verdicts));
  }

  /** Verdicts of a draws file read without its model: groups found from the draws alone. */
  private static Verdicts verdictsFoundInDraws(Map<String, Draws> draws) {
    return Verdicts.of(table(draws))
        .withLabelSwitchingFoundInDraws(List.copyOf(draws.keySet()), draws);
  }

  @Test
  void withoutTheModelSwappedChainsThatAgreeOnceRelabelledAreCalledLabelSwitching() {
    Verdicts verdicts =
        verdictsFoundInDraws(draws(new double[][] {{1, 5}, {1, 5}, {5, 1}, {1, 5}}));
    assertEquals(List.of(Verdict.Kind.LABEL_SWITCHING, Verdict.Kind.LABEL_SWITCHING),
        kinds(verdicts), verdicts.lines().toString());
  }

  @Test
  void withoutTheModelSwappedChainsThatStillDisagreeOnceRelabelledKeepTheirVerdict() {
    // Chain 3 orders them the other way, but its values are not the others' swapped: relabelled,
    // its first component is about 2 where the others' is 1 (R-hat far above 1.01).
    Verdicts verdicts =
        verdictsFoundInDraws(draws(new double[][] {{1, 5}, {1, 5}, {9, 2}, {1, 5}}));
    assertEquals(List.of(Verdict.Kind.CHAINS_DISAGREE, Verdict.Kind.CHAINS_DISAGREE),
        kinds(verdicts), verdicts.lines().toString());
  }

  @Test
  void withoutTheModelWholeNumberedColumnsAreNoComponents() {
    // Two allocations that swap between chains (1 and 2 exchanged): whole numbers, so they are
    // not taken for components however they agree once relabelled.
    Map<String, Draws> draws = new LinkedHashMap<>();
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(12L);
    for (int m = 0; m < 2; m++) {
      double[][] chains = new double[4][1000];
      for (int c = 0; c < 4; c++) {
        for (int i = 0; i < 1000; i++) {
          boolean first = (m == 0) == (c != 2);
          chains[c][i] = first ? (random.nextDouble() < 0.9 ? 1 : 2)
              : (random.nextDouble() < 0.9 ? 2 : 1);
        }
      }
      draws.put("cohort_of[" + (m + 1) + "]", Draws.of(chains));
    }
    Verdicts verdicts = verdictsFoundInDraws(draws);
    assertTrue(kinds(verdicts).contains(Verdict.Kind.CHAINS_DISAGREE), verdicts.lines().toString());
    assertTrue(!kinds(verdicts).contains(Verdict.Kind.LABEL_SWITCHING),
        verdicts.lines().toString());
  }

  @Test
  void chainsThatAgreeAreLeftAlone() {
    Verdicts verdicts = verdicts(draws(new double[][] {{1, 5}, {1, 5}, {1, 5}, {1, 5}}));
    assertTrue(verdicts.allWell(), verdicts.lines().toString());
  }
}

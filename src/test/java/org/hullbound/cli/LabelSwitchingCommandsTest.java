package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.app.ExchangeableShells;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Label switching is named wherever a verdict is given, not only after {@code fit}: {@code
 * summarize} of the run's draws file and {@code report DIR} of its folder, which read the draws
 * without the model, name it for the centres too.
 *
 * <p>The model and data are {@link ExchangeableShells}, as in {@code app.FitRunLabelSwitchingTest}:
 * the same prior on both centres, two clusters 20 apart (sd 2), 20 chains started from prior draws,
 * each of which keeps the labelling its start gives it. All 20 on one labelling has probability
 * 2^-19, about 1.9e-6, per change of the random streams (by symmetry each start orders the
 * centres either way with probability 1/2); otherwise both commands must name label switching for
 * both centres. Without the model the rule also asks that the chains agree once each is
 * relabelled by the order of its centres' means (R-hat at most 1.01); within its mode each chain
 * mixes fast, so that holds with 400 draws per chain (seen: 1.000 and 1.001 with this seed).
 */
class LabelSwitchingCommandsTest {
  @TempDir static Path folder;
  private static Path run;

  @BeforeAll
  static void fitOnce() throws Exception {
    Path model = ExchangeableShells.model(folder);
    Path data = ExchangeableShells.data(folder);
    run = folder.resolve("out");
    CliRun fit = CliRun.of("fit", model.toString(), "--data", data.toString(), "--chains", "20",
        "--burn-in", "100", "--draws", "400", "--seed", "5", "--out", run.toString(), "--quiet");
    assertEquals(0, fit.exit(), fit.toString());
    assertTrue(fit.out().contains("label switching"), "fit names it: " + fit.out());
  }

  /**
   * The verdict lines about each centre: one names label switching and none is a bare
   * disagreement (the few-effective-draws lines that the pooled draws also earn may stay).
   */
  private static void assertCentresNameLabelSwitching(String text) {
    for (String centre : List.of("centre[1]", "centre[2]")) {
      List<String> lines = text.lines().filter(l -> l.startsWith(centre + ":")).toList();
      assertTrue(lines.stream().anyMatch(l -> l.contains("label switching")), text);
      assertFalse(lines.stream().anyMatch(l -> l.contains("chains disagree")), text);
    }
  }

  @Test
  void summarizeOfTheDrawsFileNamesLabelSwitching() {
    CliRun summary = CliRun.of("summarize", run.resolve("draws.csv").toString());
    assertEquals(0, summary.exit(), summary.toString());
    assertCentresNameLabelSwitching(summary.out());
  }

  @Test
  void reportOfTheFolderNamesLabelSwitching() throws Exception {
    Path page = folder.resolve("again.html");
    CliRun report = CliRun.of("report", run.toString(), "--out", page.toString());
    assertEquals(0, report.exit(), report.toString());
    String html = Files.readString(page);
    assertTrue(html.contains("centre[1]: the chains sit on different labellings"), "report DIR");
    assertFalse(html.contains("centre[1]: chains disagree"), "no bare disagreement for centre[1]");
  }
}

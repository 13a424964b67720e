package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.report.Verdict;
import org.hullbound.report.Verdicts;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A run whose chains settle on swapped labels: a two-component mixture with the same prior on
 * both centres and two clusters 20 apart (sd about 2), so that each chain keeps the labelling its
 * start gives it (a Gibbs chain does not cross between the two modes at this separation). Over 20
 * chains started from prior draws, all on one labelling has probability 2^-19, about 1.9e-6, per
 * change of the random streams (each chain's start orders the centres either way with
 * probability 1/2, by symmetry); otherwise the summary must name label switching for both
 * centres and no bare disagreement, and the report must say it too.
 */
class FitRunLabelSwitchingTest {
  @TempDir Path folder;

  @Test
  void chainsOnSwappedLabelsGetTheLabelSwitchingVerdict() throws Exception {
    Path model = ExchangeableShells.model(folder);
    Path data = ExchangeableShells.data(folder);
    FitRequest request = new FitRequest(new ModelInputs(model, List.of(data)), null, 20, 100, 200,
        null, 5L, null, folder.resolve("out"), null, false, 0.95);
    FitResult result;
    try (FitRun run = FitRun.prepare(request)) {
      result = run.run(ProgressListener.none(), StopSignal.create());
    }
    Verdicts verdicts = result.summary().orElseThrow().verdicts();
    for (String centre : List.of("centre[1]", "centre[2]")) {
      List<Verdict.Kind> kinds = verdicts.verdicts().stream()
          .filter(v -> v.unknown().equals(centre)).map(Verdict::kind).toList();
      assertTrue(kinds.contains(Verdict.Kind.LABEL_SWITCHING), centre + ": " + kinds);
      assertTrue(!kinds.contains(Verdict.Kind.CHAINS_DISAGREE), centre + ": " + kinds);
    }
    String page = Files.readString(result.reportFile(), StandardCharsets.UTF_8);
    assertTrue(page.contains("label switching"), "the report names label switching");
    assertEquals(2, verdicts.verdicts().stream()
        .filter(v -> v.kind() == Verdict.Kind.LABEL_SWITCHING).count());
  }
}

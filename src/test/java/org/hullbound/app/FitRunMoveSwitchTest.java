package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.gibbs.ProgressListener;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.report.UpdateFacts;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A move whose line turns out not to suit adaptive rejection at run time switches to the fallback,
 * and the fit's summary says so: a note per chain for every unknown it moves, the update named
 * "..., then fallback", the sweep of the first switch, and a verdict (issue 14; the path from
 * {@code LineMoveUpdater.switchNote} to the summary had no test end to end).
 *
 * <p>The model is forced there by its data, not by a test double: group 1 holds 0 and 20,000 with
 * a unit sd, so that at any value of its effect its normal terms sum to about -1e8, whose rounding
 * (2 ulps, 3e-8) is coarser than the hull's log-concavity tolerance (1e-8 for differences up to
 * 1) near the rescale line's mode; the hull refuses to judge concavity there ({@code
 * ImpreciseDensityException}) and the move switches to adaptive rejection Metropolis. The check
 * proves the line log-concave, so the rescale move starts on adaptive rejection. Seen to fail with
 * {@code LineMoveUpdater.switchNote} returning null (no note, and the summary said nothing of the
 * switch).
 */
class FitRunMoveSwitchTest {
  @TempDir Path folder;

  @Test
  void aRescaleMoveThatSwitchesToTheFallbackIsNamedInTheNotesTheTableAndTheVerdicts()
      throws Exception {
    Path model = folder.resolve("conflict.hbm");
    Files.writeString(model, String.join("\n",
        "model conflict",
        "index group = 1 .. 4",
        "index obs",
        "data  group_of[obs]",
        "data  y[obs] ~ normal(mean = effect[group_of[obs]], sd = 1)",
        "param centre ~ normal(mean = 0, sd = 100)",
        "param spread ~ half-normal(sd = 10)",
        "param effect[group] ~ normal(mean = centre, sd = spread)",
        ""));
    Path data = folder.resolve("conflict.csv");
    Files.writeString(data,
        "group_of,y\n1,0\n1,20000\n2,1.5\n2,2.5\n3,-1\n3,0.5\n4,3\n4,2\n");
    FitRequest request = new FitRequest(
        new ModelInputs(model, List.of(data)), null, 2, 100, 100, null, 5L, null,
        folder.resolve("out"), null, false, 0.95);
    FitResult result;
    try (FitRun run = FitRun.prepare(request)) {
      result = run.run(ProgressListener.none(), StopSignal.create());
    }
    FitResult.Summary summary = result.summary().orElseThrow();
    for (String moved : List.of("spread", "effect[1]", "effect[2]", "effect[3]", "effect[4]")) {
      for (int chain = 1; chain <= 2; chain++) {
        String start = moved + ": chain " + chain
            + " rescale move: switched to adaptive rejection Metropolis at sweep ";
        assertEquals(1, result.switchNotes().stream()
            .filter(note -> note.startsWith(start) && note.contains("coarser than the"
                + " log-concavity tolerance")).count(), start + " in " + result.switchNotes());
      }
      UpdateFacts facts = summary.table().updates().get(moved);
      assertEquals(UpdateFacts.Fallback.SWITCHED_DURING_RUN, facts.fallback(), moved);
      assertTrue(facts.update().endsWith(" + rescale move, then fallback"), facts.update());
      long first = facts.switchSweep();
      assertTrue(first >= 1 && first <= 100, moved + " switched at sweep " + first);
      String verdict = moved + ": switched to " + facts.update() + " at sweep " + first;
      assertEquals(1, summary.verdicts().lines().stream()
          .filter(line -> line.startsWith(verdict)).count(),
          verdict + " in " + summary.verdicts().lines());
    }
    // the conjugate block's centre is not moved by the rescale: no note, no switch
    assertEquals(UpdateFacts.Fallback.NONE,
        summary.table().updates().get("centre").fallback());
    assertTrue(result.switchNotes().stream().noneMatch(note -> note.startsWith("centre")));
  }
}

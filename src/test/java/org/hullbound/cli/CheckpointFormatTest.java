package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.hullbound.app.FitRequest;
import org.hullbound.app.FitRun;
import org.hullbound.app.ModelInputs;
import org.hullbound.gibbs.ChainState;
import org.hullbound.gibbs.KernelState;
import org.hullbound.gibbs.StopSignal;
import org.hullbound.gibbs.UpdaterState;
import org.hullbound.io.Checkpoint;
import org.hullbound.io.CheckpointFile;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Checkpoints of the {@code clinics} demo, whose direction blocks keep the most state: a checkpoint
 * written by an older build (format 1) is refused with exit 2 by its format, one whose updaters do
 * not fit this version's sampler of the model is refused naming the cause, and a run of this build
 * stopped after its directions were fixed resumes to the draws of one run, byte for byte.
 */
class CheckpointFormatTest {
  @TempDir Path folder;

  private static final String[] CLINICS = {
    "models/clinics.hbm", "--data", "models/clinics.csv", "--quiet"
  };

  private static String[] fit(String... more) {
    List<String> all = new ArrayList<>(List.of("fit"));
    all.addAll(List.of(CLINICS));
    all.addAll(List.of(more));
    return all.toArray(new String[0]);
  }

  /**
   * {@code clinics-checkpoint-format-1.txt} was written by the build of 11200c3 (the last of
   * session 5, format 1, before the direction blocks saved their Hessian): {@code java -jar
   * target/hullbound-cli.jar fit models/clinics.hbm --data models/clinics.csv --chains 1 --burn-in
   * 200 --draws 200000 --seed 5 --quiet --out DIR}, stopped by SIGTERM after 50 draws. Read with
   * today's layout it failed with exit 1 ("internal error: ... the saved state of shift move has a
   * flag 355, expected 0 or 1").
   */
  @Test
  void aCheckpointOfAnOlderBuildIsRefusedWithExitTwoNamingItsFormatAndTheOneRead()
      throws Exception {
    Path old = folder.resolve("old");
    Files.createDirectories(old);
    try (InputStream saved =
        CheckpointFormatTest.class.getResourceAsStream("clinics-checkpoint-format-1.txt")) {
      Files.copy(saved, CheckpointFile.in(old));
    }
    byte[] before = Files.readAllBytes(CheckpointFile.in(old));
    CliRun resumed = CliRun.of(fit("--resume", old.toString()));
    assertEquals(2, resumed.exit(), resumed.toString());
    assertTrue(resumed.errorIsPlain(), resumed.toString());
    assertTrue(resumed.err().contains(CheckpointFile.in(old) + " is in format 1,"), resumed.err());
    assertTrue(resumed.err().contains("this version reads format 2 only"), resumed.err());
    assertArrayEquals(before, Files.readAllBytes(CheckpointFile.in(old)), "the checkpoint is kept");
  }

  /**
   * Fits {@code clinics} with one chain, 100 sweeps of burn-in and {@code draws} draws into {@code
   * out}, asking it to stop at the first progress report after burn-in; whether it stopped there.
   */
  private static boolean stoppedAfterBurnIn(Path out, int draws) {
    FitRequest request =
        new FitRequest(
            new ModelInputs(Path.of("models/clinics.hbm"), List.of(Path.of("models/clinics.csv"))),
            null, 1, 100, draws, null, 23L, 1, out, null, false, 0.95);
    StopSignal stop = StopSignal.create();
    try (FitRun run = FitRun.prepare(request)) {
      run.run(progress -> {
        if (!progress.inBurnIn() && progress.sweepsDone() > 100) {
          stop.request();
        }
      }, stop);
    }
    return stop.isRequested() && Files.exists(CheckpointFile.in(out))
        && !CheckpointFile.read(out).complete();
  }

  /**
   * One chain (so that the whole draws file compares byte for byte: rows of chains side by side
   * interleave by timing), stopped at its first progress report after burn-in (a chain reports
   * every 250 ms of its run; 1,500 draws take longer on the machines we know, and a run that ends
   * first is made again longer), so the direction blocks have fixed their directions and replaced
   * their members' draws; then resumed by the command.
   */
  @Test
  void aRunStoppedAfterItsDirectionsWereFixedResumesToTheDrawsOfOneRun() throws Exception {
    // A run too fast to report before its end (a fast machine) leaves no checkpoint: it is made
    // again four times longer, so that the stop comes after burn-in whatever the speed.
    int draws = 1500;
    Path stopped = folder.resolve("stopped-" + draws);
    while (!stoppedAfterBurnIn(stopped, draws)) {
      draws *= 4;
      assertTrue(draws < 2_000_000, "the run always ended before its first progress report");
      stopped = folder.resolve("stopped-" + draws);
    }
    Checkpoint checkpoint = CheckpointFile.read(stopped);
    long sweep = checkpoint.chains().get(0).sweep();
    assertTrue(sweep > 100 && sweep < 100 + draws,
        "stopped after burn-in, before the end: " + sweep);

    // the same checkpoint without its last updater: another version's sampler of the model
    Path other = folder.resolve("other");
    Files.createDirectories(other);
    Files.copy(stopped.resolve("draws.csv"), other.resolve("draws.csv"));
    List<ChainState> fewer = new ArrayList<>();
    for (ChainState chain : checkpoint.chains()) {
      List<UpdaterState> updaters = chain.kernel().updaters();
      fewer.add(new ChainState(chain.sweep(), chain.draws(), chain.generator(),
          new KernelState(chain.kernel().values(), updaters.subList(0, updaters.size() - 1))));
    }
    CheckpointFile.write(other, new Checkpoint(false, checkpoint.modelFile(),
        checkpoint.inputHash(), checkpoint.seed(), checkpoint.burnIn(), checkpoint.draws(),
        checkpoint.thin(), checkpoint.columns(), fewer));
    CliRun otherVersion = CliRun.of(fit("--resume", other.toString()));
    assertEquals(2, otherVersion.exit(), otherVersion.toString());
    assertTrue(otherVersion.errorIsPlain(), otherVersion.toString());
    assertTrue(otherVersion.err().contains("was made by another version of hullbound"),
        otherVersion.err());
    CliRun withoutMoves = CliRun.of(fit("--resume", stopped.toString(), "--no-moves"));
    assertEquals(2, withoutMoves.exit(), withoutMoves.toString());
    assertTrue(withoutMoves.err().contains("was made with the moves along lines; resume it"
        + " without --no-moves"), withoutMoves.err());

    CliRun resumed = CliRun.of(fit("--resume", stopped.toString()));
    assertEquals(0, resumed.exit(), resumed.toString());
    Path whole = folder.resolve("whole");
    CliRun uninterrupted = CliRun.of(fit("--chains", "1", "--burn-in", "100", "--draws",
        String.valueOf(draws),
        "--seed", "23", "--out", whole.toString()));
    assertEquals(0, uninterrupted.exit(), uninterrupted.toString());
    assertEquals(1 + draws, Files.readAllLines(stopped.resolve("draws.csv")).size());
    assertArrayEquals(
        Files.readAllBytes(whole.resolve("draws.csv")),
        Files.readAllBytes(stopped.resolve("draws.csv")),
        "one chain: the draws file of one run, byte for byte");
    assertArrayEquals(
        Files.readAllBytes(whole.resolve("summary.csv")),
        Files.readAllBytes(stopped.resolve("summary.csv")),
        "the summary, with the evaluations per draw, is that of one run");
  }
}

package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.FileOutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code fit} and signals, in a child JVM: SIGTERM before sampling (while the model is still being
 * read) ends the run at once with SIGTERM's status, 128 + 15 = 143 (the POSIX shell convention,
 * which the JVM follows), and one line saying nothing was written; and a conditional the sampler
 * cannot follow ends the run with a sampling failure instead of hanging.
 */
class FitSignalTest {
  @TempDir Path folder;

  private Process fit(String... args) throws Exception {
    List<String> command =
        new java.util.ArrayList<>(List.of(
            Path.of(System.getProperty("java.home"), "bin", "java").toString(),
            "-cp", System.getProperty("java.class.path"), "org.hullbound.cli.Main", "fit"));
    command.addAll(List.of(args));
    return new ProcessBuilder(command)
        .redirectOutput(folder.resolve("out.txt").toFile())
        .redirectError(folder.resolve("err.txt").toFile())
        .start();
  }

  /**
   * SIGTERM to {@code child}: it ends with status 143 and the one line of a stop before sampling.
   */
  private void assertStoppedBeforeSampling(Process child) throws Exception {
    child.destroy(); // SIGTERM
    assertTrue(child.waitFor(30, TimeUnit.SECONDS), "the child ended");
    String err = Files.readString(folder.resolve("err.txt"));
    assertEquals(143, child.exitValue(), err);
    assertEquals(
        "hullbound fit: stopped by a signal before sampling began; no file was written\n", err);
  }

  @Test
  void sigtermWhileTheModelIsReadEndsWithStatus143AndOneLine() throws Exception {
    // a named pipe as the model file: the child blocks reading it until this test writes, so the
    // signal is known to arrive during start-up, after the command began
    Path model = folder.resolve("model.hbm");
    Process mkfifo = new ProcessBuilder("mkfifo", model.toString()).start();
    assertEquals(0, mkfifo.waitFor());
    Path out = folder.resolve("run");
    Process child = fit(model.toString(), "--out", out.toString(), "--quiet");
    // opening the pipe for writing returns once the child has opened it for reading
    CompletableFuture<FileOutputStream> opened =
        CompletableFuture.supplyAsync(() -> {
          try {
            return new FileOutputStream(model.toFile());
          } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
          }
        });
    try (FileOutputStream writer = opened.get(60, TimeUnit.SECONDS)) {
      assertStoppedBeforeSampling(child);
    }
    assertFalse(Files.exists(out), "nothing written");
  }

  /**
   * SIGTERM while the run holds its folder's lock but has not begun sampling (issue 14): a named
   * pipe as the checkpoint of {@code --resume}, read under the lock, keeps the child there. The JVM
   * halts after its shutdown hooks, so the preparing thread never released the lock, and the lock
   * file kept the run's process id: the next run reported it as a stale lock. Now the signal's
   * hook releases it, and the lock file is left empty.
   */
  @Test
  void sigtermWhileTheFolderIsLockedLeavesNoLockBehind() throws Exception {
    Path run = folder.resolve("run");
    Files.createDirectories(run);
    Process mkfifo =
        new ProcessBuilder("mkfifo", run.resolve("checkpoint.txt").toString()).start();
    assertEquals(0, mkfifo.waitFor());
    Path lockFile = run.resolve("run.lock");
    Process child = fit("models/seedlings.hbm", "--data", "models/seedlings.csv", "--quiet",
        "--resume", run.toString());
    long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
    while (!(Files.exists(lockFile) && Files.readString(lockFile).startsWith("pid "))) {
      assertTrue(System.nanoTime() < deadline, "the child locked the folder");
      Thread.sleep(20);
    }
    assertStoppedBeforeSampling(child);
    assertEquals("", Files.readString(lockFile), "the lock file names no run");
  }

  @Test
  void aConditionalTheHullCannotFollowFailsTheRunInsteadOfHanging() throws Exception {
    // issue 14: the seedlings data with tray 1 planted with 1e15 seeds hung this fit at full CPU
    Path data = folder.resolve("seedlings.csv");
    List<String> lines =
        new java.util.ArrayList<>(Files.readAllLines(Path.of("models", "seedlings.csv")));
    lines.set(1, "1e15,1,16");
    Files.write(data, lines);
    Process child =
        fit("models/seedlings.hbm", "--data", data.toString(), "--seed", "1", "--quiet",
            "--out", folder.resolve("run").toString());
    assertTrue(child.waitFor(3, TimeUnit.MINUTES), "the run ended");
    String err = Files.readString(folder.resolve("err.txt"));
    assertEquals(1, child.exitValue(), err);
    String first = err.lines().findFirst().orElse("");
    // chain 1's stuck draw is now rescued by a restarted hull (gibbs.DegenerateConditionalTest);
    // chain 2 still fails on effect[1], whose values far from the mode (near -3.6e8) are too
    // coarsely rounded for the hull, and then in the fallback, which now says so with its values
    // (it was a raw IllegalStateException of ARMS)
    assertTrue(first.startsWith("hullbound fit: sampling failed: chain "), err);
    assertTrue(first.contains("updating effect[1] (adaptive rejection, then ARMS fallback): the full"
        + " conditional is numerically degenerate for the fallback: adaptive rejection Metropolis"
        + " from current value "), err);
    assertTrue(first.contains(" on support (-inf, inf) accepted no candidate in 100000 tries"),
        err);
    assertTrue(first.contains(" abscissae run from "), err);
    assertEquals(2, err.lines().count(), "one line and where the draws are: " + err);
    assertFalse(err.contains("Exception"), err);
  }
}

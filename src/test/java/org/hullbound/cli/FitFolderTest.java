package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * One run per output folder, and whole rows after any failure (docs/fit.md, "Guarantees"): a
 * second fit into a folder in use exits 2 naming the running one, {@code --overwrite} does not
 * delete a folder in use, two resumes of one run cannot both run, a full disk leaves {@code
 * draws.csv} with whole rows only, and a refused run leaves no folder it created.
 *
 * <p>The running fit is a second JVM (operating-system locks belong to a process, so only another
 * process sees them as another run would), started from the test class path.
 */
class FitFolderTest {
  @TempDir Path folder;

  private static final String MODEL = "models/seedlings.hbm";
  private static final String DATA = "models/seedlings.csv";

  private final List<Process> children = new ArrayList<>();

  @AfterEach
  void stopChildren() throws InterruptedException {
    for (Process child : children) {
      child.destroyForcibly();
      child.waitFor(30, TimeUnit.SECONDS);
    }
  }

  /** A fit in another JVM that runs for minutes: 100 draws thinned by a million sweeps. */
  private Process longFit(Path out, String... more) throws IOException {
    List<String> command = new ArrayList<>(List.of(
        Path.of(System.getProperty("java.home"), "bin", "java").toString(),
        "-cp", System.getProperty("java.class.path"), "org.hullbound.cli.Main", "fit", MODEL,
        "--data", DATA));
    command.addAll(List.of(more));
    command.addAll(List.of("--quiet", "--out", out.toString()));
    Process child =
        new ProcessBuilder(command)
            .redirectErrorStream(true)
            .redirectOutput(folder.resolve("child-" + children.size() + ".txt").toFile())
            .start();
    children.add(child);
    return child;
  }

  private static void awaitFile(Path file, Process child) throws InterruptedException {
    long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
    while (System.nanoTime() < deadline && !Files.exists(file) && child.isAlive()) {
      Thread.sleep(50);
    }
    assertTrue(Files.exists(file), file + " appeared");
  }

  private static CliRun fit(Path out, String... more) {
    List<String> args = new ArrayList<>(List.of("fit", MODEL, "--data", DATA, "--chains", "2",
        "--burn-in", "5", "--draws", "10", "--quiet", "--out", out.toString()));
    args.addAll(List.of(more));
    return CliRun.of(args.toArray(String[]::new));
  }

  @Test
  void aSecondFitIntoAFolderInUseExitsTwoNamingTheRunningOneAndLeavesItsFilesAlone()
      throws Exception {
    Path out = folder.resolve("shared");
    Process first = longFit(out, "--chains", "1", "--burn-in", "0", "--draws", "100", "--thin",
        "1000000", "--seed", "1");
    awaitFile(out.resolve("draws.csv"), first);

    CliRun second = fit(out, "--seed", "2");
    assertEquals(2, second.exit(), second.toString());
    assertTrue(second.errorIsPlain(), second.toString());
    assertTrue(second.err().contains("in use by another run (pid " + first.pid() + " on "),
        second.err());
    assertTrue(second.err().contains(", started 20"), second.err());

    CliRun overwrite = fit(out, "--seed", "3", "--overwrite");
    assertEquals(2, overwrite.exit(), overwrite.toString());
    assertTrue(overwrite.err().contains("pid " + first.pid()), overwrite.err());
    assertTrue(first.isAlive(), "the running fit goes on");
    assertTrue(Files.readString(out.resolve("draws.csv")).startsWith("chain,draw,"),
        "its draws file was not deleted or replaced");
  }

  @Test
  void twoResumesOfOneRunCannotBothRun() throws Exception {
    Path out = folder.resolve("interrupted");
    Process original = longFit(out, "--chains", "1", "--burn-in", "0", "--draws", "100",
        "--thin", "1000000", "--seed", "4");
    awaitFile(out.resolve("draws.csv"), original);
    original.destroy(); // SIGTERM: the run saves its checkpoint and exits
    assertTrue(original.waitFor(60, TimeUnit.SECONDS));
    assertTrue(Files.exists(out.resolve("checkpoint.txt")), "interrupted with a checkpoint");

    Process resumed = longFit(out, "--resume", out.toString());
    long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(120);
    while (System.nanoTime() < deadline && resumed.isAlive()
        && Files.readString(out.resolve("run.lock")).isBlank()) {
      Thread.sleep(50);
    }
    assertTrue(resumed.isAlive(), "the first resume runs");
    // Without the first resume's lock the second would really resume a run thinned by 10^6 and
    // not end: fail here instead (seen on a machine loaded by many builds).
    assertFalse(Files.readString(out.resolve("run.lock")).isBlank(),
        "the first resume took the folder's lock within 120 s");
    CliRun again = CliRun.of("fit", MODEL, "--data", DATA, "--quiet", "--resume", out.toString());
    assertEquals(2, again.exit(), again.toString());
    assertTrue(again.err().contains("pid " + resumed.pid()), again.err());
    assertTrue(resumed.isAlive(), "the first resume goes on");
  }

  @Test
  void inOneProcessASecondRunIntoAFolderInUseIsRefusedToo() throws Exception {
    Path out = folder.resolve("same-jvm");
    try (var held = org.hullbound.app.FolderLock.take(out)) {
      CliRun second = fit(out);
      assertEquals(2, second.exit(), second.toString());
      assertTrue(second.err().contains("pid " + ProcessHandle.current().pid()), second.err());
      assertFalse(Files.exists(out.resolve("draws.csv")), "the refused run wrote nothing");
    }
    assertEquals(0, fit(out).exit(), "free again once released");
  }

  @Test
  void aStaleLockLeftByAKilledRunIsReportedAndTakenOver() throws Exception {
    Path out = folder.resolve("stale");
    Process killed = longFit(out, "--chains", "1", "--burn-in", "0", "--draws", "100", "--thin",
        "1000000", "--seed", "5");
    awaitFile(out.resolve("draws.csv"), killed);
    killed.destroyForcibly(); // SIGKILL: no hook runs, the lock file still names the run
    assertTrue(killed.waitFor(30, TimeUnit.SECONDS));
    assertTrue(Files.readString(out.resolve("run.lock")).contains("pid " + killed.pid()));

    CliRun next = fit(out, "--overwrite");
    assertEquals(0, next.exit(), next.toString());
    assertTrue(next.err().contains("pid " + killed.pid()), next.err());
    assertTrue(next.err().contains("ended without releasing it"), next.err());
    assertTrue(Files.readString(out.resolve("run.lock")).isBlank(), "released at the end");
  }

  @Test
  void anEmptyOutputFolderNameIsRefused() {
    CliRun run = fit(Path.of(""));
    assertEquals(2, run.exit(), run.toString());
    assertTrue(run.errorIsPlain(), run.toString());
    assertTrue(run.err().contains("--out must name a folder"), run.err());
  }

  @Test
  void aRefusedOrFailedRunLeavesNoFolderItCreated() throws IOException {
    Path missing = folder.resolve("new");
    Path deep = missing.resolve("a").resolve("b");
    Files.writeString(folder.resolve("neg.csv"), "spread,-1\n");
    List<List<String>> failing = List.of(
        List.of("--init", folder.resolve("neg.csv").toString()),
        List.of("--chains", "0"),
        List.of("--draws", "2000000000", "--burn-in", "0"),
        List.of("--resume", deep.toString()));
    for (List<String> more : failing) {
      CliRun run = more.contains("--resume")
          ? CliRun.of("fit", MODEL, "--data", DATA, "--quiet", "--resume", deep.toString())
          : fit(deep, more.toArray(String[]::new));
      assertEquals(2, run.exit(), more + ": " + run);
      assertFalse(Files.exists(missing), more + ": " + missing + " was left behind");
    }
  }

  /**
   * A disk that fills during the run: a 256 KiB tmpfs (mounting needs root; without it this test
   * is skipped, and {@code DrawsWriterTest} still injects the same failure into the writer).
   */
  @Test
  void aFullDiskLeavesDrawsWithWholeRowsOnlyAndExitsOne() throws Exception {
    Path disk = Files.createDirectories(folder.resolve("disk"));
    Process mount = new ProcessBuilder("mount", "-t", "tmpfs", "-o", "size=256k", "tmpfs",
        disk.toString()).redirectErrorStream(true).start();
    boolean mounted = mount.waitFor(30, TimeUnit.SECONDS) && mount.exitValue() == 0;
    Assumptions.assumeTrue(mounted,
        "mounting a tmpfs needs root (or CAP_SYS_ADMIN); the injected write failure of"
            + " DrawsWriterTest covers the writer here");
    try {
      Path out = disk.resolve("run");
      CliRun run = CliRun.of("fit", MODEL, "--data", DATA, "--chains", "2", "--burn-in", "0",
          "--draws", "20000", "--seed", "6", "--quiet", "--out", out.toString());
      assertEquals(1, run.exit(), run.toString());
      assertTrue(run.err().contains("No space left on device"), run.err());
      assertTrue(run.err().contains("the draws made before the failure are in"), run.err());
      String text = Files.readString(out.resolve("draws.csv"));
      assertTrue(text.endsWith("\n"), "ends with a whole row");
      String[] lines = text.split("\n");
      int fields = lines[0].split(",", -1).length;
      assertTrue(lines.length > 1, "some draws were kept");
      for (int i = 1; i < lines.length; i++) {
        assertEquals(fields, lines[i].split(",", -1).length, "line " + (i + 1) + ": " + lines[i]);
      }
    } finally {
      Process umount = new ProcessBuilder("umount", disk.toString()).start();
      if (!umount.waitFor(30, TimeUnit.SECONDS) || umount.exitValue() != 0) {
        // Still busy: detach it now so that the temporary folder can go; the test has failed
        // already if a file in it was left open.
        new ProcessBuilder("umount", "-l", disk.toString()).start().waitFor(30, TimeUnit.SECONDS);
        throw new AssertionError("the tmpfs was busy after the run: a file was left open");
      }
    }
  }
}

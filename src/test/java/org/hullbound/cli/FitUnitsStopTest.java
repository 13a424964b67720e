package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code fit-units} and signals: SIGTERM while units run ends the batch at once with SIGTERM's
 * status (143, the POSIX shell convention the JVM follows) and one line that counts the units kept
 * and gives the command that fits the rest; every finished unit's rows are in the tables, whole.
 * {@code --resume DIR} then fits the rest, and the tables equal those of a batch never stopped.
 */
class FitUnitsStopTest {
  private static final int UNITS = 12;

  @TempDir Path folder;

  private Path model() throws Exception {
    return Files.writeString(folder.resolve("station.hbm"),
        "model station\nindex reading\ndata y[reading] ~ normal(mean = mu, sd = 1)\n"
            + "param mu ~ normal(mean = 0, sd = 10)\n");
  }

  /** Twelve sites of eight readings each. */
  private Path data() throws Exception {
    StringBuilder text = new StringBuilder("site,y\n");
    for (int site = 0; site < UNITS; site++) {
      for (int k = 0; k < 8; k++) {
        text.append(String.format("s%02d,%.2f%n", site,
            0.1 * site + ((k * 7 + site) % 5 - 2) * 0.4));
      }
    }
    return Files.writeString(folder.resolve("all.csv"), text.toString());
  }

  private List<String> arguments(Path model, Path data, String... more) {
    List<String> args = new ArrayList<>(List.of("fit-units", model.toString(), "--unit-column",
        "site", "--data", data.toString(), "--seed", "5", "--chains", "2", "--burn-in", "100",
        "--draws", "500", "--workers", "1", "--quiet"));
    args.addAll(List.of(more));
    return args;
  }

  /**
   * The child fits two units, then its next unit waits for the stop ({@link GatedTasks}, found as
   * the {@code spark} engine on the child's class path only): the signal always comes with exactly
   * two units finished, however slow or fast the machine.
   */
  @Test
  void sigtermWhileUnitsRunEndsWithStatus143KeepsTheFinishedUnitsAndAResumeCompletesThem()
      throws Exception {
    Path model = model();
    Path data = data();
    Path out = folder.resolve("stopped");
    Path engine = folder.resolve("engine");
    Files.createDirectories(engine.resolve(GatedTasks.SERVICE).getParent());
    Files.writeString(engine.resolve(GatedTasks.SERVICE), GatedTasks.class.getName() + "\n");
    List<String> command = new ArrayList<>(List.of(
        Path.of(System.getProperty("java.home"), "bin", "java").toString(),
        "-cp", engine + java.io.File.pathSeparator + System.getProperty("java.class.path"),
        "org.hullbound.cli.Main"));
    List<String> gated = arguments(model, data, "--out", out.toString(), "--spark");
    int workers = gated.indexOf("--workers");
    gated.subList(workers, workers + 2).clear(); // --spark's engine says how many run at once
    command.addAll(gated);
    Process child = new ProcessBuilder(command)
        .redirectOutput(folder.resolve("out.txt").toFile())
        .redirectError(folder.resolve("err.txt").toFile())
        .start();
    Path units = out.resolve("units.csv");
    long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(120);
    while (!(Files.exists(units) && Files.readAllLines(units).size() >= 1 + GatedTasks.OPEN)) {
      assertTrue(child.isAlive(),
          "the child is still running: " + Files.readString(folder.resolve("err.txt")));
      assertTrue(System.nanoTime() < deadline, "two units finished within two minutes");
      Thread.sleep(20);
    }
    child.destroy(); // SIGTERM
    assertTrue(child.waitFor(60, TimeUnit.SECONDS), "the child ended");
    String err = Files.readString(folder.resolve("err.txt"));
    assertEquals(143, child.exitValue(), err);
    List<String> lines = err.lines().toList();
    String last = lines.get(lines.size() - 1);
    int kept = GatedTasks.OPEN;
    assertEquals(
        "hullbound fit-units: stopped by a signal; " + kept
            + " of 12 units finished and are kept in "
            + out + "; to fit the other " + (UNITS - kept) + ": hullbound fit-units " + model
            + " --unit-column site --data " + data + " --spark --resume " + out,
        last, err);
    assertEquals(2, lines.size(), "the start line and the stop line: " + err);
    String table = Files.readString(units);
    assertEquals(kept + 1, Files.readAllLines(units).size(), table);
    assertTrue(table.endsWith("\r\n"), "whole rows: " + table);
    assertEquals("", Files.readString(out.resolve("run.lock")), "the folder is released");

    // the rest on this JVM's local engine: a batch's results never depend on the engine
    CliRun resumed = CliRun.of(arguments(model, data, "--resume", out.toString()).stream()
        .filter(arg -> !arg.equals("--seed") && !arg.equals("5")).toArray(String[]::new));
    assertEquals(0, resumed.exit(), resumed.toString());
    assertTrue(resumed.err().contains("resuming " + out + ": " + kept + " units finished before, "
        + (UNITS - kept) + " to fit"), resumed.err());
    Path whole = folder.resolve("whole");
    CliRun uninterrupted =
        CliRun.of(arguments(model, data, "--out", whole.toString()).toArray(String[]::new));
    assertEquals(0, uninterrupted.exit(), uninterrupted.toString());
    for (String file : List.of("summary.csv", "units.csv", "batch.txt")) {
      assertArrayEquals(Files.readAllBytes(whole.resolve(file)),
          Files.readAllBytes(out.resolve(file)), file);
    }
    assertFalse(Files.exists(out.resolve("units")), "no unit folder left");
  }

  @Test
  void sigtermWhileTheUnitsAreReadEndsWithStatus143AndOneLine() throws Exception {
    // a named pipe as the data file: the child blocks reading it until this test writes, so the
    // signal is known to come before any unit begins
    Path data = folder.resolve("all.csv");
    assertEquals(0, new ProcessBuilder("mkfifo", data.toString()).start().waitFor());
    Path out = folder.resolve("never");
    List<String> command = new ArrayList<>(List.of(
        Path.of(System.getProperty("java.home"), "bin", "java").toString(),
        "-cp", System.getProperty("java.class.path"), "org.hullbound.cli.Main"));
    command.addAll(arguments(model(), data, "--out", out.toString()));
    Process child = new ProcessBuilder(command)
        .redirectOutput(folder.resolve("out.txt").toFile())
        .redirectError(folder.resolve("err.txt").toFile())
        .start();
    // opening the pipe for writing returns once the child has opened it for reading
    try (var writer = java.util.concurrent.CompletableFuture.supplyAsync(() -> {
          try {
            return new java.io.FileOutputStream(data.toFile());
          } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
          }
        }).get(60, TimeUnit.SECONDS)) {
      child.destroy(); // SIGTERM
      assertTrue(child.waitFor(30, TimeUnit.SECONDS), "the child ended");
    }
    String err = Files.readString(folder.resolve("err.txt"));
    assertEquals(143, child.exitValue(), err);
    assertEquals("hullbound fit-units: stopped by a signal before any unit began; no file was"
        + " written\n", err);
    assertFalse(Files.exists(out), "nothing written");
  }

  @Test
  void aResumeWithOtherSettingsOrOfAFinishedBatchIsRefusedWithExitTwo() throws Exception {
    Path model = model();
    Path data = Files.writeString(folder.resolve("two.csv"), "site,y\na,1.2\nb,-0.5\na,0.3\n");
    Path out = folder.resolve("out");
    CliRun first = CliRun.of("fit-units", model.toString(), "--unit-column", "site", "--data",
        data.toString(), "--draws", "100", "--burn-in", "50", "--quiet", "--out", out.toString());
    assertEquals(0, first.exit(), first.toString());
    CliRun again = CliRun.of("fit-units", model.toString(), "--unit-column", "site", "--data",
        data.toString(), "--resume", out.toString());
    assertEquals(2, again.exit(), again.toString());
    assertEquals("hullbound fit-units: the batch in " + out + " is finished (every unit has its"
        + " row in units.csv): nothing to resume\n", again.err());
    CliRun otherDraws = CliRun.of("fit-units", model.toString(), "--unit-column", "site", "--data",
        data.toString(), "--draws", "300", "--resume", out.toString());
    assertEquals(2, otherDraws.exit(), otherDraws.toString());
    assertEquals("hullbound fit-units: the batch in " + out + " was made with --draws 100; a"
        + " resumed batch keeps its settings (leave these options out)\n", otherDraws.err());
  }
}

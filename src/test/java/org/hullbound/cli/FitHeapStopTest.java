package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A stop is bounded whatever the heap does (issue 14): a {@code fit} whose heap is nearly full,
 * so that the collector runs back to back, ends within {@link #BOUND_SECONDS} of SIGTERM with the
 * signal's status and one line saying why it did not wait for its files. A 2.3-million-row fit
 * whose rows nearly filled the default heap took 157 s from SIGTERM to exit: the hook waited two
 * minutes for files that a thrashing collector let the run write only at a crawl.
 *
 * <p>In a child JVM ({@link Child}) with a 256 MB heap, 200 MB of it held by ballast of small
 * objects (so that each full collection has much to mark, as a heap full of a model's rows has),
 * and, once sampling has begun, the collector kept running back to back by a thread of the child
 * (what the JVM does by itself when the live data fill the heap, here without waiting for the
 * fit's own data to grow that large, which depends on how compactly the model is held). The
 * heap's state is the test's; the fit, its signal hook and its files are the real ones.
 */
class FitHeapStopTest {
  /**
   * The bound on the time from SIGTERM to the child's end: the deadline's window is 5 s, and the
   * child ended 7.3 s and 7.9 s after the signal at a load of 8; before the deadline, 37.8 s.
   */
  private static final long BOUND_SECONDS = 20;

  @TempDir Path folder;

  @Test
  void sigtermWhileTheCollectorThrashesEndsTheRunWithinTheBound() throws Exception {
    Path out = folder.resolve("run");
    List<String> command = new ArrayList<>(List.of(
        Path.of(System.getProperty("java.home"), "bin", "java").toString(),
        "-Xmx256m", "-XX:+UseG1GC", "-cp", System.getProperty("java.class.path"),
        Child.class.getName(), "200", out.resolve("draws.csv").toString(),
        "fit", "models/clinics.hbm", "--data", "models/clinics.csv", "--seed", "1",
        "--burn-in", "1000", "--draws", "4000", "--out", out.toString()));
    Process child = new ProcessBuilder(command)
        .redirectOutput(folder.resolve("out.txt").toFile())
        .redirectError(folder.resolve("err.txt").toFile())
        .start();
    Path pressing = folder.resolve("run").resolve("draws.csv");
    long waitUntil = System.nanoTime() + TimeUnit.SECONDS.toNanos(120);
    while (!Files.exists(pressing)) {
      assertTrue(child.isAlive(), () -> "the child ended early: " + read("err.txt"));
      assertTrue(System.nanoTime() < waitUntil, "the fit began sampling");
      Thread.sleep(50);
    }
    Thread.sleep(2000); // the collector has been thrashing for a while
    assertTrue(child.isAlive(), () -> "the child is still sampling: " + read("err.txt"));
    long signalled = System.nanoTime();
    child.destroy(); // SIGTERM
    boolean ended = child.waitFor(150, TimeUnit.SECONDS);
    double seconds = (System.nanoTime() - signalled) / 1e9;
    if (!ended) {
      child.destroyForcibly();
    }
    String err = read("err.txt");
    assertTrue(ended && seconds < BOUND_SECONDS,
        "ended " + (ended ? "after " + seconds + " s" : "not within 150 s") + ": " + err);
    assertEquals(143, child.exitValue(), err);
    assertTrue(err.contains("hullbound fit: the Java heap is full (the collector took "), err);
    assertTrue(err.contains("draws.csv keeps its whole rows"), err);
    List<String> rows = Files.readAllLines(out.resolve("draws.csv"));
    int columns = rows.get(0).split(",", -1).length;
    for (String row : rows) {
      assertEquals(columns, row.split(",", -1).length, "a whole row: " + row);
    }
  }

  private String read(String name) {
    try {
      return Files.readString(folder.resolve(name));
    } catch (java.io.IOException e) {
      return "(unreadable: " + e + ")";
    }
  }

  /**
   * Holds {@code args[0]} MB of ballast, runs the command line of {@code args[2..]} and, once the
   * file {@code args[1]} exists (the fit's draws file: sampling has begun), keeps the collector
   * running back to back.
   */
  static final class Child {
    /** Reachable until the JVM ends. */
    static Object[] ballast;

    public static void main(String[] args) throws Exception {
      long bytes = Long.parseLong(args[0]) << 20;
      int objects = (int) (bytes / 80); // a long[8] is 80 bytes with its header
      ballast = new Object[objects];
      for (int i = 0; i < objects; i++) {
        ballast[i] = new long[8];
      }
      Path started = Path.of(args[1]);
      Thread collector = new Thread(() -> {
        try {
          while (!Files.exists(started)) {
            Thread.sleep(20);
          }
          while (true) {
            System.gc();
          }
        } catch (InterruptedException stopped) {
          Thread.currentThread().interrupt();
        }
      }, "thrashing collector");
      collector.setDaemon(true);
      collector.start();
      Main.main(java.util.Arrays.copyOfRange(args, 2, args.length));
    }
  }
}

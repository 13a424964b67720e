package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A fit whose data do not fit the heap says so, not "keep fewer draws" (issue 14: a fit of the
 * 200 MB clinics file ran out while binding and was told to keep fewer draws, which it could not
 * change). In a child JVM with a 32 MB heap, 2 million clinics rows (three read columns, 9.5
 * bytes a cell as held today: 57 MB) run out while the data are read, for real; held more
 * compactly, they would run out while the model is compiled over them, before sampling all the
 * same, and the message would say so.
 */
class FitOutOfMemoryTest {
  private static final int ROWS = 2_000_000;

  @TempDir Path folder;

  @Test
  void aFitWhoseRowsFillTheHeapWhileReadingIsToldToGiveMoreHeapOrFewerRows() throws Exception {
    Path data = folder.resolve("patients.csv");
    SplittableRandom random = new SplittableRandom(14);
    try (BufferedWriter out = Files.newBufferedWriter(data)) {
      out.write("clinic_of,dose,recovered\n");
      for (int r = 0; r < ROWS; r++) {
        out.write((1 + random.nextInt(36)) + "," + random.nextInt(31) / 10.0 + ","
            + random.nextInt(2) + "\n");
      }
    }
    Process child = new ProcessBuilder(
            Path.of(System.getProperty("java.home"), "bin", "java").toString(),
            "-Xmx32m", "-XX:+UseSerialGC", "-cp", System.getProperty("java.class.path"),
            Main.class.getName(), "fit", "models/clinics.hbm", "--data", data.toString(),
            "--quiet", "--out", folder.resolve("run").toString())
        .redirectOutput(folder.resolve("out.txt").toFile())
        .redirectError(folder.resolve("err.txt").toFile())
        .start();
    assertTrue(child.waitFor(120, TimeUnit.SECONDS), "the child ended");
    String err = Files.readString(folder.resolve("err.txt"));
    assertEquals(1, child.exitValue(), err);
    assertEquals(1, err.lines().count(), "one line: " + err);
    // where it runs out depends on how compactly the rows are held (8 bytes a dose at least, in
    // the table and again in the compiled conditionals): before sampling, either way
    String size = org.hullbound.gibbs.MemoryBudget.describe(Files.size(data));
    assertTrue(err.startsWith("hullbound fit: out of memory while reading and binding the data ("
        + size + " of data files) in a Java heap of ")
        || err.startsWith("hullbound fit: out of memory while compiling the model over its "
            + ROWS + " data rows in a Java heap of "), err);
    assertTrue(err.contains(": the data's rows fill it, not the draws; give Java more memory"
        + " (HULLBOUND_JAVA_OPTS=-Xmx1g ./hullbound fit ...) or fit fewer rows or data columns"),
        err);
    assertFalse(err.contains("--draws") || err.contains("--thin"), err);
    assertFalse(Files.exists(folder.resolve("run")), "no folder made");
  }
}

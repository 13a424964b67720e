package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.SplittableRandom;
import org.hullbound.model.DataColumn;
import org.hullbound.model.DataTable;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A large data file loads within a small, fixed heap: the columns the model reads are held as
 * primitive numbers (8 bytes a cell plus 4 a row for its line) and the others not at all.
 *
 * <p>Measured as pass or fail of a child JVM with a hard heap limit, not by reading heap gauges
 * (which other tests running in the same JVM would disturb): 400,000 rows of three read columns
 * and one skipped column of text need about 11 MB as stored, and the child gets 48 MB, so it
 * fails only for storage above about 40 bytes a cell. Reading the file as text rows (one string
 * a cell, the file's text held whole, as before issue 14) needs well over 100 MB.
 */
class CsvDataHeapTest {
  private static final int ROWS = 400_000;
  private static final String HEAP = "-Xmx48m";

  @TempDir Path folder;

  @Test
  void fourHundredThousandRowsLoadInAFortyEightMegabyteHeap() throws Exception {
    Path file = folder.resolve("patients.csv");
    long expected = write(file);
    LimitedHeapChild.Result child = LimitedHeapChild.run(
        HEAP, folder.resolve("child.txt"), 120, Child.class, file.toString());
    String printed = child.printed();
    assertEquals(0, child.exitValue(), printed);
    assertEquals(ROWS + " 3 " + expected, printed);
  }

  /** Writes the file; returns the sum of its read cells in tenths, which the child must find. */
  private static long write(Path file) throws IOException {
    SplittableRandom random = new SplittableRandom(14);
    long sum = 0;
    try (BufferedWriter out = Files.newBufferedWriter(file)) {
      out.write("clinic_of,dose,note,recovered\n");
      for (int r = 0; r < ROWS; r++) {
        int clinic = 1 + random.nextInt(36);
        int doseTenths = random.nextInt(31);
        int recovered = random.nextInt(2);
        out.write(clinic + "," + doseTenths / 10.0 + ",\"seen, day " + (r % 7) + "\"," + recovered
            + "\n");
        sum += 10L * clinic + doseTenths + 10L * recovered;
      }
    }
    return sum;
  }

  /** Reads the file given as its argument, skipping the note column, and prints what it holds. */
  static final class Child {
    public static void main(String[] args) {
      DataTable table = CsvData.read(Path.of(args[0]), column -> !column.equals("note"));
      long sum = 0;
      for (int j = 0; j < table.header().size(); j++) {
        if (table.holds(j)) {
          DataColumn column = table.column(j);
          for (int r = 0; r < table.rowCount(); r++) {
            sum += Math.round(10 * column.value(r));
          }
        }
      }
      System.out.println(table.rowCount() + " " + table.heldColumnCount() + " " + sum);
    }
  }
}

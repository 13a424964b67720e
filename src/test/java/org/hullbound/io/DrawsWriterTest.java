package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class DrawsWriterTest {
  @TempDir Path folder;

  private List<CSVRecord> read(Path file) throws IOException {
    try (Reader reader = Files.newBufferedReader(file);
        CSVParser parser = CSVParser.parse(reader, CSVFormat.RFC4180)) {
      return parser.getRecords();
    }
  }

  @Test
  void theHeaderNamesChainDrawAndEveryScalarUnknown() throws IOException {
    try (DrawsWriter writer =
        DrawsWriter.open(folder.resolve("out"), List.of("centre", "effect[1]", "X[2,3]"))) {
      writer.accept(0, 1, new double[] {0.25, -1.5, 3});
      writer.accept(1, 1, new double[] {1e-300, Double.NaN, Double.NEGATIVE_INFINITY});
    }
    List<CSVRecord> rows = read(folder.resolve("out/draws.csv"));
    assertEquals(List.of("chain", "draw", "centre", "effect[1]", "X[2,3]"), rows.get(0).toList());
    assertEquals(List.of("1", "1", "0.25", "-1.5", "3"), rows.get(1).toList());
    assertEquals(List.of("2", "1", "1.0E-300", "NaN", "-inf"), rows.get(2).toList());
    assertEquals(1e-300, Double.parseDouble(rows.get(2).get(2)));
  }

  @Test
  void valuesRoundTripExactly() throws IOException {
    double[] values = {Math.PI, -Math.E * 1e200, 0.1 + 0.2, Double.MIN_VALUE, 123456789.0};
    try (DrawsWriter writer = DrawsWriter.open(folder, List.of("a", "b", "c", "d", "e"))) {
      writer.accept(0, 1, values);
    }
    CSVRecord row = read(folder.resolve(DrawsWriter.FILE_NAME)).get(1);
    for (int i = 0; i < values.length; i++) {
      assertEquals(values[i], Double.parseDouble(row.get(i + 2)), "column " + i);
    }
  }

  @Test
  void rowsAreFlushedWithinASecondWhileTheWriterStaysOpen() throws Exception {
    try (DrawsWriter writer = DrawsWriter.open(folder, List.of("mu"))) {
      writer.accept(0, 1, new double[] {1.5});
      writer.accept(0, 2, new double[] {2.5});
      Path file = folder.resolve(DrawsWriter.FILE_NAME);
      long deadline = System.nanoTime() + 1_000_000_000L;
      List<CSVRecord> rows = read(file);
      while (rows.size() < 3 && System.nanoTime() < deadline) {
        Thread.sleep(50);
        rows = read(file);
      }
      assertEquals(3, rows.size(), "rows on disk one second after writing, without close");
      assertEquals("2.5", rows.get(2).get(2));
    }
  }

  @Test
  void concurrentChainsWriteWholeRows() throws Exception {
    int chains = 4;
    int draws = 2000;
    try (DrawsWriter writer = DrawsWriter.open(folder, List.of("a", "b", "c"))) {
      Thread[] threads = new Thread[chains];
      for (int c = 0; c < chains; c++) {
        int chain = c;
        threads[c] =
            new Thread(
                () -> {
                  for (int d = 1; d <= draws; d++) {
                    writer.accept(chain, d, new double[] {chain, d, chain * 10_000.0 + d});
                  }
                });
        threads[c].start();
      }
      for (Thread thread : threads) {
        thread.join();
      }
    }
    List<CSVRecord> rows = read(folder.resolve(DrawsWriter.FILE_NAME));
    assertEquals(1 + chains * draws, rows.size());
    Set<String> seen = new HashSet<>();
    for (CSVRecord row : rows.subList(1, rows.size())) {
      assertEquals(5, row.size());
      int chain = Integer.parseInt(row.get(0)) - 1;
      int draw = Integer.parseInt(row.get(1));
      assertEquals(String.valueOf(chain), row.get(2));
      assertEquals(String.valueOf(draw), row.get(3));
      assertEquals(String.valueOf(chain * 10_000 + draw), row.get(4));
      assertTrue(seen.add(chain + ":" + draw));
    }
  }

  @Test
  void labelsWithCommasAreQuoted() throws IOException {
    try (DrawsWriter writer = DrawsWriter.open(folder, List.of("X[1,2]", "odd\"name"))) {
      writer.accept(0, 1, new double[] {1, 2});
    }
    String header = Files.readAllLines(folder.resolve(DrawsWriter.FILE_NAME)).get(0);
    // X[1,2] needs no quotes inside brackets for a human, but a CSV reader splits on the comma.
    assertEquals("chain,draw,\"X[1,2]\",\"odd\"\"name\"", header);
    assertEquals(List.of("chain", "draw", "X[1,2]", "odd\"name"),
        read(folder.resolve(DrawsWriter.FILE_NAME)).get(0).toList());
  }

  @Test
  void aRowOfTheWrongWidthIsRejected() {
    try (DrawsWriter writer = DrawsWriter.open(folder, List.of("a", "b"))) {
      IllegalArgumentException e =
          assertThrows(IllegalArgumentException.class, () -> writer.accept(0, 1, new double[1]));
      assertTrue(e.getMessage().contains("2 values"));
    }
  }
}

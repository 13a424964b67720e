package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
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

  /**
   * A disk that fills after {@code room} bytes: the write that crosses it puts down what fits (as
   * a real full disk does) and fails with ENOSPC's message.
   */
  private static RowWrites diskWithRoomFor(long room) {
    long[] used = {0};
    return (channel, bytes) -> {
      long left = room - used[0];
      if (bytes.remaining() <= left) {
        int written = channel.write(bytes);
        used[0] += written;
        return written;
      }
      java.nio.ByteBuffer part = bytes.duplicate();
      part.limit(part.position() + (int) left);
      used[0] += channel.write(part);
      throw new IOException("No space left on device");
    };
  }

  @Test
  void aWriteThatFailsMidRowLeavesWholeRowsOnlyAndEveryRowBeforeTheFailedWrite()
      throws IOException {
    // 200 kB of room: rows of about 60 bytes, so the failure falls inside the fourth 64 KiB
    // write, in the middle of a row (checked below: the room is not a whole number of rows).
    long room = 200_000;
    DrawsWriter writer = DrawsWriter.open(folder, List.of("a", "b", "c"), diskWithRoomFor(room));
    UncheckedIOException failure = assertThrows(UncheckedIOException.class, () -> {
      for (int draw = 1; draw <= 100_000; draw++) {
        writer.accept(0, draw, new double[] {Math.PI * draw, -Math.E / draw, 1e-7 * draw});
      }
    });
    assertTrue(failure.getMessage().contains("No space left on device"), failure.getMessage());
    assertThrows(UncheckedIOException.class, writer::close);
    String text = Files.readString(folder.resolve(DrawsWriter.FILE_NAME));
    assertTrue(text.length() < room, "the cut-off part was removed");
    assertTrue(text.endsWith("\n"), "ends with a whole row");
    List<CSVRecord> rows = read(folder.resolve(DrawsWriter.FILE_NAME));
    for (int i = 1; i < rows.size(); i++) {
      assertEquals(5, rows.get(i).size(), "row " + i);
      assertEquals(i, Integer.parseInt(rows.get(i).get(1)), "draws in order, none missing");
    }
    assertTrue(rows.size() > 1000, "the rows written before the failed write are kept");
  }

  @Test
  void aDiskWithNoRoomForTheHeaderLeavesNoDrawsFile() {
    Path out = folder.resolve("none");
    assertThrows(UncheckedIOException.class,
        () -> DrawsWriter.open(out, List.of("a"), diskWithRoomFor(3)));
    assertTrue(!Files.exists(out.resolve(DrawsWriter.FILE_NAME)));
  }
}

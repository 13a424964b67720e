package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Continuing a draws file: kept rows stay as they were, a cut last line and extra rows go. */
class DrawsWriterResumeTest {
  @TempDir Path folder;

  private static final List<String> COLUMNS = List.of("a", "X[1,2]");

  private void writeFile(String body) throws Exception {
    Files.writeString(
        folder.resolve("draws.csv"), "chain,draw,a,\"X[1,2]\"\n" + body, StandardCharsets.UTF_8);
  }

  @Test
  void aCutLastLineIsDroppedAndRowsAreAppendedAfterTheKeptOnes() throws Exception {
    writeFile("1,1,0.5,NaN\n2,1,inf,-inf\n1,2,1.25,3\n2,2,7.");
    List<String> handed = new ArrayList<>();
    try (DrawsWriter writer =
        DrawsWriter.resume(
            folder, COLUMNS, new int[] {2, 1},
            (chain, draw,
                values) -> handed.add(chain + ":" + draw + ":" + values[0] + ":" + values[1]))) {
      writer.accept(1, 2, new double[] {2.5, -1});
    }
    assertEquals(List.of("0:1:0.5:NaN", "1:1:Infinity:-Infinity", "0:2:1.25:3.0"), handed);
    assertEquals(
        "chain,draw,a,\"X[1,2]\"\n1,1,0.5,NaN\n2,1,inf,-inf\n1,2,1.25,3\n2,2,2.5,-1\n",
        Files.readString(folder.resolve("draws.csv"), StandardCharsets.UTF_8));
  }

  @Test
  void rowsBeyondTheCheckpointAreDropped() throws Exception {
    writeFile("1,1,0.5,1\n1,2,0.75,1\n1,3,0.8,1\n");
    try (DrawsWriter writer = DrawsWriter.resume(folder, COLUMNS, new int[] {2}, (c, d, v) -> {})) {
      writer.flush();
    }
    assertEquals(
        "chain,draw,a,\"X[1,2]\"\n1,1,0.5,1\n1,2,0.75,1\n",
        Files.readString(folder.resolve("draws.csv"), StandardCharsets.UTF_8));
  }

  @Test
  void missingRowsOrOtherColumnsAreRefused() throws Exception {
    writeFile("1,1,0.5,1\n");
    CheckpointException fewer =
        assertThrows(
            CheckpointException.class,
            () -> DrawsWriter.resume(folder, COLUMNS, new int[] {2}, (c, d, v) -> {}));
    assertTrue(fewer.getMessage().contains("has 1 draws of chain 1, the checkpoint 2"),
        fewer.getMessage());
    CheckpointException other =
        assertThrows(
            CheckpointException.class,
            () -> DrawsWriter.resume(folder, List.of("b"), new int[] {1}, (c, d, v) -> {}));
    assertTrue(other.getMessage().contains("does not start with the header"), other.getMessage());
    Files.delete(folder.resolve("draws.csv"));
    assertThrows(
        CheckpointException.class,
        () -> DrawsWriter.resume(folder, COLUMNS, new int[] {0}, (c, d, v) -> {}));
  }

  /**
   * The kept rows are read by the one number grammar (lang.NumberSyntax, issue 14): Java's 22d,
   * 0x1.6p4 and 2.2e1f, which Double.parseDouble read as 22, are refused at file:line:column.
   */
  @Test
  void drawsInJavasNumberSyntaxAreRefusedAtTheirLineAndColumn() throws Exception {
    for (String bad : List.of("22d", "0x1.6p4", "2.2e1f")) {
      writeFile("1,1,0.5,1\n1,2,0.75," + bad + "\n");
      CheckpointException refused =
          assertThrows(
              CheckpointException.class,
              () -> DrawsWriter.resume(folder, COLUMNS, new int[] {2}, (c, d, v) -> {}), bad);
      assertEquals(folder.resolve("draws.csv") + ":3:10: not a draw: '" + bad + "' is not a number",
          refused.getMessage());
    }
    writeFile("1,1,0.5,1\n1,2d,0.75,1\n");
    CheckpointException draw =
        assertThrows(
            CheckpointException.class,
            () -> DrawsWriter.resume(folder, COLUMNS, new int[] {2}, (c, d, v) -> {}));
    assertEquals(folder.resolve("draws.csv") + ":3:3: not a row of draws: '2d' is not a number",
        draw.getMessage());
  }
}

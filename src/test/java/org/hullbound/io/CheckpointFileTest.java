package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.hullbound.gibbs.ChainState;
import org.hullbound.gibbs.KernelState;
import org.hullbound.gibbs.UpdaterState;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The checkpoint file: every number comes back with the same bits (NaN, infinities, -0.0 and
 * subnormals included), names and notes with any character, and a damaged file is refused with a
 * message saying where.
 */
class CheckpointFileTest {
  @TempDir Path folder;

  private static Checkpoint sample() {
    double[] values = {1.5, -0.0, Double.NaN, Double.POSITIVE_INFINITY, Double.MIN_VALUE, -3e300};
    List<UpdaterState> updaters =
        List.of(
            new UpdaterState(new long[] {7, -1, Long.MIN_VALUE}, null),
            new UpdaterState(new long[0], "switched at sweep 3: h(x) = -0.5\nsecond line \\ back"));
    List<ChainState> chains = new ArrayList<>();
    chains.add(new ChainState(0, 0, new long[] {1, 2, 3, 4}, new KernelState(values, updaters)));
    chains.add(new ChainState(250, 100, new long[] {-5, 6, -7, 8},
        new KernelState(values, updaters)));
    return new Checkpoint(
        false, "models/a b.hbm", CheckpointFile.inputHash("model", List.of("x\n1\n")), -42L, 50,
        100, 2, List.of("centre", "X[2,1]", "name \"quoted\""), chains);
  }

  @Test
  void aCheckpointComesBackBitForBit() {
    Checkpoint written = sample();
    CheckpointFile.write(folder, written);
    Checkpoint read = CheckpointFile.read(folder);
    assertEquals(written.modelFile(), read.modelFile());
    assertEquals(written.inputHash(), read.inputHash());
    assertEquals(written.seed(), read.seed());
    assertEquals(written.burnIn(), read.burnIn());
    assertEquals(written.draws(), read.draws());
    assertEquals(written.thin(), read.thin());
    assertEquals(written.columns(), read.columns());
    assertFalse(read.complete());
    for (int chain = 0; chain < 2; chain++) {
      ChainState a = written.chains().get(chain);
      ChainState b = read.chains().get(chain);
      assertEquals(a.sweep(), b.sweep());
      assertEquals(a.draws(), b.draws());
      assertArrayEquals(a.generator(), b.generator());
      assertEquals(a.kernel(), b.kernel(), "values by their bits and updater states");
    }
    assertEquals(1.0 / -0.0, 1.0 / read.chains().get(0).kernel().values()[1], "-0.0 kept");
    CheckpointFile.write(folder, read.completed());
    assertTrue(CheckpointFile.read(folder).complete());
  }

  @Test
  void theHashChangesWithTheModelOrTheDataOrWhereTextSits() {
    String base = CheckpointFile.inputHash("model", List.of("a", "b"));
    assertEquals(base, CheckpointFile.inputHash("model", List.of("a", "b")));
    assertNotEquals(base, CheckpointFile.inputHash("model ", List.of("a", "b")));
    assertNotEquals(base, CheckpointFile.inputHash("model", List.of("a", "c")));
    assertNotEquals(base, CheckpointFile.inputHash("model", List.of("ab", "")));
    // A SHA-256 digest is 256 bits: 64 hexadecimal digits (FIPS 180-4).
    assertEquals(64, base.length());
  }

  @Test
  void aMissingCheckpointIsNamed() {
    CheckpointException missing =
        assertThrows(CheckpointException.class, () -> CheckpointFile.read(folder));
    assertTrue(missing.getMessage().contains("no checkpoint in"), missing.getMessage());
  }

  @Test
  void aChangedDigitIsFoundByTheCheckLine() throws Exception {
    CheckpointFile.write(folder, sample());
    Path file = CheckpointFile.in(folder);
    String text = Files.readString(file, StandardCharsets.UTF_8);
    Files.writeString(file, text.replace("sweep 250", "sweep 251"), StandardCharsets.UTF_8);
    CheckpointException damaged =
        assertThrows(CheckpointException.class, () -> CheckpointFile.read(folder));
    assertTrue(damaged.getMessage().contains("is damaged"), damaged.getMessage());
    assertTrue(damaged.getMessage().contains("check value"), damaged.getMessage());
  }

  @Test
  void aCutFileIsRefused() throws Exception {
    CheckpointFile.write(folder, sample());
    Path file = CheckpointFile.in(folder);
    String text = Files.readString(file, StandardCharsets.UTF_8);
    Files.writeString(file, text.substring(0, text.length() / 2), StandardCharsets.UTF_8);
    CheckpointException damaged =
        assertThrows(CheckpointException.class, () -> CheckpointFile.read(folder));
    assertTrue(damaged.getMessage().contains("is damaged"), damaged.getMessage());
  }

  @Test
  void aFileWithAValidCheckButBadContentSaysWhichLine() {
    String body = "hullbound checkpoint, format " + CheckpointFile.FORMAT + "\nstatus: paused\n";
    java.util.zip.CRC32 crc = new java.util.zip.CRC32();
    crc.update(body.getBytes(StandardCharsets.UTF_8));
    String text = body + String.format("check: %08x%n", crc.getValue()).replace("\r", "");
    CheckpointException damaged =
        assertThrows(CheckpointException.class, () -> CheckpointFile.parse("c.txt", text));
    assertTrue(damaged.getMessage().contains("line 2"), damaged.getMessage());
  }

  /**
   * A checkpoint of another format (an older build's, or a newer one's) is refused by its format
   * before its words are read with a layout that is not theirs; the message names both formats.
   * A whole format-1 file from an older build is refused end to end in {@code
   * cli.OldCheckpointTest}.
   */
  @Test
  void aCheckpointOfAnotherFormatIsRefusedNamingBothFormats() throws Exception {
    CheckpointFile.write(folder, sample());
    String current = Files.readString(CheckpointFile.in(folder), StandardCharsets.UTF_8);
    assertTrue(current.startsWith("hullbound checkpoint, format 2\n"), current);
    for (String other : List.of("1", "3")) {
      String text = rechecked(current.replaceFirst("format 2", "format " + other));
      CheckpointException refused =
          assertThrows(CheckpointException.class, () -> CheckpointFile.parse("c.txt", text));
      assertTrue(
          refused.getMessage().contains("c.txt is in format " + other)
              && refused.getMessage().contains("reads format 2 only"),
          refused.getMessage());
    }
    assertEquals(sample().chains().size(), CheckpointFile.parse("c.txt", current).chains().size());
  }

  /**
   * {@code text} with a check line that fits it, as a hand edit that also fixed the check would.
   */
  private static String rechecked(String text) {
    String body = text.substring(0, text.lastIndexOf("check: "));
    java.util.zip.CRC32 crc = new java.util.zip.CRC32();
    crc.update(body.getBytes(StandardCharsets.UTF_8));
    return body + String.format("check: %08x", crc.getValue()) + "\n";
  }

  /** The 1-based number of the line of {@code text} that starts with {@code start}. */
  private static int lineOf(String text, String start) {
    List<String> lines = text.lines().toList();
    for (int i = 0; i < lines.size(); i++) {
      if (lines.get(i).startsWith(start)) {
        return i + 1;
      }
    }
    throw new AssertionError(start);
  }

  /**
   * Numbers in the checkpoint are read by the one number grammar (lang.NumberSyntax, issue 14):
   * Java's suffixes and hexadecimal forms, a plus sign and non-ASCII digits (which
   * Integer.parseInt took: "+22" and Arabic-Indic "\u0662\u0662" were read as 22) are refused at
   * file:line:column.
   */
  @Test
  void numbersOutsideTheLanguagesGrammarAreRefusedAtTheirLineAndColumn() throws Exception {
    CheckpointFile.write(folder, sample());
    String text = Files.readString(CheckpointFile.in(folder), StandardCharsets.UTF_8);
    for (String bad : List.of("22d", "0x1.6p4", "2.2e1f", "+22", "\u0662\u0662")) {
      String edited = rechecked(text.replace("thin: 2\n", "thin: " + bad + "\n"));
      CheckpointException refused =
          assertThrows(CheckpointException.class, () -> CheckpointFile.parse("c.txt", edited), bad);
      assertTrue(refused.getMessage().startsWith("c.txt:" + lineOf(edited, "thin:") + ":7: the"
          + " checkpoint is damaged: '" + bad + "' is not a number"), refused.getMessage());
    }
    String seed = rechecked(text.replace("seed: -42\n", "seed: 2.2e1f\n"));
    CheckpointException refused =
        assertThrows(CheckpointException.class, () -> CheckpointFile.parse("c.txt", seed));
    assertTrue(refused.getMessage().startsWith("c.txt:" + lineOf(seed, "seed:") + ":7: "),
        refused.getMessage());
    // in a chain's line: "chain 2: sweep 250, draws 100", the draws at column 27
    String draws = rechecked(text.replace("sweep 250, draws 100", "sweep 250, draws 22d"));
    refused = assertThrows(CheckpointException.class, () -> CheckpointFile.parse("c.txt", draws));
    assertTrue(refused.getMessage().startsWith("c.txt:" + lineOf(draws, "chain 2:") + ":27: "),
        refused.getMessage());
    String sweep = rechecked(text.replace("sweep 250, draws 100", "sweep 0x1.6p4, draws 100"));
    refused = assertThrows(CheckpointException.class, () -> CheckpointFile.parse("c.txt", sweep));
    assertTrue(refused.getMessage().startsWith("c.txt:" + lineOf(sweep, "chain 2:") + ":16: "),
        refused.getMessage());
  }
}

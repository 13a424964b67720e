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
    chains.add(new ChainState(250, 100, new long[] {-5, 6, -7, 8}, new KernelState(values, updaters)));
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
    String body = "hullbound checkpoint, format 1\nstatus: paused\n";
    java.util.zip.CRC32 crc = new java.util.zip.CRC32();
    crc.update(body.getBytes(StandardCharsets.UTF_8));
    String text = body + String.format("check: %08x%n", crc.getValue()).replace("\r", "");
    CheckpointException damaged =
        assertThrows(CheckpointException.class, () -> CheckpointFile.parse("c.txt", text));
    assertTrue(damaged.getMessage().contains("line 2"), damaged.getMessage());
  }
}

package org.hullbound.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The target is always either the old file or the whole new one, and no temporary file stays. */
class ReportWriterTest {

  private static List<Path> listing(Path folder) throws IOException {
    try (Stream<Path> files = Files.list(folder)) {
      return files.sorted().toList();
    }
  }

  @Test
  void writesTheTextAsUtf8AndLeavesOnlyTheTarget(@TempDir Path folder) throws IOException {
    Path target = folder.resolve("report.html");
    ReportWriter.writeAtomically(target, "<p>μ ≤ 2 &amp; ✓</p>");
    assertEquals("<p>μ ≤ 2 &amp; ✓</p>", Files.readString(target, StandardCharsets.UTF_8));
    assertEquals(List.of(target), listing(folder));
  }

  @Test
  void replacesAnOlderReport(@TempDir Path folder) throws IOException {
    Path target = folder.resolve("report.html");
    Files.writeString(target, "old");
    ReportWriter.writeAtomically(target, "new");
    assertEquals("new", Files.readString(target));
    assertEquals(List.of(target), listing(folder));
  }

  @Test
  void aFailureHalfwayThroughWritingLeavesTheOldFileWholeAndNoTemporary(@TempDir Path folder)
      throws IOException {
    // An unpaired surrogate cannot be encoded as UTF-8: the encoder fails after the first
    // megabyte has already gone to the temporary file, a real mid-write failure.
    Path target = folder.resolve("report.html");
    Files.writeString(target, "the previous, complete report");
    String broken = "x".repeat(1 << 20) + "\uD800" + "y".repeat(1000);
    assertThrows(
        CharacterCodingException.class, () -> ReportWriter.writeAtomically(target, broken));
    assertEquals("the previous, complete report", Files.readString(target));
    assertEquals(List.of(target), listing(folder));
  }

  @Test
  void aReaderAlongsideTheWriterNeverSeesAPartialFile(@TempDir Path folder) throws Exception {
    Path target = folder.resolve("report.html");
    int size = 1 << 20;
    String a = "a".repeat(size);
    String b = "b".repeat(size);
    ReportWriter.writeAtomically(target, a);
    AtomicBoolean writing = new AtomicBoolean(true);
    AtomicInteger reads = new AtomicInteger();
    AtomicReference<String> bad = new AtomicReference<>();
    Thread reader =
        new Thread(
            () -> {
              while (writing.get() && bad.get() == null) {
                try {
                  String seen = Files.readString(target);
                  reads.incrementAndGet();
                  if (!(seen.equals(a) || seen.equals(b))) {
                    bad.set("read " + seen.length() + " characters starting " + seen.charAt(0));
                  }
                } catch (IOException e) {
                  bad.set("read failed: " + e);
                }
              }
            });
    reader.start();
    for (int i = 0; i < 30; i++) {
      ReportWriter.writeAtomically(target, i % 2 == 0 ? b : a);
    }
    writing.set(false);
    reader.join();
    assertEquals(null, bad.get());
    assertTrue(reads.get() > 0, "the reader ran");
    assertEquals(List.of(target), listing(folder));
  }

  @Test
  void aFailedMoveLeavesNoTemporary(@TempDir Path folder) throws IOException {
    // A non-empty folder in the target's place cannot be replaced: the move itself fails.
    Path target = folder.resolve("report.html");
    Files.createDirectory(target);
    Files.writeString(target.resolve("keep.txt"), "inside");
    assertThrows(IOException.class, () -> ReportWriter.writeAtomically(target, "new"));
    assertEquals(List.of(target), listing(folder));
    assertEquals("inside", Files.readString(target.resolve("keep.txt")));
  }

  @Test
  void aMissingFolderIsAnIoErrorAndBadArgumentsAreNamed(@TempDir Path folder) {
    assertThrows(
        IOException.class,
        () -> ReportWriter.writeAtomically(folder.resolve("no/such/report.html"), "x"));
    IllegalArgumentException e =
        assertThrows(IllegalArgumentException.class, () -> ReportWriter.writeAtomically(null, "x"));
    assertTrue(e.getMessage().contains("target"), e.getMessage());
  }
}

package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.stream.Stream;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class AtomicFilesTest {
  @TempDir Path folder;

  @Test
  void replacesTheTargetAndLeavesNoTemporaryFileBehind() throws IOException {
    Path target = folder.resolve("deep/summary.csv");
    AtomicFiles.write(target, "old\n");
    AtomicFiles.write(target, "name,mean\nmu,1.5\n");
    assertEquals("name,mean\nmu,1.5\n", Files.readString(target));
    try (Stream<Path> files = Files.list(target.getParent())) {
      assertEquals(1, files.count());
    }
  }

  /** The written file gets a new file's permissions (the umask's), not a temporary's owner-only. */
  @Test
  void theFileHasTheSamePermissionsAsAnyNewFileInTheFolder() throws IOException {
    Assumptions.assumeTrue(
        folder.getFileSystem().supportedFileAttributeViews().contains("posix"), "POSIX only");
    Path plain = Files.createFile(folder.resolve("plain.txt"));
    Path written = folder.resolve("summary.csv");
    AtomicFiles.write(written, "x\n");
    assertEquals(Files.getPosixFilePermissions(plain), Files.getPosixFilePermissions(written));
  }
}

package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A stop during start-up (a signal's hook, on another thread than the one preparing the run)
 * releases the folder's lock whenever it comes: the preparing thread does not get to (issue 14).
 */
class StartupGuardTest {
  @TempDir Path folder;

  @Test
  void aStopAfterTheLockReleasesItAndRemovesTheFolderItMade() throws Exception {
    Path out = folder.resolve("new").resolve("run");
    StartupGuard guard = StartupGuard.create();
    guard.lock(out);
    assertTrue(Files.readString(out.resolve(FolderLock.FILE_NAME)).startsWith("pid "));
    guard.stop(); // injected where a signal would come, the preparing thread still holding the lock
    assertFalse(Files.exists(folder.resolve("new")), "the folders the run made are gone");
    try (FolderLock next = FolderLock.take(out)) {
      assertTrue(next.takenOver().isEmpty(), "the next run finds no stale lock");
    }
  }

  @Test
  void aStopAfterTheLockInAnEarlierFolderLeavesAnEmptyLockFile() throws Exception {
    StartupGuard guard = StartupGuard.create();
    guard.lock(folder);
    guard.stop();
    assertEquals("", Files.readString(folder.resolve(FolderLock.FILE_NAME)));
    try (FolderLock next = FolderLock.take(folder)) {
      assertTrue(next.takenOver().isEmpty(), "the next run finds no stale lock");
    }
  }

  @Test
  void aStopBeforeTheLockRefusesIt() {
    StartupGuard guard = StartupGuard.create();
    guard.stop();
    Path out = folder.resolve("run");
    assertThrows(StartupStoppedException.class, () -> guard.lock(out));
    assertFalse(Files.exists(out), "nothing was created");
    assertTrue(guard.stopped());
  }
}

package org.hullbound.app;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.InetAddress;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.channels.OverlappingFileLockException;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryNotEmptyException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.hullbound.io.Closing;

/**
 * One run per output folder: an exclusive operating-system lock ({@link FileChannel#tryLock()}) on
 * the file {@value #FILE_NAME} in the folder, which holds the running run's process id, host and
 * start time so that a second run can name it.
 *
 * <p>The operating system drops the lock when the process ends, however it ends; a lock file that
 * still names a run but is not locked was left by a run that was killed, and is taken over (with
 * {@link #takenOver()} saying whose it was). The file stays in the folder, emptied on release:
 * deleting it would let a run that opened it just before the delete lock a file no longer in the
 * folder while a third run locks a new one.
 *
 * <p>Operating-system locks belong to the whole process, and on Linux closing any descriptor of
 * the file drops them; so locks held by this process are also kept in a table and a second take in
 * the same process is refused from it without opening the file again.
 */
public final class FolderLock implements AutoCloseable {
  /** The lock file's name inside the folder. */
  public static final String FILE_NAME = "run.lock";

  /** Folders locked by this process, by the lock file's absolute path. */
  private static final Map<Path, String> HELD_HERE = new HashMap<>();

  private final Path folder;
  private final Path file;
  private final FileChannel channel;
  private final FileLock lock;
  private final List<Path> created;
  private final String takenOver;
  private boolean released;

  private FolderLock(
      Path folder, Path file, FileChannel channel, FileLock lock, List<Path> created,
      String takenOver) {
    this.folder = folder;
    this.file = file;
    this.channel = channel;
    this.lock = lock;
    this.created = created;
    this.takenOver = takenOver;
  }

  /**
   * Creates {@code folder} if needed (remembering which folders it made, so that {@link
   * #releaseAndRemoveIfEmpty()} can take them away again) and locks it for this run.
   *
   * @throws RunRefusedException when another run holds the folder, naming it
   */
  public static FolderLock take(Path folder) {
    Path absolute = folder.toAbsolutePath().normalize();
    Path file = absolute.resolve(FILE_NAME);
    synchronized (HELD_HERE) {
      String holder = HELD_HERE.get(file);
      if (holder != null) {
        throw inUse(folder, holder);
      }
      List<Path> created = createFolders(absolute);
      FileChannel channel = null;
      try {
        channel =
            FileChannel.open(
                file, StandardOpenOption.CREATE, StandardOpenOption.READ, StandardOpenOption.WRITE);
        FileLock lock;
        try {
          lock = channel.tryLock();
        } catch (OverlappingFileLockException inThisProcess) {
          lock = null;
        }
        if (lock == null) {
          String other = read(channel);
          channel.close();
          throw inUse(folder, other.isBlank() ? "a run that is just starting" : other);
        }
        String earlier = read(channel);
        String me = describeThisRun();
        channel.truncate(0);
        channel.write(ByteBuffer.wrap((me + "\n").getBytes(StandardCharsets.UTF_8)), 0);
        channel.force(true);
        HELD_HERE.put(file, me);
        return new FolderLock(
            folder, file, channel, lock, created, earlier.isBlank() ? null : earlier.strip());
      } catch (IOException e) {
        Closing.quietly(channel);
        removeEmpty(created);
        throw new UncheckedIOException(
            "cannot lock the output folder " + folder + " (" + file + "): " + e.getMessage(), e);
      } catch (RuntimeException refused) {
        removeEmpty(created);
        throw refused;
      }
    }
  }

  /** The locked folder, as given. */
  public Path folder() {
    return folder;
  }

  /**
   * The run that held the folder before and ended without releasing it (killed, or its machine
   * stopped), as its lock file named it; empty when the folder was free.
   */
  public Optional<String> takenOver() {
    return Optional.ofNullable(takenOver);
  }

  /** Empties the lock file and releases the folder; later calls do nothing. */
  @Override
  public void close() {
    synchronized (HELD_HERE) {
      if (released) {
        return;
      }
      released = true;
      HELD_HERE.remove(file);
      try {
        channel.truncate(0);
        lock.release();
      } catch (IOException e) {
        // The lock goes with the channel below; an unemptied file only reads as a stale lock.
      } finally {
        Closing.quietly(channel);
      }
    }
  }

  /**
   * Releases the folder and, when this run created it and nothing but the lock file is in it,
   * removes the lock file and the folders it created: a run that failed before writing anything
   * leaves no empty folder behind.
   */
  public void releaseAndRemoveIfEmpty() {
    close();
    if (created.isEmpty()) {
      return;
    }
    try (var entries = Files.list(file.getParent())) {
      if (entries.allMatch(entry -> entry.getFileName().toString().equals(FILE_NAME))) {
        Files.deleteIfExists(file);
      }
    } catch (IOException e) {
      return;
    }
    removeEmpty(created);
  }

  private static RunRefusedException inUse(Path folder, String holder) {
    return new RunRefusedException(
        "the folder " + folder + " is in use by another run (" + holder + "); wait for it to end,"
            + " or give another --out");
  }

  /** Creates the missing folders on the way to {@code folder}; returns them, deepest first. */
  private static List<Path> createFolders(Path folder) {
    List<Path> missing = new ArrayList<>();
    for (Path p = folder; p != null && !Files.exists(p); p = p.getParent()) {
      missing.add(p);
    }
    try {
      Files.createDirectories(folder);
    } catch (IOException e) {
      removeEmpty(missing);
      throw new UncheckedIOException("cannot create the output folder " + folder + ": " + e, e);
    }
    return missing;
  }

  /**
   * Deletes each folder of {@code folders} (deepest first) that is empty; stops at one that is not.
   */
  private static void removeEmpty(List<Path> folders) {
    for (Path p : folders) {
      try {
        Files.deleteIfExists(p);
      } catch (DirectoryNotEmptyException used) {
        return;
      } catch (IOException e) {
        return;
      }
    }
  }

  private static String read(FileChannel channel) throws IOException {
    ByteBuffer buffer = ByteBuffer.allocate((int) Math.min(4096, Math.max(0, channel.size())));
    channel.read(buffer, 0);
    return new String(buffer.array(), 0, buffer.position(), StandardCharsets.UTF_8).strip();
  }

  private static String describeThisRun() {
    String host;
    try {
      host = InetAddress.getLocalHost().getHostName();
    } catch (IOException unknown) {
      host = "an unnamed host";
    }
    return "pid " + ProcessHandle.current().pid() + " on " + host + ", started "
        + OffsetDateTime.now(ZoneOffset.UTC).truncatedTo(ChronoUnit.SECONDS);
  }
}

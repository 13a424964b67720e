package org.hullbound.app;

import java.nio.file.Path;

/**
 * Lets a signal stop a run while it starts ({@link FitRun#prepare(FitRequest, PredictiveOptions,
 * StartupGuard)}) without leaving its folder locked: the folder lock is taken through this guard,
 * and {@link #stop()} releases it, from whatever thread the signal runs on.
 *
 * <p>Why here and not in {@link FitRun#close()}: a JVM ending on a signal runs its shutdown hooks
 * and then halts, so the thread that is preparing the run never reaches its {@code finally}; the
 * lock file then kept the run's process id and read as a stale lock to the next run. Taking the
 * lock and stopping are exclusive (one monitor), so the lock is either taken before the stop,
 * and released by it, or refused after it.
 */
public final class StartupGuard {
  private FolderLock lock;
  private boolean stopped;

  private StartupGuard() {}

  /** A guard that has not been stopped. */
  public static StartupGuard create() {
    return new StartupGuard();
  }

  /**
   * Locks {@code folder} for the run being prepared.
   *
   * @throws StartupStoppedException when {@link #stop()} came first
   * @throws RunRefusedException when another run holds the folder
   */
  synchronized FolderLock lock(Path folder) {
    if (stopped) {
      throw new StartupStoppedException();
    }
    lock = FolderLock.take(folder);
    return lock;
  }

  /**
   * Stops the start-up: releases the folder if it was locked (removing the folders the run
   * created while they hold nothing else), and refuses a lock asked for later. Once sampling has
   * begun the run's own stop applies instead; calling this then would release a folder in use.
   */
  public synchronized void stop() {
    stopped = true;
    if (lock != null) {
      lock.releaseAndRemoveIfEmpty();
    }
  }

  /** Whether {@link #stop()} was called. */
  public synchronized boolean stopped() {
    return stopped;
  }
}

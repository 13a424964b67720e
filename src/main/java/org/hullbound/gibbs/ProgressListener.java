package org.hullbound.gibbs;

/**
 * Told how each chain advances, a few times a second, so that a front end can show it.
 *
 * <p>The runner computes the figures; printing belongs to the caller (the CLI). Called from the
 * chain threads: implementations must be thread-safe and quick.
 */
@FunctionalInterface
public interface ProgressListener {

  void progress(ChainProgress progress);

  /** A listener that ignores every report. */
  static ProgressListener none() {
    return progress -> { };
  }
}

package org.hullbound.app;

/**
 * A run stopped by a signal while it started, before it locked its folder or wrote anything. The
 * signal's handler has already said so; the command line ends without a further message.
 */
public final class StartupStoppedException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  StartupStoppedException() {
    super("stopped by a signal before sampling began; no file was written");
  }
}

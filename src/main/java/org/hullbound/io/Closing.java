package org.hullbound.io;

import java.io.Closeable;
import java.io.IOException;

/**
 * Closing a file on a path that is already failing or finishing, where a failure to close is not
 * the failure to report: the one home of "close quietly" for the draws writer and the folder lock.
 */
public final class Closing {
  private Closing() {}

  /**
   * Closes {@code resource} (nothing when null), dropping an {@link IOException}: the caller is
   * already reporting the failure that made it close, or closing releases all it holds (an
   * operating-system lock goes with its channel) whether or not the close reports an error.
   */
  public static void quietly(Closeable resource) {
    if (resource == null) {
      return;
    }
    try {
      resource.close();
    } catch (IOException ignored) {
      // see the method's comment
    }
  }
}

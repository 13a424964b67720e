package org.hullbound.app;

import java.nio.file.Path;

/**
 * A fit whose chains failed part way: the draws made before the failure are in {@link
 * #drawsFile()} (whole rows only), and no summary or report was written. The command line exits 1.
 */
public final class SamplingFailedException extends RuntimeException {
  private final transient Path drawsFile;

  public SamplingFailedException(String message, Path drawsFile, Throwable cause) {
    super(message, cause);
    this.drawsFile = drawsFile;
  }

  /** The draws file that holds every draw made before the failure. */
  public Path drawsFile() {
    return drawsFile;
  }
}

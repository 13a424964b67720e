package org.hullbound.io;

/**
 * A checkpoint that cannot be used: missing, damaged, or from another model, data or settings.
 *
 * <p>A checked-by-type failure so that the command line can say what is wrong and exit with the
 * usage status instead of printing a stack trace.
 */
public final class CheckpointException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  public CheckpointException(String message) {
    super(message);
  }
}

package org.hullbound.app;

/**
 * A run that must not start as asked, refused before it changes anything: an option out of range,
 * an output folder that is a file, holds an earlier run or is in use by another run, or draws that
 * would not fit the heap. The message says what to change; the command line exits 2.
 */
public final class RunRefusedException extends RuntimeException {
  public RunRefusedException(String message) {
    super(message);
  }
}

package org.hullbound.validation;

/**
 * A validation case folder is incomplete or malformed (a missing model or reference file, a bad
 * row), or a case or setting named by the caller does not exist.
 *
 * <p>Typed, so that the command line reports it as a usage error with the file named.
 */
public final class InvalidCaseException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  public InvalidCaseException(String message) {
    super(message);
  }
}

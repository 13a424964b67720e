package org.hullbound.gibbs;

/**
 * An updater failed (for example a conditional whose density is NaN, or a hull that found no
 * falling slope); names the unknown and the method, so that the user knows where to look.
 */
public final class UpdateFailedException extends RuntimeException {
  private final String unknown;

  public UpdateFailedException(String unknown, String method, RuntimeException cause) {
    super("updating " + unknown + " (" + method + "): " + cause.getMessage(), cause);
    this.unknown = unknown;
  }

  /** The label of the unknown whose update failed. */
  public String unknown() {
    return unknown;
  }
}

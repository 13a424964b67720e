package org.hullbound.app;

/**
 * A batch that could not go on: a unit's task failed rather than its fit (its worker ran out of
 * memory, a distributed engine gave the task up), or a table could not be written (a full disk).
 * The units that finished before are in the tables with whole rows, and the message says how
 * many and how to fit the others ({@code --resume}).
 */
public final class BatchStoppedException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  BatchStoppedException(String message, Throwable cause) {
    super(message, cause);
  }
}

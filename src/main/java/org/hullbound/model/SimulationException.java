package org.hullbound.model;

/**
 * A model cannot be simulated from: a prior or likelihood could not be drawn with the arguments
 * reached, or the model has a shape that simulation does not support.
 *
 * <p>Typed, so that the command line can report it as a model error rather than a crash.
 */
public final class SimulationException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  public SimulationException(String message) {
    super(message);
  }
}

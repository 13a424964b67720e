package org.hullbound.gibbs;

/**
 * A starting value given by the user ({@code --init}) that does not fit the model: an unknown
 * that does not exist, or a value outside its support.
 */
public final class StartingValueException extends RuntimeException {
  public StartingValueException(String message) {
    super(message);
  }
}

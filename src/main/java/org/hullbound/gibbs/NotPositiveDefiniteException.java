package org.hullbound.gibbs;

/**
 * A precision matrix that has no Cholesky factor: not symmetric positive definite.
 *
 * <p>Thrown instead of drawing from a normal with a meaningless covariance; in a model it usually
 * means an improper or collinear block of coefficients.
 */
public final class NotPositiveDefiniteException extends RuntimeException {
  public NotPositiveDefiniteException(String message) {
    super(message);
  }
}

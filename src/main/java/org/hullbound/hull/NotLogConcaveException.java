package org.hullbound.hull;

/**
 * The log density was seen to be not concave: a value above the upper hull or below a chord, or
 * slopes that do not decrease.
 *
 * <p>Adaptive rejection sampling is exact only for log-concave densities (Gilks and Wild 1992);
 * violations beyond the tolerance of {@link HullOptions#logConcavityTolerance()} stop sampling.
 */
public final class NotLogConcaveException extends HullException {

  NotLogConcaveException(String message, double x) {
    super(message, x);
  }
}

package org.hullbound.hull;

/**
 * The values of h are rounded more coarsely than the log-concavity tolerance, so the hull cannot
 * tell whether h lies under it: usually a large additive constant in h swamps its variation (h(x)
 * = g(x) + 1e12 is rounded to ulp(1e12) = 1.2e-4).
 *
 * <p>A log-density is defined only up to a constant, and the sampler's arithmetic works on
 * differences from a reference value, but the rounding of each value of h happened inside h,
 * before the sampler saw it. Rather than accept excesses of that size as rounding (a wrong
 * envelope by as much), the sampler refuses: subtract the constant from h, or raise {@link
 * HullOptions#withLogConcavityTolerance(double)} to at least the rounding named in the message.
 */
public final class ImpreciseDensityException extends HullException {

  ImpreciseDensityException(String message, double x) {
    super(message, x);
  }
}

package org.hullbound.model.family;

/**
 * Small functions evaluated in log space without overflow or cancellation: {@code log(1 - exp(a))},
 * {@code log(expit(x))}, {@code log(1 + exp(x))} and the log of a probability from its tails.
 *
 * <p>Probabilities of far tails underflow while their logs do not, so the families compute with
 * logs throughout; the switch points follow Maechler (2012), "Accurately computing log(1 - exp(-|a|))".
 */
public final class LogSpace {
  private static final double LN2 = Math.log(2.0);

  private LogSpace() {}

  /** {@code log(1 - exp(a))} for {@code a <= 0}; {@code -inf} at {@code a = 0}. */
  public static double log1mExp(double a) {
    // Maechler (2012): expm1 near 0, log1p further out, each where it keeps full precision.
    return a > -LN2 ? Math.log(-Math.expm1(a)) : Math.log1p(-Math.exp(a));
  }

  /** {@code log(1 + exp(x))} without overflow for large {@code x}. */
  public static double log1pExp(double x) {
    return x > 0 ? x + Math.log1p(Math.exp(-x)) : Math.log1p(Math.exp(x));
  }

  /** {@code log(expit(x)) = -log(1 + exp(-x))}, accurate for {@code |x|} up to and past 1e3. */
  public static double logInvLogit(double x) {
    return -log1pExp(-x);
  }

  /** {@code expit(x) = 1 / (1 + exp(-x))} without overflow. */
  public static double invLogit(double x) {
    if (x >= 0) {
      return 1.0 / (1.0 + Math.exp(-x));
    }
    double e = Math.exp(x);
    return e / (1.0 + e);
  }

  /** {@code log(exp(a) + exp(b))}. */
  public static double logSumExp(double a, double b) {
    double max = Math.max(a, b);
    if (max == Double.NEGATIVE_INFINITY) {
      return max;
    }
    return max + Math.log(Math.exp(a - max) + Math.exp(b - max));
  }

  /**
   * {@code log(F(hi) - F(lo))} from the logs of the lower tails {@code F} and upper tails {@code S =
   * 1 - F} at both ends, using whichever tails are small so that no difference of numbers near 1 is
   * formed.
   */
  public static double logProbabilityFromTails(
      double logLowerAtLo, double logUpperAtLo, double logLowerAtHi, double logUpperAtHi) {
    if (logLowerAtHi <= -LN2) {
      // Both ends in the lower half: F(hi) (1 - F(lo) / F(hi)).
      return logLowerAtHi + log1mExp(Math.min(0.0, logLowerAtLo - logLowerAtHi));
    }
    if (logUpperAtLo <= -LN2) {
      // Both ends in the upper half: S(lo) (1 - S(hi) / S(lo)).
      return logUpperAtLo + log1mExp(Math.min(0.0, logUpperAtHi - logUpperAtLo));
    }
    // lo below the median, hi above: 1 - F(lo) - S(hi), both terms < 1/2.
    return Math.log1p(-(Math.exp(logLowerAtLo) + Math.exp(logUpperAtHi)));
  }
}

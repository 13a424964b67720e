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
  // fdlibm's s_log1p.c (Sun Microsystems 1993, freely distributable): ln 2 split in two, and the
  // coefficients of its minimax polynomial R(z) ~ log((1 + s)/(1 - s)) / s - 2, each with its bits.
  private static final double LN2_HI = 6.93147180369123816490e-01; // 3fe62e42 fee00000
  private static final double LN2_LO = 1.90821492927058770002e-10; // 3dea39ef 35793c76
  private static final double LP1 = 6.666666666666735130e-01; // 3FE55555 55555593
  private static final double LP2 = 3.999999999940941908e-01; // 3FD99999 9997FA04
  private static final double LP3 = 2.857142874366239149e-01; // 3FD24924 94229359
  private static final double LP4 = 2.222219843214978396e-01; // 3FCC71C5 1D8E78AF
  private static final double LP5 = 1.818357216161805012e-01; // 3FC74664 96CB03DE
  private static final double LP6 = 1.531383769920937332e-01; // 3FC39A09 D078C69F
  private static final double LP7 = 1.479819860511658591e-01; // 3FC2F112 DF3E5244

  private LogSpace() {}

  /**
   * {@code log(1 + x)}, bit for bit {@link StrictMath#log1p} (fdlibm's algorithm, error below 1
   * ulp), written in Java: on Java 17 {@code Math.log1p} is a native call into fdlibm, whose
   * crossing cost more than the arithmetic, and the families call it once per observation term.
   * fdlibm's steps: write {@code 1 + x = 2^k (1 + f)} with {@code sqrt(2)/2 < 1 + f < sqrt(2)},
   * keep the rounding error of {@code 1 + x} as a correction {@code c}, then {@code log(1 + f) = f
   * - f^2/2 + s (f^2/2 + R(s^2))} with {@code s = f / (2 + f)}, and add {@code k ln 2} in two parts.
   */
  public static double log1p(double x) {
    int hx = (int) (Double.doubleToRawLongBits(x) >> 32);
    int ax = hx & 0x7fffffff;
    int k = 1;
    int hu = 0;
    double f = 0;
    double c = 0;
    if (hx < 0x3FDA827A) { // x < 0.41422
      if (ax >= 0x3ff00000) { // x <= -1.0
        return x == -1.0 ? Double.NEGATIVE_INFINITY : Double.NaN;
      }
      if (ax < 0x3e200000) { // |x| < 2^-29
        return ax < 0x3c900000 ? x : x - x * x * 0.5; // |x| < 2^-54: x itself
      }
      if (hx > 0 || hx <= 0xbfd2bec3) { // -0.2929 < x < 0.41422: no reduction
        k = 0;
        f = x;
        hu = 1;
      }
    }
    if (hx >= 0x7ff00000) {
      return x + x; // +inf or NaN
    }
    if (k != 0) {
      double u;
      if (hx < 0x43400000) {
        u = 1.0 + x;
        hu = (int) (Double.doubleToRawLongBits(u) >> 32);
        k = (hu >> 20) - 1023;
        c = k > 0 ? 1.0 - (u - x) : x - (u - 1.0); // the rounding error of 1 + x
        c /= u;
      } else {
        u = x;
        hu = (int) (Double.doubleToRawLongBits(u) >> 32);
        k = (hu >> 20) - 1023;
        c = 0;
      }
      hu &= 0x000fffff;
      long low = Double.doubleToRawLongBits(u) & 0xffffffffL;
      if (hu < 0x6a09e) { // normalise u to [1, sqrt(2))
        u = Double.longBitsToDouble(((long) (hu | 0x3ff00000) << 32) | low);
      } else { // or u/2 to [sqrt(2)/2, 1)
        k += 1;
        u = Double.longBitsToDouble(((long) (hu | 0x3fe00000) << 32) | low);
        hu = (0x00100000 - hu) >> 2;
      }
      f = u - 1.0;
    }
    double hfsq = 0.5 * f * f;
    if (hu == 0) { // |f| < 2^-20
      if (f == 0) {
        if (k == 0) {
          return 0;
        }
        c += k * LN2_LO;
        return k * LN2_HI + c;
      }
      double r = hfsq * (1.0 - 0.66666666666666666 * f);
      return k == 0 ? f - r : k * LN2_HI - ((r - (k * LN2_LO + c)) - f);
    }
    double s = f / (2.0 + f);
    double z = s * s;
    double r = z * (LP1 + z * (LP2 + z * (LP3 + z * (LP4 + z * (LP5 + z * (LP6 + z * LP7))))));
    return k == 0 ? f - (hfsq - s * (hfsq + r))
        : k * LN2_HI - ((hfsq - (s * (hfsq + r) + (k * LN2_LO + c))) - f);
  }

  /** {@code log(1 - exp(a))} for {@code a <= 0}; {@code -inf} at {@code a = 0}. */
  public static double log1mExp(double a) {
    // Maechler (2012): expm1 near 0, log1p further out, each where it keeps full precision.
    return a > -LN2 ? Math.log(-Math.expm1(a)) : log1p(-Math.exp(a));
  }

  /** {@code log(1 + exp(x))} without overflow for large {@code x}. */
  public static double log1pExp(double x) {
    return log1pExp(x, Math.exp(-Math.abs(x)));
  }

  /**
   * {@code log(1 + exp(x))} given {@code e = exp(-|x|)}: the one exponential that {@code log(1 +
   * exp(x))}, {@code log(1 + exp(-x))} and {@code expit(x)} all need, so that a caller wanting two
   * of them ({@code log expit} and its slope {@code expit}) pays for one. Bit for bit {@link
   * #log1pExp(double)}, which is this with {@code e} worked out.
   */
  public static double log1pExp(double x, double e) {
    return x > 0 ? x + log1p(e) : log1p(e);
  }

  /** {@code log(expit(x)) = -log(1 + exp(-x))}, accurate for {@code |x|} up to and past 1e3. */
  public static double logInvLogit(double x) {
    return -log1pExp(-x);
  }

  /** {@code expit(x) = 1 / (1 + exp(-x))} without overflow. */
  public static double invLogit(double x) {
    return invLogit(x, Math.exp(-Math.abs(x)));
  }

  /** {@code expit(x)} given {@code e = exp(-|x|)} (see {@link #log1pExp(double, double)}). */
  public static double invLogit(double x, double e) {
    return x >= 0 ? 1.0 / (1.0 + e) : e / (1.0 + e);
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
    return log1p(-(Math.exp(logLowerAtLo) + Math.exp(logUpperAtHi)));
  }
}

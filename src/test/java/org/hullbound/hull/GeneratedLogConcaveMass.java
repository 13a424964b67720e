package org.hullbound.hull;

import org.apache.commons.math3.special.Gamma;

/**
 * A log-concave mass on whole numbers for property tests, in one of four forms whose concavity is
 * known (each a sum of terms with non-increasing differences): Poisson {@code k log(rate) -
 * lgamma(k + 1)} on {@code k >= 0}; binomial {@code log C(n, k) + k logit(p)} on {@code 0..n};
 * negative binomial with size {@code >= 1}, {@code lgamma(k + size) - lgamma(k + 1) + k log(q)},
 * whose differences {@code log((k + size) / (k + 1)) + log q} fall when {@code size >= 1}; and a
 * discretised normal {@code -(k - centre)^2 / (2 var)} on all integers (Johnson, Kemp and Kotz,
 * Univariate Discrete Distributions, 3rd ed., 2005, on the first three; common practice).
 */
record GeneratedLogConcaveMass(Kind kind, double a, double b, double lower, double upper)
    implements LogMass {

  enum Kind { POISSON, BINOMIAL, NEGATIVE_BINOMIAL, NORMAL }

  static GeneratedLogConcaveMass poisson(double rate) {
    return new GeneratedLogConcaveMass(Kind.POISSON, rate, 0, 0, Double.POSITIVE_INFINITY);
  }

  static GeneratedLogConcaveMass binomial(int trials, double p) {
    return new GeneratedLogConcaveMass(Kind.BINOMIAL, trials, p, 0, trials);
  }

  static GeneratedLogConcaveMass negativeBinomial(double size, double q) {
    return new GeneratedLogConcaveMass(
        Kind.NEGATIVE_BINOMIAL, size, q, 0, Double.POSITIVE_INFINITY);
  }

  static GeneratedLogConcaveMass normal(double centre, double variance) {
    return new GeneratedLogConcaveMass(
        Kind.NORMAL, centre, variance, Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY);
  }

  @Override
  public double value(long k) {
    if (k < lower || k > upper) {
      return Double.NEGATIVE_INFINITY;
    }
    return switch (kind) {
      case POISSON -> k * Math.log(a) - Gamma.logGamma(k + 1.0);
      case BINOMIAL -> Gamma.logGamma(a + 1) - Gamma.logGamma(k + 1.0) - Gamma.logGamma(a - k + 1)
          + k * Math.log(b / (1 - b));
      case NEGATIVE_BINOMIAL -> Gamma.logGamma(k + a) - Gamma.logGamma(k + 1.0) + k * Math.log(b);
      case NORMAL -> -(k - a) * (k - a) / (2 * b);
    };
  }

  /** A whole number near the mode, for windows of checks. */
  long centre() {
    return switch (kind) {
      case POISSON -> (long) Math.floor(a);
      case BINOMIAL -> (long) Math.floor(a * b);
      case NEGATIVE_BINOMIAL -> (long) Math.floor(Math.max(0, (a - 1) * b / (1 - b)));
      case NORMAL -> Math.round(a);
    };
  }
}

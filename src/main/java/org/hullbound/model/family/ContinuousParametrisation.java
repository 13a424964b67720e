package org.hullbound.model.family;

import java.util.Arrays;

/**
 * A continuous parametrisation: adds the log lower and upper tails from which {@link
 * #logProbabilityBetween} is assembled, and the derivative of the distribution function.
 *
 * <p>When an argument enters only through a standardised value {@code z(x, theta)}, so that {@code
 * F(x; theta) = G(z)}, then {@code dF/dtheta = f(x) (dz/dtheta) / (dz/dx)}; {@link
 * #cdfSensitivity} returns that ratio, which gives closed forms for location and scale arguments.
 * Other arguments are differentiated numerically.
 */
abstract class ContinuousParametrisation extends BaseParametrisation {
  ContinuousParametrisation(Family family, SupportKind support, Object... namesAndDomains) {
    super(family, support, namesAndDomains);
  }

  /** {@code log F(x)} for {@code x} strictly inside the support. */
  abstract double logLowerTail(double x, double[] args);

  /** {@code log(1 - F(x))} for {@code x} strictly inside the support. */
  abstract double logUpperTail(double x, double[] args);

  /** Whether {@link #cdfSensitivity} has a closed form for argument {@code k}. */
  abstract boolean hasCdfSensitivity(int k);

  /** {@code r} with {@code dF(x)/d args[k] = f(x) r}, for {@code x} inside the support. */
  abstract double cdfSensitivity(int k, double x, double[] args);

  double lowerBound(double[] args) {
    return switch (support()) {
      case POSITIVE, UNIT_INTERVAL -> 0.0;
      case BETWEEN_FIRST_TWO_ARGUMENTS -> args[0];
      default -> Double.NEGATIVE_INFINITY;
    };
  }

  double upperBound(double[] args) {
    return switch (support()) {
      case UNIT_INTERVAL -> 1.0;
      case BETWEEN_FIRST_TWO_ARGUMENTS -> args[1];
      default -> Double.POSITIVE_INFINITY;
    };
  }

  private double logProbability(double lo, double hi, double[] args) {
    double lower = lowerBound(args);
    double upper = upperBound(args);
    double logLowerAtLo = lo <= lower ? Double.NEGATIVE_INFINITY : lo >= upper ? 0.0 : logLowerTail(lo, args);
    double logUpperAtLo = lo <= lower ? 0.0 : lo >= upper ? Double.NEGATIVE_INFINITY : logUpperTail(lo, args);
    double logLowerAtHi = hi <= lower ? Double.NEGATIVE_INFINITY : hi >= upper ? 0.0 : logLowerTail(hi, args);
    double logUpperAtHi = hi <= lower ? 0.0 : hi >= upper ? Double.NEGATIVE_INFINITY : logUpperTail(hi, args);
    return LogSpace.logProbabilityFromTails(logLowerAtLo, logUpperAtLo, logLowerAtHi, logUpperAtHi);
  }

  @Override
  public final double logProbabilityBetween(
      double lo, double hi, double[] args, double[] gradientOfArgs) {
    if (!(lo < hi)) {
      throw new IllegalArgumentException(
          "the truncation needs lo < hi, got lo = " + format(lo) + ", hi = " + format(hi));
    }
    return logProbabilityBetween(lo, hi, args, gradientOfArgs, 0);
  }

  /**
   * {@link #logProbabilityBetween(double, double, double[], double[])} for {@code lo < hi}, with
   * the derivative in {@code args[k]} written to {@code gradient[offset + k]}: a censored term
   * ({@link Censored}) fills a log-density gradient, whose arguments start at 1, without a copy.
   * {@code args} may be longer than this parametrisation's arity; the extra entries are not read.
   */
  final double logProbabilityBetween(
      double lo, double hi, double[] args, double[] gradient, int offset) {
    double logP = logProbability(lo, hi, args);
    if (logP == Double.NEGATIVE_INFINITY) {
      Arrays.fill(gradient, offset, offset + arity(), 0.0);
      return logP;
    }
    double lower = lowerBound(args);
    double upper = upperBound(args);
    double weightHi = hi > lower && hi < upper ? Math.exp(logDensity(hi, args) - logP) : 0.0;
    double weightLo = lo > lower && lo < upper ? Math.exp(logDensity(lo, args) - logP) : 0.0;
    for (int k = 0; k < arity(); k++) {
      if (hasCdfSensitivity(k)) {
        double termHi = weightHi == 0 ? 0.0 : weightHi * cdfSensitivity(k, hi, args);
        double termLo = weightLo == 0 ? 0.0 : weightLo * cdfSensitivity(k, lo, args);
        gradient[offset + k] = termHi - termLo;
      } else {
        gradient[offset + k] = numericalDerivative(a -> logProbability(lo, hi, a), args, k);
      }
    }
    return logP;
  }
}

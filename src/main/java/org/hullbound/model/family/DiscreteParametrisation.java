package org.hullbound.model.family;

import java.util.Arrays;

/**
 * A discrete parametrisation: a log mass on whole numbers, its log tails, and the probability of a
 * range of counts, whose argument derivatives are taken numerically.
 */
abstract class DiscreteParametrisation extends BaseParametrisation {
  DiscreteParametrisation(Family family, SupportKind support, Object... namesAndDomains) {
    super(family, support, namesAndDomains);
  }

  /** {@code log P(X <= n)} for a whole {@code n} with {@code 0 <= n < upperCount(args)}. */
  abstract double logLowerTail(double n, double[] args);

  /** {@code log P(X > n)} for a whole {@code n} with {@code 0 <= n < upperCount(args)}. */
  abstract double logUpperTail(double n, double[] args);

  /**
   * {@code (dP(X <= n)/d args[k]) / exp(logScale)} for a whole {@code n} with {@code 0 <= n <
   * upperCount(args)}; {@code NaN} when argument {@code k} has no closed form (it is then
   * differentiated numerically).
   */
  double cdfDerivative(int k, double n, double[] args, double logScale) {
    return Double.NaN;
  }

  double upperCount(double[] args) {
    return switch (support()) {
      case COUNT_UP_TO_FIRST_ARGUMENT -> args[0];
      case BINARY -> 1.0;
      default -> Double.POSITIVE_INFINITY;
    };
  }

  private double logProbability(double lo, double hi, double[] args) {
    double upper = upperCount(args);
    double first = Math.max(Math.ceil(lo), 0.0);
    double last = Math.min(Math.floor(hi), upper);
    if (first > last) {
      return Double.NEGATIVE_INFINITY;
    }
    double below = first - 1.0;
    double logLowerAtLo = below < 0 ? Double.NEGATIVE_INFINITY : logLowerTail(below, args);
    double logUpperAtLo = below < 0 ? 0.0 : logUpperTail(below, args);
    double logLowerAtHi = last >= upper ? 0.0 : logLowerTail(last, args);
    double logUpperAtHi = last >= upper ? Double.NEGATIVE_INFINITY : logUpperTail(last, args);
    return LogSpace.logProbabilityFromTails(logLowerAtLo, logUpperAtLo, logLowerAtHi, logUpperAtHi);
  }

  /**
   * {@code log P(lo <= X <= hi)}, both ends included. The gradient is in closed form where {@link
   * #cdfDerivative} gives one, else numerical (Richardson extrapolation of central differences,
   * step {@code 1e-3} times the argument); 0 for whole-number arguments.
   */
  @Override
  public final double logProbabilityBetween(
      double lo, double hi, double[] args, double[] gradientOfArgs) {
    if (!(lo <= hi)) {
      throw new IllegalArgumentException(
          "the truncation needs lo <= hi, got lo = " + format(lo) + ", hi = " + format(hi));
    }
    double logP = logProbability(lo, hi, args);
    if (logP == Double.NEGATIVE_INFINITY) {
      Arrays.fill(gradientOfArgs, 0, arity(), 0.0);
      return logP;
    }
    double upper = upperCount(args);
    double first = Math.max(Math.ceil(lo), 0.0);
    double last = Math.min(Math.floor(hi), upper);
    for (int k = 0; k < arity(); k++) {
      if (domain(k) == ArgumentDomain.WHOLE) {
        gradientOfArgs[k] = 0.0;
        continue;
      }
      // d log(F(last) - F(first - 1)) = (dF(last) - dF(first - 1)) / P; F is constant at the ends
      // of the support.
      double atLast = last >= upper ? 0.0 : cdfDerivative(k, last, args, logP);
      double atBelow = first - 1 < 0 ? 0.0 : cdfDerivative(k, first - 1, args, logP);
      double closedForm = atLast - atBelow;
      gradientOfArgs[k] = Double.isNaN(closedForm)
          ? numericalDerivative(a -> logProbability(lo, hi, a), args, k)
          : closedForm;
    }
    return logP;
  }

  @Override
  public final Curvature curvatureInValue(Scale scale, double[] knownArgs) {
    return Curvature.notEstablished(
        "a " + family().name() + " value is a whole number: concavity in a continuous value does not apply");
  }
}

package org.hullbound.model.family;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.hullbound.lang.NumberSyntax;

/**
 * What every parametrisation shares: argument names and domains, the support test, the checks and
 * their messages, the zeroing of gradients outside the support.
 *
 * <p>Subclasses implement {@link #evaluate} for values inside the support only.
 */
abstract class BaseParametrisation implements Parametrisation {
  private final Family family;
  private final SupportKind support;
  private final List<String> names;
  private final ArgumentDomain[] domains;

  /** @param namesAndDomains alternating {@code String} name and {@link ArgumentDomain} */
  BaseParametrisation(Family family, SupportKind support, Object... namesAndDomains) {
    this.family = family;
    this.support = support;
    List<String> argumentNames = new ArrayList<>();
    this.domains = new ArgumentDomain[namesAndDomains.length / 2];
    for (int i = 0; i < domains.length; i++) {
      argumentNames.add((String) namesAndDomains[2 * i]);
      domains[i] = (ArgumentDomain) namesAndDomains[2 * i + 1];
    }
    this.names = List.copyOf(argumentNames);
  }

  /**
   * The log-density at {@code x} inside the support; fills {@code gradient} (value slot 0, arguments
   * from 1) when it is not {@code null}.
   */
  abstract double evaluate(double x, double[] args, double[] gradient);

  /** Checks involving several arguments (e.g. lower < upper); {@code null} when fine. */
  String checkJointly(double[] args) {
    return null;
  }

  @Override
  public final Family family() {
    return family;
  }

  @Override
  public final List<String> argumentNames() {
    return names;
  }

  @Override
  public final SupportKind support() {
    return support;
  }

  final ArgumentDomain domain(int k) {
    return domains[k];
  }

  @Override
  public final ArgumentRange argumentRange(int k) {
    return switch (domains[k]) {
      case REAL -> new ArgumentRange(Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, false);
      case POSITIVE -> new ArgumentRange(0, Double.POSITIVE_INFINITY, false);
      case PROBABILITY -> new ArgumentRange(0, 1, true);
      case WHOLE -> new ArgumentRange(0, 0x1p53 - 1, true);
      case NON_NEGATIVE -> new ArgumentRange(0, Double.POSITIVE_INFINITY, true);
      case INTEGER -> new ArgumentRange(-0x1p53 + 1, 0x1p53 - 1, true);
    };
  }

  final int arity() {
    return domains.length;
  }

  @Override
  public final double logDensity(double x, double[] args) {
    if (Double.isNaN(x)) {
      return Double.NaN;
    }
    return inSupport(x, args) ? evaluate(x, args, null) : Double.NEGATIVE_INFINITY;
  }

  @Override
  public final double logDensity(double x, double[] args, double[] gradient) {
    if (Double.isNaN(x)) {
      Arrays.fill(gradient, 0, 1 + arity(), Double.NaN);
      return Double.NaN;
    }
    if (!inSupport(x, args)) {
      Arrays.fill(gradient, 0, 1 + arity(), 0.0);
      return Double.NEGATIVE_INFINITY;
    }
    return evaluate(x, args, gradient);
  }

  final boolean inSupport(double x, double[] args) {
    return switch (support) {
      case REAL -> Double.isFinite(x);
      case POSITIVE -> x > 0 && x < Double.POSITIVE_INFINITY;
      case UNIT_INTERVAL -> x > 0 && x < 1;
      case BETWEEN_FIRST_TWO_ARGUMENTS -> x >= args[0] && x <= args[1];
      case COUNT -> ArgumentDomain.WHOLE.accepts(x);
      case COUNT_UP_TO_FIRST_ARGUMENT -> ArgumentDomain.WHOLE.accepts(x) && x <= args[0];
      case BINARY -> x == 0 || x == 1;
      case WHOLE_BETWEEN_FIRST_TWO_ARGUMENTS ->
          x == Math.rint(x) && x >= args[0] && x <= args[1];
      case CATEGORY -> x == Math.rint(x) && x >= 1 && x <= args.length;
    };
  }

  @Override
  public final String checkArguments(double[] args) {
    if (args.length != arity()) {
      return signature() + " takes " + arity() + " arguments, got " + args.length;
    }
    for (int k = 0; k < arity(); k++) {
      String problem = checkArgument(k, args[k]);
      if (problem != null) {
        return problem;
      }
    }
    return checkJointly(args);
  }

  @Override
  public final String checkArgument(int k, double value) {
    return domains[k].accepts(value)
        ? null : names.get(k) + " " + domains[k].requirement() + ", got " + format(value);
  }

  @Override
  public final String checkValue(double x, double[] args) {
    if (inSupport(x, args)) {
      return null;
    }
    String got = ", got " + format(x);
    String family = family().name();
    return switch (support) {
      case REAL -> "a " + family + " value must be a finite number" + got;
      case POSITIVE -> "a " + family + " value must be > 0 and finite" + got;
      case UNIT_INTERVAL -> "a " + family + " value must be strictly between 0 and 1" + got;
      case BETWEEN_FIRST_TWO_ARGUMENTS -> "a " + family + " value must lie in [lower, upper] = ["
          + format(args[0]) + ", " + format(args[1]) + "]" + got;
      case COUNT -> "a count must be a whole number >= 0" + got;
      case COUNT_UP_TO_FIRST_ARGUMENT -> "a count must be a whole number between 0 and "
          + names.get(0) + " = " + format(args[0]) + got;
      case BINARY -> "a " + family + " value must be 0 or 1" + got;
      case WHOLE_BETWEEN_FIRST_TWO_ARGUMENTS -> "a " + family + " value must be a whole number"
          + " in lower .. upper = " + format(args[0]) + " .. " + format(args[1]) + got;
      case CATEGORY -> "a " + family + " value must be a category 1 .. " + args.length + got;
    };
  }

  /** Refuses a truncation {@code [lo, hi]} of a discrete family with {@code lo > hi} (or NaN). */
  static void requireOrdered(double lo, double hi) {
    if (!(lo <= hi)) {
      throw new IllegalArgumentException(
          "the truncation needs lo <= hi, got lo = " + format(lo) + ", hi = " + format(hi));
    }
  }

  /** A number as a user wrote it: {@code -1} rather than {@code -1.0}. */
  static String format(double value) {
    return NumberSyntax.written(value);
  }

  static boolean known(double[] knownArgs, int k) {
    return !Double.isNaN(knownArgs[k]);
  }

  /** Richardson extrapolation of central differences of {@code function} in {@code args[k]}. */
  final double numericalDerivative(ArgumentFunction function, double[] args, int k) {
    double theta = args[k];
    double h = domains[k].step(theta);
    double[] shifted = args.clone();
    double wide = centralDifference(function, shifted, k, theta, h);
    double narrow = centralDifference(function, shifted, k, theta, 0.5 * h);
    // Error of a central difference is c h^2 + O(h^4); (4 D(h/2) - D(h)) / 3 removes the h^2 term.
    return (4.0 * narrow - wide) / 3.0;
  }

  private static double centralDifference(
      ArgumentFunction function, double[] shifted, int k, double theta, double h) {
    shifted[k] = theta + h;
    double up = function.apply(shifted);
    shifted[k] = theta - h;
    double down = function.apply(shifted);
    shifted[k] = theta;
    return (up - down) / (2.0 * h);
  }

  /** A function of the argument vector, differentiated numerically. */
  @FunctionalInterface
  interface ArgumentFunction {
    double apply(double[] args);
  }

  @Override
  public String toString() {
    return signature();
  }
}

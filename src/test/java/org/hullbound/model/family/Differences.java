package org.hullbound.model.family;

import java.util.function.DoubleUnaryOperator;

/** Finite differences used as the independent check of analytic derivatives (common practice). */
final class Differences {
  private Differences() {}

  /** Central difference with one Richardson step: error O(h^4). */
  static double derivative(DoubleUnaryOperator f, double t, double h) {
    double wide = (f.applyAsDouble(t + h) - f.applyAsDouble(t - h)) / (2 * h);
    double narrow = (f.applyAsDouble(t + h / 2) - f.applyAsDouble(t - h / 2)) / h;
    return (4 * narrow - wide) / 3;
  }

  /** Second difference {@code (f(t+h) - 2 f(t) + f(t-h)) / h^2}. */
  static double secondDifference(DoubleUnaryOperator f, double t, double h) {
    return (f.applyAsDouble(t + h) - 2 * f.applyAsDouble(t) + f.applyAsDouble(t - h)) / (h * h);
  }

  /** A bound on the rounding error of {@link #secondDifference} at this point. */
  static double secondDifferenceRounding(DoubleUnaryOperator f, double t, double h) {
    double sum = Math.abs(f.applyAsDouble(t + h)) + 2 * Math.abs(f.applyAsDouble(t)) + Math.abs(f.applyAsDouble(t - h));
    return 1e-12 * (1 + sum) / (h * h);
  }

  /** A copy of {@code args} with {@code args[k] = value}. */
  static double[] with(double[] args, int k, double value) {
    double[] copy = args.clone();
    copy[k] = value;
    return copy;
  }

  /** A finite-difference step for argument {@code k} of a generated point, staying in its domain. */
  static double argumentStep(FamilyCases.Point point, int k, double relative) {
    String name = point.p().argumentNames().get(k);
    double value = point.args()[k];
    double width = point.testCase().width().at(point.x(), point.args());
    return switch (name) {
      case "mean", "location" -> relative * (point.p().discrete() ? Math.max(1e-2, value) : width);
      case "lower", "upper" -> relative * width;
      case "meanlog" -> relative * point.args()[1];
      case "logit_p", "log_rate" -> relative;
      case "p" -> relative * Math.min(value, 1 - value);
      default -> relative * value;
    };
  }
}

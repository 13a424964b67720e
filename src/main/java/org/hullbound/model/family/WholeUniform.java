package org.hullbound.model.family;

import java.util.Arrays;
import java.util.List;

/**
 * The whole-number uniform {@code whole-uniform(lower, upper)}: every whole number of {@code lower
 * .. upper} (both included) has mass {@code 1 / (upper - lower + 1)}, as commons-math3's {@code
 * UniformIntegerDistribution}. The prior of a change year or of a count known only to lie in a
 * range; its support is finite, so a conditional over it is drawn by enumeration.
 */
final class WholeUniform {
  private WholeUniform() {}

  static Family family() {
    return SimpleFamily.of("whole-uniform", f -> List.of(new ByBounds(f)));
  }

  private static final class ByBounds extends BaseParametrisation {
    ByBounds(Family family) {
      super(family, SupportKind.WHOLE_BETWEEN_FIRST_TWO_ARGUMENTS,
          "lower", ArgumentDomain.INTEGER, "upper", ArgumentDomain.INTEGER);
    }

    @Override
    String checkJointly(double[] args) {
      return args[0] <= args[1]
          ? null
          : "lower must be <= upper, got lower = " + format(args[0]) + ", upper = "
              + format(args[1]);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      if (gradient != null) {
        Arrays.fill(gradient, 0, 3, 0.0);
      }
      return -Math.log(args[1] - args[0] + 1);
    }

    @Override
    public double logProbabilityBetween(
        double lo, double hi, double[] args, double[] gradientOfArgs) {
      requireOrdered(lo, hi);
      Arrays.fill(gradientOfArgs, 0, 2, 0.0);
      double first = Math.max(Math.ceil(lo), args[0]);
      double last = Math.min(Math.floor(hi), args[1]);
      if (first > last) {
        return Double.NEGATIVE_INFINITY;
      }
      return Math.log(last - first + 1) - Math.log(args[1] - args[0] + 1);
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return Curvature.notEstablished(
          "a whole-uniform value is a whole number: concavity in a continuous value does not"
              + " apply");
    }

    @Override
    public Curvature curvatureInWholeValue(double[] knownArgs) {
      return Curvature.concave(
          "whole-uniform log mass is constant on lower .. upper: its differences are 0");
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      return Curvature.notEstablished(
          "whole-uniform bounds are whole numbers: the support moves with them");
    }
  }
}

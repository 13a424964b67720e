package org.hullbound.model.family;

import java.util.List;

/**
 * The uniform family {@code (lower, upper)}: log-density {@code -log(upper - lower)} on {@code
 * [lower, upper]} (the closed interval, as commons-math3's {@code UniformRealDistribution}).
 */
final class Uniform {
  private Uniform() {}

  static Family family() {
    return SimpleFamily.of("uniform", f -> List.of(new ByBounds(f)));
  }

  private static final class ByBounds extends ContinuousParametrisation {
    ByBounds(Family family) {
      super(family, SupportKind.BETWEEN_FIRST_TWO_ARGUMENTS, "lower", ArgumentDomain.REAL, "upper", ArgumentDomain.REAL);
    }

    @Override
    String checkJointly(double[] args) {
      return args[0] < args[1]
          ? null
          : "lower must be < upper, got lower = " + format(args[0]) + ", upper = " + format(args[1]);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double width = args[1] - args[0];
      if (gradient != null) {
        gradient[0] = 0.0;
        gradient[1] = 1.0 / width;
        gradient[2] = -1.0 / width;
      }
      return -Math.log(width);
    }

    @Override
    double logLowerTail(double x, double[] args) {
      return Math.log((x - args[0]) / (args[1] - args[0]));
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return Math.log((args[1] - x) / (args[1] - args[0]));
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return true;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = (x - lower)/(upper - lower): ratios -(upper - x)/(upper - lower) and -(x - lower)/(upper - lower).
      double width = args[1] - args[0];
      return k == 0 ? -(args[1] - x) / width : -(x - args[0]) / width;
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        case NATURAL -> Curvature.concave(
            "uniform log-density is constant on [lower, upper] and -inf outside: concave (not differentiable at the bounds)");
        case LOG -> Curvature.concave(
            "uniform log-density is concave in u = log(value): u - log(upper - lower), linear on its interval");
        // x = expit(u): log v + log(1 - v) + const, d2 = -2 v (1 - v).
        case LOGIT -> Curvature.concave(
            "uniform log-density is concave in u = logit(value): log(v) + log(1 - v) + const, second derivative -2 v(1 - v) < 0");
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return switch (scale) {
          // -log(upper - lower): d2/dlower2 = 1/(upper - lower)^2 > 0.
          case NATURAL -> Curvature.notEstablished(
              "uniform log-density in lower is convex: -log(upper - lower), second derivative 1/(upper - lower)^2 > 0");
          // lower = e^u: d2 = upper e^u/(upper - e^u)^2 > 0 for upper > 0.
          case LOG -> Curvature.notEstablished(
              "uniform log-density in u = log(lower) has second derivative upper lower/(upper - lower)^2 > 0");
          case LOGIT -> Reasons.notAnalysed(this, "lower", scale);
        };
      }
      return switch (scale) {
        // d2/dupper2 = 1/(upper - lower)^2 > 0.
        case NATURAL -> Curvature.notEstablished(
            "uniform log-density in upper is convex: -log(upper - lower), second derivative 1/(upper - lower)^2 > 0; concave in log(upper) when lower <= 0");
        // upper = e^u: -log(e^u - lower), d2 = lower e^u/(e^u - lower)^2.
        case LOG -> known(knownArgs, 0) && knownArgs[0] <= 0
            ? Curvature.concave(
                "uniform log-density is concave in u = log(upper) since lower <= 0: -log(exp(u) - lower), second derivative lower upper/(upper - lower)^2 <= 0")
            : Curvature.notEstablished(
                "uniform log-density in u = log(upper) has second derivative lower upper/(upper - lower)^2: concave only when lower <= 0 is known");
        case LOGIT -> Reasons.notAnalysed(this, "upper", scale);
      };
    }
  }
}

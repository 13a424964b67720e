package org.hullbound.model.family;

import java.util.List;

/**
 * The exponential family {@code (rate)}: log-density {@code log(rate) - rate x} on {@code x > 0},
 * upper tail {@code exp(-rate x)}.
 */
final class Exponential {
  private Exponential() {}

  static Family family() {
    return SimpleFamily.of("exponential", f -> List.of(new ByRate(f)));
  }

  private static final class ByRate extends ContinuousParametrisation {
    ByRate(Family family) {
      super(family, SupportKind.POSITIVE, "rate", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double rate = args[0];
      if (gradient != null) {
        gradient[0] = -rate;
        gradient[1] = 1.0 / rate - x;
      }
      return Math.log(rate) - rate * x;
    }

    @Override
    double logLowerTail(double x, double[] args) {
      return LogSpace.log1mExp(-args[0] * x);
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return -args[0] * x;
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return true;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = rate x: dz/drate / dz/dx = x/rate.
      return x / args[0];
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        case NATURAL -> Curvature.concave("exponential log-density is linear, hence concave, in the value: -rate x");
        // x = e^u: u - rate e^u, d2 = -rate e^u.
        case LOG -> Curvature.concave(
            "exponential log-density is concave in u = log(value): u - rate exp(u), second derivative -rate exp(u) < 0");
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      return switch (scale) {
        case NATURAL -> Curvature.concave(
            "exponential log-density is concave in rate: log(rate) - rate x, second derivative -1/rate^2");
        case LOG -> Curvature.concave(
            "exponential log-density is concave in u = log(rate): u - x exp(u), second derivative -x exp(u) <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "rate", scale);
      };
    }
  }
}

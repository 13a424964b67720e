package org.hullbound.model.family;

import java.util.List;

/**
 * The logistic family {@code (location, scale)}.
 *
 * <p>Log-density {@code -|z| - 2 log(1 + e^{-|z|}) - log(scale)}, {@code z = (x - location)/scale}
 * (the symmetric form, which never overflows); distribution function {@code expit(z)}, so both
 * tails are {@link LogSpace#logInvLogit} of {@code +-z}.
 */
final class Logistic {
  private Logistic() {}

  static Family family() {
    return SimpleFamily.of("logistic", f -> List.of(new ByLocationScale(f)));
  }

  private static final class ByLocationScale extends ContinuousParametrisation {
    ByLocationScale(Family family) {
      super(family, SupportKind.REAL, "location", ArgumentDomain.REAL, "scale", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double scale = args[1];
      double z = (x - args[0]) / scale;
      double absZ = Math.abs(z);
      if (gradient != null) {
        // d/dz = 1 - 2 expit(z) = -tanh(z/2).
        double slope = -Math.tanh(0.5 * z);
        gradient[0] = slope / scale;
        gradient[1] = -slope / scale;
        gradient[2] = (-1.0 - z * slope) / scale;
      }
      return -absZ - 2.0 * LogSpace.log1p(Math.exp(-absZ)) - Math.log(scale);
    }

    @Override
    double logLowerTail(double x, double[] args) {
      return LogSpace.logInvLogit((x - args[0]) / args[1]);
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return LogSpace.logInvLogit(-(x - args[0]) / args[1]);
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return true;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      return k == 0 ? -1.0 : -(x - args[0]) / args[1];
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        // d2/dx2 = -2 expit(z)(1 - expit(z))/scale^2.
        case NATURAL -> Curvature.concave(
            "logistic log-density is concave in the value: second derivative -2 p(1 - p)/scale^2 with p = expit(z)");
        // x = e^u: g'' = x^2 l'' + x l', l' = -tanh(z/2)/scale <= 0 above location.
        case LOG -> Reasons.logValueOfLocationFamily(this, knownArgs, 0,
            "second derivative x^2 l''(x) - x tanh(z/2)/scale");
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return switch (scale) {
          case NATURAL -> Curvature.concave(
              "logistic log-density is concave in location: second derivative -2 p(1 - p)/scale^2 with p = expit(z)");
          default -> Reasons.notAnalysed(this, "location", scale);
        };
      }
      return switch (scale) {
        // h(z) standard log-density: d2/dscale2 = (1 + 2 z h'(z) + z^2 h''(z))/scale^2 = 1/scale^2 at z = 0.
        case NATURAL -> Curvature.notEstablished(
            "logistic log-density in scale has second derivative 1/scale^2 > 0 at x = location; concave in log(scale)");
        // scale = e^u, z = (x - location) e^{-u}: -u + h(z), d2 = z h'(z) + z^2 h''(z), h' = -tanh(z/2).
        case LOG -> Curvature.concave(
            "logistic log-density is concave in u = log(scale): second derivative -z tanh(z/2) + z^2 h''(z) <= 0, both terms <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "scale", scale);
      };
    }
  }
}

package org.hullbound.model.family;

import java.util.List;

/**
 * The Cauchy family {@code (location, scale)}.
 *
 * <p>Log-density {@code -log(pi) - log(scale) - log(1 + z^2)}, {@code z = (x - location)/scale};
 * upper tail {@code atan(1/z)/pi} for {@code z > 0}, which keeps relative accuracy in the far tail.
 */
final class Cauchy {
  private static final double LOG_PI = Math.log(Math.PI);

  private Cauchy() {}

  static Family family() {
    return SimpleFamily.of("cauchy", f -> List.of(new ByLocationScale(f)));
  }

  /** {@code log P(Z > z)} for the standard Cauchy. */
  static double logUpper(double z) {
    return z > 0 ? Math.log(Math.atan(1.0 / z) / Math.PI) : Math.log(0.5 - Math.atan(z) / Math.PI);
  }

  private static final class ByLocationScale extends ContinuousParametrisation {
    ByLocationScale(Family family) {
      super(family, SupportKind.REAL, "location", ArgumentDomain.REAL, "scale", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double scale = args[1];
      double z = (x - args[0]) / scale;
      double onePlusZ2 = 1.0 + z * z;
      if (gradient != null) {
        gradient[0] = -2.0 * z / (scale * onePlusZ2);
        gradient[1] = -gradient[0];
        gradient[2] = (-1.0 + 2.0 * z * z / onePlusZ2) / scale;
      }
      return -LOG_PI - Math.log(scale) - LogSpace.log1p(z * z);
    }

    @Override
    double logLowerTail(double x, double[] args) {
      return logUpper(-(x - args[0]) / args[1]);
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return logUpper((x - args[0]) / args[1]);
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
        // d2/dx2 = -2(1 - z^2)/(scale^2 (1 + z^2)^2).
        case NATURAL -> Curvature.notEstablished(
            "cauchy log-density in the value has second derivative -2(1 - z^2)/(scale^2 (1 + z^2)^2), positive for |z| > 1");
        default -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return scale == Scale.NATURAL
            ? Curvature.notEstablished(
                "cauchy log-density in location has second derivative -2(1 - z^2)/(scale^2 (1 + z^2)^2), positive for |z| > 1")
            : Reasons.notAnalysed(this, "location", scale);
      }
      return switch (scale) {
        // log(scale) - log(scale^2 + d^2) + const: d2 = -1/s^2 - 2(d^2 - s^2)/(s^2 + d^2)^2 = 1/s^2 at d = 0.
        case NATURAL -> Curvature.notEstablished(
            "cauchy log-density in scale has second derivative 1/scale^2 > 0 at x = location; concave in log(scale)");
        // scale = e^u, w = (x - location)^2 e^{-2u}: -u - log(1 + w), d2 = -4w/(1+w)^2.
        case LOG -> Curvature.concave(
            "cauchy log-density is concave in u = log(scale): -u - log(1 + w) with w = (x - location)^2 exp(-2u), second derivative -4w/(1+w)^2 <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "scale", scale);
      };
    }
  }
}

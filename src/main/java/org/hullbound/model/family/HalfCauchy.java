package org.hullbound.model.family;

import java.util.List;

/**
 * The half-Cauchy family {@code (scale)}: the absolute value of a Cauchy with location 0.
 *
 * <p>Log-density {@code log(2/pi) - log(scale) - log(1 + (x/scale)^2)} on {@code x > 0}
 * (Johnson, Kotz and Balakrishnan 1994, vol. 1, ch. 16, folding the Cauchy at 0); distribution
 * function {@code (2/pi) atan(x/scale)}, upper tail {@code (2/pi) atan(scale/x)}.
 */
final class HalfCauchy {
  private static final double LOG_TWO_OVER_PI = Math.log(2.0 / Math.PI);

  private HalfCauchy() {}

  static Family family() {
    return SimpleFamily.of("half-cauchy", f -> List.of(new ByScale(f)));
  }

  private static final class ByScale extends ContinuousParametrisation {
    ByScale(Family family) {
      super(family, SupportKind.POSITIVE, "scale", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double scale = args[0];
      double z = x / scale;
      double onePlusZ2 = 1.0 + z * z;
      if (gradient != null) {
        gradient[0] = -2.0 * z / (scale * onePlusZ2);
        gradient[1] = (-1.0 + 2.0 * z * z / onePlusZ2) / scale;
      }
      return LOG_TWO_OVER_PI - Math.log(scale) - LogSpace.log1p(z * z);
    }

    @Override
    double logLowerTail(double x, double[] args) {
      return LOG_TWO_OVER_PI + Math.log(Math.atan(x / args[0]));
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return LOG_TWO_OVER_PI + Math.log(Math.atan(args[0] / x));
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return true;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      return -x / args[0];
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        // d2/dx2 = -2(scale^2 - x^2)/(scale^2 + x^2)^2.
        case NATURAL -> Curvature.notEstablished(
            "half-cauchy log-density in the value has second derivative -2(scale^2 - x^2)/(scale^2 + x^2)^2, positive for x > scale; concave in log(value)");
        // x = e^u, w = e^{2u}/scale^2: -log(1 + w) + u, d2 = -4w/(1+w)^2.
        case LOG -> Curvature.concave(
            "half-cauchy log-density is concave in u = log(value): u - log(1 + w) with w = exp(2u)/scale^2, second derivative -4w/(1+w)^2 < 0");
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      return switch (scale) {
        case NATURAL -> Curvature.notEstablished(
            "half-cauchy log-density in scale has second derivative -1/scale^2 - 2(x^2 - scale^2)/(scale^2 + x^2)^2, positive for small x; concave in log(scale)");
        // scale = e^u, w = x^2 e^{-2u}: -u - log(1 + w), d2 = -4w/(1+w)^2.
        case LOG -> Curvature.concave(
            "half-cauchy log-density is concave in u = log(scale): -u - log(1 + w) with w = x^2 exp(-2u), second derivative -4w/(1+w)^2 <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "scale", scale);
      };
    }
  }
}

package org.hullbound.model.family;

import java.util.List;

/**
 * The lognormal family {@code (meanlog, sdlog)}: {@code log(value)} is normal with that mean and sd.
 *
 * <p>Log-density {@code -(log x - meanlog)^2 / (2 sdlog^2) - log(sdlog) - log(2 pi)/2 - log x}.
 */
final class LogNormal {
  private LogNormal() {}

  static Family family() {
    return SimpleFamily.of("lognormal", f -> List.of(new ByMeanlogSdlog(f)));
  }

  private static final class ByMeanlogSdlog extends ContinuousParametrisation {
    ByMeanlogSdlog(Family family) {
      super(family, SupportKind.POSITIVE, "meanlog", ArgumentDomain.REAL, "sdlog", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double sdlog = args[1];
      double logX = Math.log(x);
      double z = (logX - args[0]) / sdlog;
      if (gradient != null) {
        gradient[0] = (-z / sdlog - 1.0) / x;
        gradient[1] = z / sdlog;
        gradient[2] = (z * z - 1.0) / sdlog;
      }
      return -0.5 * z * z - Math.log(sdlog) - NormalTail.HALF_LOG_TWO_PI - logX;
    }

    @Override
    public double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
      if (k != 1 || !(args[1] > 0) || !inSupport(x, args)) {
        return super.logArgumentSlope(x, args, k, gradient);
      }
      // sdlog d/dsdlog (-log sdlog - z^2/2) = z^2 - 1, finite while z^2 is.
      double z = (Math.log(x) - args[0]) / args[1];
      return z * z - 1.0;
    }

    @Override
    double logLowerTail(double x, double[] args) {
      return NormalTail.logLower((Math.log(x) - args[0]) / args[1]);
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return NormalTail.logUpper((Math.log(x) - args[0]) / args[1]);
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return true;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = (log x - meanlog)/sdlog, dz/dx = 1/(x sdlog): ratios -x and -x z.
      return k == 0 ? -x : -x * (Math.log(x) - args[0]) / args[1];
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        // d2/dx2 = (1 - 1/sdlog^2 + (log x - meanlog)/sdlog^2) / x^2, positive for large x.
        case NATURAL -> Curvature.notEstablished(
            "lognormal log-density in the value has second derivative (1 - 1/sdlog^2 + (log x - meanlog)/sdlog^2)/x^2, positive for large x; it is concave in log(value)");
        // u = log x: -(u - meanlog)^2/(2 sdlog^2) + const, d2 = -1/sdlog^2.
        case LOG -> Curvature.concave(
            "lognormal log-density is concave in u = log(value): -(u - meanlog)^2/(2 sdlog^2), second derivative -1/sdlog^2");
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return switch (scale) {
          case NATURAL -> Curvature.concave("lognormal log-density is concave in meanlog: second derivative -1/sdlog^2");
          case LOG -> Curvature.notEstablished(
              "lognormal log-density in u = log(meanlog) has second derivative meanlog (log x - 2 meanlog)/sdlog^2, positive for log x > 2 meanlog");
          case LOGIT -> Reasons.notAnalysed(this, "meanlog", scale);
        };
      }
      return switch (scale) {
        case NATURAL -> Curvature.notEstablished(
            "lognormal log-density in sdlog has second derivative 1/sdlog^2 - 3 (log x - meanlog)^2/sdlog^4, positive near log x = meanlog; concave in log(sdlog)");
        // sdlog = e^u: -u - c e^{-2u}, c = (log x - meanlog)^2/2, d2 = -4c e^{-2u} <= 0.
        case LOG -> Curvature.concave(
            "lognormal log-density is concave in u = log(sdlog): -u - c exp(-2u) with c = (log x - meanlog)^2/2, second derivative -4c exp(-2u) <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "sdlog", scale);
      };
    }
  }
}

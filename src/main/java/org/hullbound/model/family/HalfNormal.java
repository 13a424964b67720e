package org.hullbound.model.family;

import java.util.List;
import org.apache.commons.math3.special.Erf;

/**
 * The half-normal family {@code (sd)}: the absolute value of a normal with mean 0 and that sd.
 *
 * <p>Log-density {@code log(2) - log(sd) - log(2 pi)/2 - x^2/(2 sd^2)} on {@code x > 0} (Johnson,
 * Kotz and Balakrishnan, Continuous Univariate Distributions vol. 1, 2nd ed., 1994, 13.10);
 * distribution function {@code erf(x / (sd sqrt 2))}, upper tail {@code 2 Q(x / sd)}.
 */
final class HalfNormal {
  private static final double LOG_TWO = Math.log(2.0);
  private static final double SQRT_HALF = Math.sqrt(0.5);

  private HalfNormal() {}

  static Family family() {
    return SimpleFamily.of("half-normal", f -> List.of(new BySd(f)));
  }

  private static final class BySd extends ContinuousParametrisation {
    BySd(Family family) {
      super(family, SupportKind.POSITIVE, "sd", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double sd = args[0];
      double z = x / sd;
      if (gradient != null) {
        gradient[0] = -z / sd;
        gradient[1] = (z * z - 1.0) / sd;
      }
      return LOG_TWO - NormalTail.HALF_LOG_TWO_PI - Math.log(sd) - 0.5 * z * z;
    }

    @Override
    public double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
      if (k != 0 || !(args[0] > 0) || !inSupport(x, args)) {
        return super.logArgumentSlope(x, args, k, gradient);
      }
      // sd d/dsd (-log sd - z^2/2) = z^2 - 1, finite while z^2 is, unlike (z^2 - 1)/sd.
      double z = x / args[0];
      return z * z - 1.0;
    }

    @Override
    double logLowerTail(double x, double[] args) {
      double z = x / args[0];
      // Near 0, erf keeps relative accuracy where 1 - 2Q(z) would cancel.
      return z < 1.0 ? Math.log(Erf.erf(z * SQRT_HALF)) : LogSpace.log1mExp(logUpperTail(x, args));
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return LOG_TWO + NormalTail.logUpper(x / args[0]);
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return true;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = x/sd: dz/dsd / dz/dx = -x/sd.
      return -x / args[0];
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        case NATURAL -> Curvature.concave("half-normal log-density is concave in the value: second derivative -1/sd^2");
        // x = e^u: -x^2/(2 sd^2) + u, d2 = -2 x^2/sd^2.
        case LOG -> Curvature.concave(
            "half-normal log-density is concave in u = log(value): -exp(2u)/(2 sd^2) + u, second derivative -2 value^2/sd^2");
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      return switch (scale) {
        case NATURAL -> Curvature.notEstablished(
            "half-normal log-density in sd has second derivative 1/sd^2 - 3 x^2/sd^4, positive for x < sd/sqrt(3); concave in log(sd)");
        // sd = e^u: -u - (x^2/2) e^{-2u}, d2 = -2 x^2 e^{-2u}.
        case LOG -> Curvature.concave(
            "half-normal log-density is concave in u = log(sd): -u - (x^2/2) exp(-2u), second derivative -2 x^2 exp(-2u) <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "sd", scale);
      };
    }
  }
}

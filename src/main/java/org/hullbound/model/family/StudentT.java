package org.hullbound.model.family;

import java.util.List;
import org.apache.commons.math3.special.Beta;
import org.apache.commons.math3.special.Gamma;

/**
 * Student's t family {@code (df, location, scale)}.
 *
 * <p>Log-density {@code -log B(df/2, 1/2) - log(df)/2 - log(scale) - (df+1)/2
 * log(1 + z^2/df)}, {@code z = (x - location)/scale}; tail {@code P(T > t) = I_{df/(df+t^2)}(df/2,
 * 1/2) / 2} (Abramowitz and Stegun 1964, 26.7.1 with 26.5.27), in log space by {@link
 * IncompleteBeta}. The derivative of the truncation normaliser in {@code df} has no closed form and
 * is numerical (Richardson-extrapolated central differences, step {@code 1e-3 df}).
 */
final class StudentT {
  private static final double LOG_HALF = Math.log(0.5);

  private StudentT() {}

  static Family family() {
    return SimpleFamily.of("student-t", f -> List.of(new ByDfLocationScale(f)));
  }

  /** {@code log P(T > t)} for {@code t >= 0}. */
  static double logTailAbove(double t, double df) {
    if (t == 0) {
      return LOG_HALF;
    }
    // r = df/t^2 without overflowing t^2; x = df/(df + t^2), y = t^2/(df + t^2), logs by log1p.
    double r = (df / t) / t;
    return LOG_HALF + IncompleteBeta.logRegularized(
        r / (1.0 + r), 1.0 / (1.0 + r), -LogSpace.log1p(1.0 / r), -LogSpace.log1p(r), 0.5 * df, 0.5);
  }

  private static final class ByDfLocationScale extends ContinuousParametrisation {
    ByDfLocationScale(Family family) {
      super(family, SupportKind.REAL, "df", ArgumentDomain.POSITIVE, "location", ArgumentDomain.REAL,
          "scale", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double df = args[0];
      double scale = args[2];
      double z = (x - args[1]) / scale;
      double z2 = z * z;
      double log1pQ = LogSpace.log1p(z2 / df);
      if (gradient != null) {
        double dz = -(df + 1.0) * z / (df + z2);
        gradient[0] = dz / scale;
        gradient[1] = 0.5 * (Gamma.digamma(0.5 * (df + 1.0)) - Gamma.digamma(0.5 * df)) - 0.5 / df
            - 0.5 * log1pQ + 0.5 * (df + 1.0) * z2 / (df * (df + z2));
        gradient[2] = -dz / scale;
        gradient[3] = (-1.0 + (df + 1.0) * z2 / (df + z2)) / scale;
      }
      // lgamma((df+1)/2) - lgamma(df/2) - log(pi)/2 = -log B(df/2, 1/2): commons-math3's logBeta
      // keeps this difference accurate for large df, where the two lgamma terms would cancel.
      return -Beta.logBeta(0.5 * df, 0.5) - 0.5 * Math.log(df) - Math.log(scale) - 0.5 * (df + 1.0) * log1pQ;
    }

    @Override
    double logLowerTail(double x, double[] args) {
      double t = (x - args[1]) / args[2];
      return t <= 0 ? logTailAbove(-t, args[0]) : LogSpace.log1mExp(logTailAbove(t, args[0]));
    }

    @Override
    double logUpperTail(double x, double[] args) {
      double t = (x - args[1]) / args[2];
      return t >= 0 ? logTailAbove(t, args[0]) : LogSpace.log1mExp(logTailAbove(-t, args[0]));
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return k != 0;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      return k == 1 ? -1.0 : -(x - args[1]) / args[2];
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        // d2/dx2 = -(df+1)(df - z^2) / (scale^2 (df + z^2)^2).
        case NATURAL -> Curvature.notEstablished(
            "student-t log-density in the value has second derivative -(df+1)(df - z^2)/(scale^2 (df + z^2)^2), positive in the tails |z| > sqrt(df)");
        default -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return Curvature.notEstablished("student-t: no concavity result in df is used");
      }
      if (k == 1) {
        return scale == Scale.NATURAL
            ? Curvature.notEstablished(
                "student-t log-density in location has second derivative -(df+1)(df - z^2)/(scale^2 (df + z^2)^2), positive for |z| > sqrt(df)")
            : Reasons.notAnalysed(this, "location", scale);
      }
      return switch (scale) {
        // At x = location the log-density is -log(scale) + const: d2 = 1/scale^2 > 0.
        case NATURAL -> Curvature.notEstablished(
            "student-t log-density in scale has second derivative 1/scale^2 > 0 at x = location; concave in log(scale)");
        // scale = e^u, w = (x - location)^2 e^{-2u}/df: -u - (df+1)/2 log(1 + w), d2 = -2(df+1) w/(1+w)^2.
        case LOG -> Curvature.concave(
            "student-t log-density is concave in u = log(scale): -u - (df+1)/2 log(1 + w) with w = (x - location)^2 exp(-2u)/df, second derivative -2(df+1) w/(1+w)^2 <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "scale", scale);
      };
    }
  }
}

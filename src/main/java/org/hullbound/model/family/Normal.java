package org.hullbound.model.family;

import java.util.List;

/**
 * The normal family in three parametrisations: {@code (mean, sd)}, {@code (mean, var)}, {@code
 * (mean, precision)}.
 *
 * <p>Log-density {@code -(x - mean)^2 / (2 sd^2) - log(sd) - log(2 pi) / 2}; tails from {@link
 * NormalTail}, so the truncation normaliser keeps its accuracy to {@code |z|} far beyond 37.
 */
final class Normal {
  private Normal() {}

  static Family family() {
    return SimpleFamily.of("normal", f -> List.of(new BySd(f), new ByVariance(f), new ByPrecision(f)));
  }

  /** What the three parametrisations share: mean first, a scale argument second. */
  private abstract static class NormalForm extends ContinuousParametrisation {
    NormalForm(Family family, String scaleName) {
      super(family, SupportKind.REAL, "mean", ArgumentDomain.REAL, scaleName, ArgumentDomain.POSITIVE);
    }

    abstract double sd(double[] args);

    @Override
    double logLowerTail(double x, double[] args) {
      return NormalTail.logLower((x - args[0]) / sd(args));
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return NormalTail.logUpper((x - args[0]) / sd(args));
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return true;
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        // d2/dx2 = -1/sd^2.
        case NATURAL -> Curvature.concave("normal log-density is concave in the value: second derivative -1/sd^2");
        // x = e^u: g = -(x - mean)^2/(2 sd^2) + u, g'' = -x (2x - mean)/sd^2.
        case LOG -> Reasons.logValueOfLocationFamily(this, knownArgs, 0, "second derivative -x (2x - mean)/sd^2");
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    Curvature curvatureInMean(Scale scale) {
      return switch (scale) {
        // d2/dmean2 = -1/sd^2.
        case NATURAL -> Curvature.concave("normal log-density is concave in mean: second derivative -1/sd^2");
        // mean = e^u: d2/du2 = e^u (x - 2 e^u)/sd^2, positive for x > 2 mean.
        case LOG -> Curvature.notEstablished(
            "normal log-density in u = log(mean) has second derivative mean (x - 2 mean)/sd^2, positive for x > 2 mean");
        case LOGIT -> Reasons.notAnalysed(this, "mean", scale);
      };
    }
  }

  private static final class BySd extends NormalForm {
    BySd(Family family) {
      super(family, "sd");
    }

    @Override
    double sd(double[] args) {
      return args[1];
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double sd = args[1];
      double z = (x - args[0]) / sd;
      if (gradient != null) {
        gradient[0] = -z / sd;
        gradient[1] = z / sd;
        gradient[2] = (z * z - 1.0) / sd;
      }
      return -0.5 * z * z - Math.log(sd) - NormalTail.HALF_LOG_TWO_PI;
    }

    @Override
    public double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
      if (k != 1 || !(args[1] > 0) || !inSupport(x, args)) {
        return super.logArgumentSlope(x, args, k, gradient);
      }
      // sd d/dsd (-z^2/2 - log sd) = z^2 - 1, finite while z^2 is, unlike (z^2 - 1)/sd.
      double z = (x - args[0]) / args[1];
      return z * z - 1.0;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = (x - mean)/sd: dz/dmean / dz/dx = -1, dz/dsd / dz/dx = -(x - mean)/sd.
      return k == 0 ? -1.0 : -(x - args[0]) / args[1];
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return curvatureInMean(scale);
      }
      return switch (scale) {
        // -log sd - c/sd^2, c = (x - mean)^2/2: d2 = 1/sd^2 - 6c/sd^4 > 0 near x = mean.
        case NATURAL -> Curvature.notEstablished(
            "normal log-density in sd has second derivative 1/sd^2 - 3 (x - mean)^2/sd^4, positive near x = mean; concave in log(sd)");
        // sd = e^u: -u - c e^{-2u}, d2 = -4c e^{-2u} <= 0.
        case LOG -> Curvature.concave(
            "normal log-density is concave in u = log(sd): -u - c exp(-2u) with c = (x - mean)^2/2, second derivative -4c exp(-2u) <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "sd", scale);
      };
    }
  }

  private static final class ByVariance extends NormalForm {
    ByVariance(Family family) {
      super(family, "var");
    }

    @Override
    double sd(double[] args) {
      return Math.sqrt(args[1]);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double variance = args[1];
      double d = x - args[0];
      if (gradient != null) {
        gradient[0] = -d / variance;
        gradient[1] = d / variance;
        gradient[2] = 0.5 * (d * d / variance - 1.0) / variance;
      }
      return -0.5 * d * d / variance - 0.5 * Math.log(variance) - NormalTail.HALF_LOG_TWO_PI;
    }

    @Override
    public double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
      if (k != 1 || !(args[1] > 0) || !inSupport(x, args)) {
        return super.logArgumentSlope(x, args, k, gradient);
      }
      // var d/dvar (-d^2/(2 var) - log(var)/2) = (d^2/var - 1)/2.
      double d = x - args[0];
      return 0.5 * (d * d / args[1] - 1.0);
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = (x - mean)/sqrt(var): dz/dvar / dz/dx = -(x - mean)/(2 var).
      return k == 0 ? -1.0 : -(x - args[0]) / (2.0 * args[1]);
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return curvatureInMean(scale);
      }
      return switch (scale) {
        // -log(v)/2 - c/v: d2 = 1/(2 v^2) - 2c/v^3 > 0 near x = mean.
        case NATURAL -> Curvature.notEstablished(
            "normal log-density in var has second derivative 1/(2 var^2) - (x - mean)^2/var^3, positive near x = mean; concave in log(var)");
        // var = e^u: -u/2 - c e^{-u}, d2 = -c e^{-u} <= 0.
        case LOG -> Curvature.concave(
            "normal log-density is concave in u = log(var): -u/2 - c exp(-u) with c = (x - mean)^2/2, second derivative -c exp(-u) <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "var", scale);
      };
    }
  }

  private static final class ByPrecision extends NormalForm {
    ByPrecision(Family family) {
      super(family, "precision");
    }

    @Override
    double sd(double[] args) {
      return 1.0 / Math.sqrt(args[1]);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double precision = args[1];
      double d = x - args[0];
      if (gradient != null) {
        gradient[0] = -precision * d;
        gradient[1] = precision * d;
        gradient[2] = 0.5 * (1.0 / precision - d * d);
      }
      return -0.5 * precision * d * d + 0.5 * Math.log(precision) - NormalTail.HALF_LOG_TWO_PI;
    }

    @Override
    public double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
      if (k != 1 || !(args[1] > 0) || !inSupport(x, args)) {
        return super.logArgumentSlope(x, args, k, gradient);
      }
      // tau d/dtau (-tau d^2/2 + log(tau)/2) = (1 - tau d^2)/2.
      double d = x - args[0];
      return 0.5 * (1.0 - args[1] * d * d);
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = (x - mean) sqrt(tau): dz/dtau / dz/dx = (x - mean)/(2 tau).
      return k == 0 ? -1.0 : (x - args[0]) / (2.0 * args[1]);
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return curvatureInMean(scale);
      }
      return switch (scale) {
        // log(tau)/2 - c tau: d2 = -1/(2 tau^2).
        case NATURAL -> Curvature.concave(
            "normal log-density is concave in precision: log(precision)/2 - c precision, second derivative -1/(2 precision^2)");
        // tau = e^u: u/2 - c e^u, d2 = -c e^u <= 0.
        case LOG -> Curvature.concave(
            "normal log-density is concave in u = log(precision): u/2 - c exp(u) with c = (x - mean)^2/2, second derivative -c exp(u) <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "precision", scale);
      };
    }
  }
}

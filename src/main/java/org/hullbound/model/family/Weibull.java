package org.hullbound.model.family;

import java.util.List;

/**
 * The Weibull family {@code (shape, scale)}.
 *
 * <p>Log-density {@code log(shape/scale) + (shape - 1) log(x/scale) - (x/scale)^shape}; upper tail
 * {@code exp(-(x/scale)^shape)}. Both arguments enter the distribution function only through {@code
 * t = (x/scale)^shape}, so the truncation normaliser has closed-form derivatives in both.
 */
final class Weibull {
  private Weibull() {}

  static Family family() {
    return SimpleFamily.of("weibull", f -> List.of(new ByShapeScale(f)));
  }

  private static final class ByShapeScale extends ContinuousParametrisation {
    ByShapeScale(Family family) {
      super(family, SupportKind.POSITIVE, "shape", ArgumentDomain.POSITIVE, "scale", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double shape = args[0];
      double scale = args[1];
      double logRatio = Math.log(x / scale);
      double t = Math.exp(shape * logRatio);
      if (gradient != null) {
        gradient[0] = (shape - 1.0 - shape * t) / x;
        gradient[1] = 1.0 / shape + logRatio * (1.0 - t);
        gradient[2] = shape * (t - 1.0) / scale;
      }
      return Math.log(shape / scale) + (shape - 1.0) * logRatio - t;
    }

    @Override
    public double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
      if (k != 1 || !(args[1] > 0) || !inSupport(x, args)) {
        return super.logArgumentSlope(x, args, k, gradient);
      }
      // scale d/dscale (-shape log scale - (x/scale)^shape) = shape (t - 1) with t = (x/scale)^shape,
      // finite while t is, unlike shape (t - 1)/scale.
      return args[0] * (t(x, args) - 1.0);
    }

    private static double t(double x, double[] args) {
      return Math.exp(args[0] * Math.log(x / args[1]));
    }

    @Override
    double logLowerTail(double x, double[] args) {
      return LogSpace.log1mExp(-t(x, args));
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return -t(x, args);
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return true;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // t = (x/scale)^shape, dt/dx = shape t/x, dt/dshape = t log(x/scale), dt/dscale = -shape t/scale.
      return k == 0 ? x * Math.log(x / args[1]) / args[0] : -x / args[1];
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        // d2/dx2 = -(shape - 1)(1/x^2 + shape x^(shape-2)/scale^shape).
        case NATURAL -> {
          if (!known(knownArgs, 0)) {
            yield Curvature.notEstablished(
                "weibull log-density in the value has second derivative -(shape - 1)(1/x^2 + shape x^(shape-2)/scale^shape): concave only when shape >= 1, and shape is unknown; concave in log(value)");
          }
          yield knownArgs[0] >= 1
              ? Curvature.concave(
                  "weibull log-density is concave in the value since shape >= 1: second derivative -(shape - 1)(1/x^2 + shape x^(shape-2)/scale^shape)")
              : Curvature.notEstablished(
                  "weibull log-density in the value has positive second derivative near 0 since shape < 1; concave in log(value)");
        }
        // x = e^u: shape (u - log scale) - t + const, d2 = -shape^2 t.
        case LOG -> Curvature.concave(
            "weibull log-density is concave in u = log(value): shape u - (exp(u)/scale)^shape, second derivative -shape^2 (value/scale)^shape < 0");
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return switch (scale) {
          // log k + (k - 1) L - e^{kL}, L = log(x/scale): d2 = -1/k^2 - L^2 e^{kL}.
          case NATURAL -> Curvature.concave(
              "weibull log-density is concave in shape: second derivative -1/shape^2 - L^2 (x/scale)^shape with L = log(x/scale)");
          // k = e^u, s = kL: d2 = s (1 - (1 + s) e^s) <= 0 since (1 + s) <= e^{-s}.
          case LOG -> Curvature.concave(
              "weibull log-density is concave in u = log(shape): second derivative s (1 - (1 + s) exp(s)) <= 0 with s = shape log(x/scale), as 1 + s <= exp(-s)");
          case LOGIT -> Reasons.notAnalysed(this, "shape", scale);
        };
      }
      return switch (scale) {
        // -k log(scale) - x^k scale^-k: d2 = k/scale^2 - k(k+1) x^k/scale^(k+2).
        case NATURAL -> Curvature.notEstablished(
            "weibull log-density in scale has second derivative shape/scale^2 - shape (shape + 1) x^shape/scale^(shape+2), positive for small x; concave in log(scale)");
        // scale = e^u: -k u - x^k e^{-ku}, d2 = -k^2 x^k e^{-ku}.
        case LOG -> Curvature.concave(
            "weibull log-density is concave in u = log(scale): -shape u - x^shape exp(-shape u), second derivative -shape^2 (x/scale)^shape < 0");
        case LOGIT -> Reasons.notAnalysed(this, "scale", scale);
      };
    }
  }
}

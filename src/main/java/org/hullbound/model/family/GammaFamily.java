package org.hullbound.model.family;

import java.util.List;
import org.apache.commons.math3.special.Gamma;

/**
 * The gamma family {@code (shape, rate)} and {@code (shape, scale)}.
 *
 * <p>Log-density {@code shape log(rate) - lgamma(shape) + (shape - 1) log x - rate x}; distribution
 * function {@code P(shape, rate x)} in log space by {@link IncompleteGamma}. The derivative of the
 * truncation normaliser in {@code shape} has no closed form and is numerical (Richardson-extrapolated
 * central differences, step {@code 1e-3 shape}); in rate or scale it is closed.
 */
final class GammaFamily {
  private GammaFamily() {}

  static Family family() {
    return SimpleFamily.of("gamma", f -> List.of(new ByRate(f), new ByScale(f)));
  }

  private abstract static class GammaForm extends ContinuousParametrisation {
    GammaForm(Family family, String second) {
      super(family, SupportKind.POSITIVE, "shape", ArgumentDomain.POSITIVE, second, ArgumentDomain.POSITIVE);
    }

    abstract double rate(double[] args);

    @Override
    double logLowerTail(double x, double[] args) {
      return IncompleteGamma.logLower(args[0], rate(args) * x);
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return IncompleteGamma.logUpper(args[0], rate(args) * x);
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return k == 1;
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        // d2/dx2 = -(shape - 1)/x^2.
        case NATURAL -> {
          if (!known(knownArgs, 0)) {
            yield Curvature.notEstablished(
                "gamma log-density in the value has second derivative -(shape - 1)/x^2: concave only when shape >= 1, and shape is unknown; concave in log(value)");
          }
          yield knownArgs[0] >= 1
              ? Curvature.concave("gamma log-density is concave in the value since shape >= 1: second derivative -(shape - 1)/x^2")
              : Curvature.notEstablished(
                  "gamma log-density in the value has second derivative -(shape - 1)/x^2 > 0 since shape < 1; concave in log(value)");
        }
        // x = e^u: shape u - rate e^u, d2 = -rate e^u.
        case LOG -> Curvature.concave(
            "gamma log-density is concave in u = log(value): shape*u - rate*exp(u), second derivative -rate exp(u) < 0");
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    Curvature curvatureInShape(Scale scale) {
      return switch (scale) {
        // shape (log(rate x)) - lgamma(shape): d2 = -trigamma(shape) < 0.
        case NATURAL -> Curvature.concave(
            "gamma log-density is concave in shape: second derivative -trigamma(shape) < 0");
        // d2/du2 = shape (log(rate x) - digamma(shape) - shape trigamma(shape)), positive for large x.
        case LOG -> Curvature.notEstablished(
            "gamma log-density in u = log(shape) has second derivative shape (log(rate x) - digamma(shape) - shape trigamma(shape)), positive for large x");
        case LOGIT -> Reasons.notAnalysed(this, "shape", scale);
      };
    }
  }

  private static final class ByRate extends GammaForm {
    ByRate(Family family) {
      super(family, "rate");
    }

    @Override
    double rate(double[] args) {
      return args[1];
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double shape = args[0];
      double rate = args[1];
      double logX = Math.log(x);
      if (gradient != null) {
        gradient[0] = (shape - 1.0) / x - rate;
        gradient[1] = Math.log(rate) - Gamma.digamma(shape) + logX;
        gradient[2] = shape / rate - x;
      }
      return shape * Math.log(rate) - Gamma.logGamma(shape) + (shape - 1.0) * logX - rate * x;
    }

    @Override
    public double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
      if (k != 1 || !(args[1] > 0) || !inSupport(x, args)) {
        return super.logArgumentSlope(x, args, k, gradient);
      }
      // rate d/drate (shape log rate - rate x) = shape - rate x, finite where shape/rate is not.
      return args[0] - args[1] * x;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = rate x: dz/drate / dz/dx = x/rate.
      return x / args[1];
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return curvatureInShape(scale);
      }
      return switch (scale) {
        case NATURAL -> Curvature.concave(
            "gamma log-density is concave in rate: shape log(rate) - rate x, second derivative -shape/rate^2");
        case LOG -> Curvature.concave(
            "gamma log-density is concave in u = log(rate): shape u - x exp(u), second derivative -x exp(u) <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "rate", scale);
      };
    }
  }

  private static final class ByScale extends GammaForm {
    ByScale(Family family) {
      super(family, "scale");
    }

    @Override
    double rate(double[] args) {
      return 1.0 / args[1];
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double shape = args[0];
      double scale = args[1];
      double logX = Math.log(x);
      if (gradient != null) {
        gradient[0] = (shape - 1.0) / x - 1.0 / scale;
        gradient[1] = -Math.log(scale) - Gamma.digamma(shape) + logX;
        gradient[2] = (x / scale - shape) / scale;
      }
      return -shape * Math.log(scale) - Gamma.logGamma(shape) + (shape - 1.0) * logX - x / scale;
    }

    @Override
    public double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
      if (k != 1 || !(args[1] > 0) || !inSupport(x, args)) {
        return super.logArgumentSlope(x, args, k, gradient);
      }
      // scale d/dscale (-shape log scale - x/scale) = x/scale - shape, finite where x/scale^2 is not.
      return x / args[1] - args[0];
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = x/scale: dz/dscale / dz/dx = -x/scale.
      return -x / args[1];
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return curvatureInShape(scale);
      }
      return switch (scale) {
        // -shape log(s) - x/s: d2 = shape/s^2 - 2x/s^3.
        case NATURAL -> Curvature.notEstablished(
            "gamma log-density in scale has second derivative shape/scale^2 - 2x/scale^3, positive for x < shape scale/2; concave in log(scale)");
        // s = e^u: -shape u - x e^{-u}, d2 = -x e^{-u}.
        case LOG -> Curvature.concave(
            "gamma log-density is concave in u = log(scale): -shape u - x exp(-u), second derivative -x exp(-u) <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "scale", scale);
      };
    }
  }
}

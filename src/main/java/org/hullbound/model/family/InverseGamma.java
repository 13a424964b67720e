package org.hullbound.model.family;

import java.util.List;
import org.apache.commons.math3.special.Gamma;

/**
 * The inverse-gamma family {@code (shape, scale)}: {@code 1/value} is gamma with that shape and rate
 * {@code scale}.
 *
 * <p>Log-density {@code shape log(scale) - lgamma(shape) - (shape + 1) log x - scale/x} (Johnson,
 * Kotz and Balakrishnan 1994, vol. 1, 17.8.3); distribution function {@code Q(shape, scale/x)}. The
 * derivative of the truncation normaliser in {@code shape} is numerical (Richardson-extrapolated
 * central differences, step {@code 1e-3 shape}); in scale it is closed.
 */
final class InverseGamma {
  private InverseGamma() {}

  static Family family() {
    return SimpleFamily.of("inverse-gamma", f -> List.of(new ByShapeScale(f)));
  }

  private static final class ByShapeScale extends ContinuousParametrisation {
    ByShapeScale(Family family) {
      super(family, SupportKind.POSITIVE, "shape", ArgumentDomain.POSITIVE, "scale", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double shape = args[0];
      double scale = args[1];
      double logX = Math.log(x);
      if (gradient != null) {
        gradient[0] = (scale / x - shape - 1.0) / x;
        gradient[1] = Math.log(scale) - Gamma.digamma(shape) - logX;
        gradient[2] = shape / scale - 1.0 / x;
      }
      return shape * Math.log(scale) - Gamma.logGamma(shape) - (shape + 1.0) * logX - scale / x;
    }

    @Override
    public double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
      if (k != 1 || !(args[1] > 0) || !inSupport(x, args)) {
        return super.logArgumentSlope(x, args, k, gradient);
      }
      // scale d/dscale (shape log scale - scale/x) = shape - scale/x, finite where shape/scale is not.
      return args[0] - args[1] / x;
    }

    @Override
    double logLowerTail(double x, double[] args) {
      return IncompleteGamma.logUpper(args[0], args[1] / x);
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return IncompleteGamma.logLower(args[0], args[1] / x);
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return k == 1;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      // z = scale/x: dz/dscale / dz/dx = (1/x)/(-scale/x^2) = -x/scale.
      return -x / args[1];
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        // d2/dx2 = ((shape + 1) x - 2 scale)/x^3.
        case NATURAL -> Curvature.notEstablished(
            "inverse-gamma log-density in the value has second derivative ((shape + 1) x - 2 scale)/x^3, positive for x > 2 scale/(shape + 1); concave in log(value)");
        // x = e^u: -shape u - scale e^{-u}, d2 = -scale e^{-u}.
        case LOG -> Curvature.concave(
            "inverse-gamma log-density is concave in u = log(value): -shape u - scale exp(-u), second derivative -scale exp(-u) < 0");
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return switch (scale) {
          case NATURAL -> Curvature.concave(
              "inverse-gamma log-density is concave in shape: second derivative -trigamma(shape) < 0");
          case LOG -> Curvature.notEstablished(
              "inverse-gamma log-density in u = log(shape) has second derivative shape (log(scale/x) - digamma(shape) - shape trigamma(shape)), positive for small x");
          case LOGIT -> Reasons.notAnalysed(this, "shape", scale);
        };
      }
      return switch (scale) {
        case NATURAL -> Curvature.concave(
            "inverse-gamma log-density is concave in scale: shape log(scale) - scale/x, second derivative -shape/scale^2");
        case LOG -> Curvature.concave(
            "inverse-gamma log-density is concave in u = log(scale): shape u - exp(u)/x, second derivative -exp(u)/x < 0");
        case LOGIT -> Reasons.notAnalysed(this, "scale", scale);
      };
    }
  }
}

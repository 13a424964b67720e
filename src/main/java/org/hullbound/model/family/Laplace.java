package org.hullbound.model.family;

import java.util.List;

/**
 * The Laplace (double exponential) family {@code (location, scale)}.
 *
 * <p>Log-density {@code -log(2 scale) - |x - location|/scale}; tails {@code exp(-|z|)/2}. It is
 * log-concave but not differentiable at {@code x = location}: a caller sampling it should use a
 * derivative-free hull (Gilks 1992).
 */
final class Laplace {
  private static final double LOG_HALF = Math.log(0.5);

  private Laplace() {}

  static Family family() {
    return SimpleFamily.of("laplace", f -> List.of(new ByLocationScale(f)));
  }

  private static final class ByLocationScale extends ContinuousParametrisation {
    ByLocationScale(Family family) {
      super(family, SupportKind.REAL, "location", ArgumentDomain.REAL, "scale", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double scale = args[1];
      double d = x - args[0];
      if (gradient != null) {
        // At the kink d = 0 the subgradient 0 is used.
        double sign = Math.signum(d);
        gradient[0] = -sign / scale;
        gradient[1] = sign / scale;
        gradient[2] = (-1.0 + Math.abs(d) / scale) / scale;
      }
      return -Math.log(2.0 * scale) - Math.abs(d) / scale;
    }

    @Override
    double logLowerTail(double x, double[] args) {
      double z = (x - args[0]) / args[1];
      return z < 0 ? LOG_HALF + z : LogSpace.log1p(-0.5 * Math.exp(-z));
    }

    @Override
    double logUpperTail(double x, double[] args) {
      double z = (x - args[0]) / args[1];
      return z > 0 ? LOG_HALF - z : LogSpace.log1p(-0.5 * Math.exp(z));
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
        case NATURAL -> Curvature.concave(
            "laplace log-density is concave in the value (piecewise linear, -|x - location|/scale) but not differentiable at x = location: use a derivative-free hull");
        // x = e^u: -|e^u - location|/scale + u, d2 = -x/scale above location, +x/scale below.
        case LOG -> {
          if (known(knownArgs, 0) && knownArgs[0] <= 0) {
            yield Curvature.concave(
                "laplace log-density is concave in u = log(value) since location <= 0: -(exp(u) - location)/scale + u, second derivative -value/scale");
          }
          yield Curvature.notEstablished(
              "laplace log-density in u = log(value) has second derivative +value/scale below location, so it is not concave when location > 0; concave when location <= 0 is known");
        }
        case LOGIT -> Reasons.notAnalysed(this, "the value", scale);
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return switch (scale) {
          case NATURAL -> Curvature.concave(
              "laplace log-density is concave in location (piecewise linear, -|x - location|/scale) but not differentiable at location = x: use a derivative-free hull");
          default -> Reasons.notAnalysed(this, "location", scale);
        };
      }
      return switch (scale) {
        // -log(b) - |d|/b: d2 = 1/b^2 - 2|d|/b^3.
        case NATURAL -> Curvature.notEstablished(
            "laplace log-density in scale has second derivative 1/scale^2 - 2|x - location|/scale^3, positive for |x - location| < scale/2; concave in log(scale)");
        // b = e^u: -u - |d| e^{-u}, d2 = -|d| e^{-u}.
        case LOG -> Curvature.concave(
            "laplace log-density is concave in u = log(scale): -u - |x - location| exp(-u), second derivative -|x - location| exp(-u) <= 0");
        case LOGIT -> Reasons.notAnalysed(this, "scale", scale);
      };
    }
  }
}

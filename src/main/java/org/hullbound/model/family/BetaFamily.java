package org.hullbound.model.family;

import java.util.List;
import org.apache.commons.math3.special.Beta;
import org.apache.commons.math3.special.Gamma;

/**
 * The beta family {@code (a, b)} on {@code (0, 1)}.
 *
 * <p>Log-density {@code (a - 1) log x + (b - 1) log(1 - x) - log B(a, b)}; distribution function
 * {@code I_x(a, b)} in log space by {@link IncompleteBeta}. The derivatives of the truncation
 * normaliser in {@code a} and {@code b} have no closed form and are numerical (Richardson-
 * extrapolated central differences, step {@code 1e-3} times the argument).
 */
final class BetaFamily {
  private BetaFamily() {}

  static Family family() {
    return SimpleFamily.of("beta", f -> List.of(new ByAB(f)));
  }

  private static final class ByAB extends ContinuousParametrisation {
    ByAB(Family family) {
      super(family, SupportKind.UNIT_INTERVAL, "a", ArgumentDomain.POSITIVE, "b", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double a = args[0];
      double b = args[1];
      double logX = Math.log(x);
      double log1mX = LogSpace.log1p(-x);
      if (gradient != null) {
        double digammaSum = Gamma.digamma(a + b);
        gradient[0] = (a - 1.0) / x - (b - 1.0) / (1.0 - x);
        gradient[1] = logX - Gamma.digamma(a) + digammaSum;
        gradient[2] = log1mX - Gamma.digamma(b) + digammaSum;
      }
      return (a - 1.0) * logX + (b - 1.0) * log1mX - Beta.logBeta(a, b);
    }

    @Override
    double logLowerTail(double x, double[] args) {
      return IncompleteBeta.logRegularized(x, 1.0 - x, args[0], args[1]);
    }

    @Override
    double logUpperTail(double x, double[] args) {
      return IncompleteBeta.logRegularized(1.0 - x, x, args[1], args[0]);
    }

    @Override
    boolean hasCdfSensitivity(int k) {
      return false;
    }

    @Override
    double cdfSensitivity(int k, double x, double[] args) {
      throw new UnsupportedOperationException("beta has no closed-form derivative of its distribution function");
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return switch (scale) {
        // d2/dx2 = -(a - 1)/x^2 - (b - 1)/(1 - x)^2.
        case NATURAL -> {
          boolean aKnown = known(knownArgs, 0);
          boolean bKnown = known(knownArgs, 1);
          if (aKnown && bKnown && knownArgs[0] >= 1 && knownArgs[1] >= 1) {
            yield Curvature.concave(
                "beta log-density is concave in the value since a, b >= 1: second derivative -(a - 1)/x^2 - (b - 1)/(1 - x)^2");
          }
          if ((aKnown && knownArgs[0] < 1) || (bKnown && knownArgs[1] < 1)) {
            yield Curvature.notEstablished(
                "beta log-density in the value has positive second derivative near 0 (a < 1) or 1 (b < 1); concave in logit(value)");
          }
          yield Curvature.notEstablished(
              "beta log-density in the value is concave only when a, b >= 1, which is not known here; concave in logit(value)");
        }
        // x = e^u: a u + (b - 1) log(1 - e^u), d2 = -(b - 1) e^u/(1 - e^u)^2.
        case LOG -> known(knownArgs, 1) && knownArgs[1] >= 1
            ? Curvature.concave(
                "beta log-density is concave in u = log(value) since b >= 1: a u + (b - 1) log(1 - exp(u)), second derivative -(b - 1) value/(1 - value)^2")
            : Curvature.notEstablished(
                "beta log-density in u = log(value) has second derivative -(b - 1) value/(1 - value)^2: concave only when b >= 1 is known");
        // x = expit(u): a u - (a + b) log(1 + e^u), d2 = -(a + b) v (1 - v).
        case LOGIT -> Curvature.concave(
            "beta log-density is concave in u = logit(value): a u - (a + b) log(1 + exp(u)), second derivative -(a + b) v(1 - v) < 0");
      };
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      String name = argumentNames().get(k);
      return switch (scale) {
        // d2/da2 = -(trigamma(a) - trigamma(a + b)) < 0 since trigamma decreases.
        case NATURAL -> Curvature.concave("beta log-density is concave in " + name
            + ": second derivative -(trigamma(" + name + ") - trigamma(a + b)) < 0, trigamma being decreasing");
        // e.g. a = e^u, a = 1, b = 2, x -> 1: d2 -> -1.25 + 1.5 > 0.
        case LOG -> Curvature.notEstablished("beta log-density in u = log(" + name
            + ") is not concave for every value: at " + name + " = 1, other argument 2 and value near 1 its second derivative is about 0.25 > 0");
        case LOGIT -> Reasons.notAnalysed(this, name, scale);
      };
    }
  }
}

package org.hullbound.model.family;

import java.util.List;
import org.apache.commons.math3.special.Gamma;

/**
 * The Poisson family {@code (rate)} and {@code (log_rate)}.
 *
 * <p>Log mass {@code x log(rate) - rate - lgamma(x + 1)}; {@code P(X <= n) = Q(n + 1, rate)}
 * (Johnson, Kemp and Kotz, Univariate Discrete Distributions, 3rd ed., 2005, 4.12), in log space
 * by {@link IncompleteGamma}. The terms are of size {@code rate log rate}, so the absolute error of
 * the log mass grows like {@code 1e-16 rate log(rate)}.
 */
final class Poisson {
  private Poisson() {}

  static Family family() {
    return SimpleFamily.of("poisson", f -> List.of(new ByRate(f), new ByLogRate(f)));
  }

  private abstract static class PoissonForm extends DiscreteParametrisation {
    PoissonForm(Family family, String name, ArgumentDomain domain) {
      super(family, SupportKind.COUNT, name, domain);
    }

    abstract double rate(double[] args);

    @Override
    double logLowerTail(double n, double[] args) {
      return IncompleteGamma.logUpper(n + 1.0, rate(args));
    }

    @Override
    double logUpperTail(double n, double[] args) {
      return IncompleteGamma.logLower(n + 1.0, rate(args));
    }
  }

  private static final class ByRate extends PoissonForm {
    ByRate(Family family) {
      super(family, "rate", ArgumentDomain.POSITIVE);
    }

    @Override
    double rate(double[] args) {
      return args[0];
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double rate = args[0];
      if (gradient != null) {
        gradient[0] = 0.0;
        gradient[1] = x / rate - 1.0;
      }
      return (x == 0 ? 0.0 : x * Math.log(rate)) - rate - Gamma.logGamma(x + 1.0);
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      return switch (scale) {
        case NATURAL -> Curvature.concave(
            "poisson log mass is concave in rate: x log(rate) - rate, second derivative -x/rate^2 <= 0");
        case LOG -> Curvature.concave(
            "poisson log mass is concave in u = log(rate): x u - exp(u), second derivative -exp(u) < 0");
        case LOGIT -> Reasons.notAnalysed(this, "rate", scale);
      };
    }
  }

  private static final class ByLogRate extends PoissonForm {
    ByLogRate(Family family) {
      super(family, "log_rate", ArgumentDomain.REAL);
    }

    @Override
    double rate(double[] args) {
      return Math.exp(args[0]);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double logRate = args[0];
      double rate = Math.exp(logRate);
      if (gradient != null) {
        gradient[0] = 0.0;
        gradient[1] = x - rate;
      }
      return x * logRate - rate - Gamma.logGamma(x + 1.0);
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      return switch (scale) {
        case NATURAL -> Curvature.concave(
            "poisson log mass is concave in log_rate: x log_rate - exp(log_rate), second derivative -exp(log_rate) < 0");
        case LOG -> Curvature.notEstablished(
            "poisson log mass in u = log(log_rate) has second derivative x e^u - (e^u + e^{2u}) exp(e^u), positive for large x");
        case LOGIT -> Reasons.notAnalysed(this, "log_rate", scale);
      };
    }
  }
}

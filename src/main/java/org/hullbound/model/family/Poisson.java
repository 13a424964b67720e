package org.hullbound.model.family;

import java.util.List;
import org.apache.commons.math3.special.Gamma;

/**
 * The Poisson family {@code (rate)} and {@code (log_rate)}.
 *
 * <p>Log mass {@code x log(rate) - rate - lgamma(x + 1)}, evaluated in the saddle-point form of
 * Loader (2000), "Fast and accurate computation of binomial probabilities": {@code -stirlingError(x)
 * - bd0(x, rate) - log(2 pi x)/2}, which avoids the cancellation of terms of size {@code rate
 * log(rate)} for large rates. {@code P(X <= n) = Q(n + 1, rate)} (Johnson, Kemp and Kotz,
 * Univariate Discrete Distributions, 3rd ed., 2005, 4.12), in log space by {@link IncompleteGamma};
 * the derivative of a truncation normaliser uses {@code dP(X <= n)/drate = -pmf(n)}.
 */
final class Poisson {
  private static final double HALF_LOG_TWO_PI = 0.5 * Math.log(2 * Math.PI);

  /**
   * Counts up to which rows of one log rate are summed as a group: beyond, {@code y log_rate} and
   * {@code lgamma(y + 1)} cancel from hundreds, and each row keeps Loader's form.
   */
  static final double GROUPED_COUNT = 100;

  private Poisson() {}

  /** {@code x log(rate) - rate - lgamma(x + 1)} for a whole {@code x >= 0} (Loader 2000). */
  static double logMass(double x, double rate) {
    if (x == 0) {
      return -rate;
    }
    return -SaddlePoint.stirlingError(x) - SaddlePoint.deviance(x, rate, x - rate)
        - HALF_LOG_TWO_PI - 0.5 * Math.log(x);
  }

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

    // x log(rate) - lgamma(x + 1): differences log(rate) - log(x + 1) fall in x.
    @Override
    public final Curvature curvatureInWholeValue(double[] knownArgs) {
      return Curvature.concave(
          "poisson log mass has differences log(rate) - log(x + 1), falling in x");
    }

    /** d rate / d argument. */
    abstract double rateSlope(double[] args);

    @Override
    double cdfDerivative(int k, double n, double[] args, double logScale) {
      // d/drate P(X <= n) = -pmf(n) (JKK 2005, 4.12: the derivative of Q(n + 1, rate) in rate).
      return -Math.exp(logMass(n, rate(args)) - logScale) * rateSlope(args);
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
    double rateSlope(double[] args) {
      return 1.0;
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double rate = args[0];
      if (gradient != null) {
        gradient[0] = 0.0;
        gradient[1] = x / rate - 1.0;
      }
      return logMass(x, rate);
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
    double rateSlope(double[] args) {
      return Math.exp(args[0]);
    }

    private final AffineRows rows = new LogRateRows();

    @Override
    public AffineRows affineRows(int k) {
      return rows;
    }

    /**
     * The rows' sums, each as {@link #evaluate} after the support test of {@code logDensity},
     * with the parts of the log mass free of the rate kept per row: {@code lgamma(x + 1)}, the
     * Stirling error of {@code x} and {@code log(x)/2} (the same operations, so the same bits).
     */
    private final class LogRateRows implements AffineRows {
      @Override
      public int keptPerRow() {
        return 3;
      }

      @Override
      public void keep(double[][] intercepts, int[] interceptStrides, int from, int count,
          double[] kept, int keptFirst) {
        double[] ys = intercepts[0];
        int ys0 = interceptStrides[0];
        for (int j = 0, r = from, q = keptFirst; j < count; j++, r++, q += 3) {
          double y = ys[r * ys0];
          boolean counted = ArgumentDomain.WHOLE.accepts(y) && y > 0;
          kept[q] = ArgumentDomain.WHOLE.accepts(y) ? Gamma.logGamma(y + 1.0) : Double.NaN;
          kept[q + 1] = counted ? SaddlePoint.stirlingError(y) : Double.NaN;
          kept[q + 2] = counted ? 0.5 * Math.log(y) : Double.NaN;
        }
      }

      @Override
      public void accumulate(double x, double[][] intercepts, int[] interceptStrides,
          double[][] slopes, int[] slopeStrides, int from, int count, double[] kept,
          int keptFirst, double[] sums, double[] args, double[] gradient) {
        double[] ys = intercepts[0];
        int ys0 = interceptStrides[0];
        double[] as = intercepts[1];
        int as0 = interceptStrides[1];
        double[] bs = slopes[1];
        int bs0 = slopeStrides[1];
        double total = sums[0];
        double dx = sums[1];
        for (int j = 0, r = from, q = keptFirst; j < count; j++, r++, q += 3) {
          double y = ys[r * ys0];
          double b = bs[r * bs0];
          double logRate = b == 0 ? as[r * as0] : as[r * as0] + b * x;
          double value;
          double g;
          if (ArgumentDomain.WHOLE.accepts(y)) {
            double rate = Math.exp(logRate);
            g = y - rate;
            if (logRate < 0) {
              value = (y == 0 ? 0.0 : y * logRate) - rate - kept[q];
            } else if (rate == Double.POSITIVE_INFINITY) {
              value = Double.NEGATIVE_INFINITY;
            } else if (y == 0) {
              value = -rate;
            } else {
              value = -kept[q + 1] - SaddlePoint.deviance(y, rate, y - rate) - HALF_LOG_TWO_PI
                  - kept[q + 2];
            }
          } else {
            args[0] = logRate;
            value = logDensity(y, args, gradient);
            g = gradient[1];
          }
          total += value;
          dx += 0.0 + g * b;
        }
        sums[0] = total;
        sums[1] = dx;
      }

      @Override
      public boolean groupable(double[][] intercepts, int[] interceptStrides, int row) {
        double y = intercepts[0][row * interceptStrides[0]];
        return ArgumentDomain.WHOLE.accepts(y) && y >= 0 && y <= GROUPED_COUNT;
      }

      /** Sum of the responses, the number of rows, sum of {@code lgamma(y + 1)}. */
      @Override
      public int statisticsPerGroup() {
        return 3;
      }

      @Override
      public void addToGroup(double[][] intercepts, int[] interceptStrides, int row,
          double[] statistics, int at) {
        double y = intercepts[0][row * interceptStrides[0]];
        statistics[at] += y;
        statistics[at + 1] += 1;
        statistics[at + 2] += Gamma.logGamma(y + 1.0);
      }

      /**
       * A group's log mass {@code sum(y) eta - n exp(eta) - sum lgamma(y + 1)}, linear in the
       * sufficient statistics {@code sum(y)}, {@code n} given {@code eta} (common practice: the
       * Poisson is an exponential family in its log rate); {@code -inf} where {@code exp(eta)}
       * overflows, as a row alone; slope {@code sum(y) - n exp(eta)}.
       */
      @Override
      public void accumulateGroups(double x, double[][] intercepts, int[] interceptStrides,
          double[][] slopes, int[] slopeStrides, int[] rows, int count, double[] statistics,
          double[] sums) {
        double total = sums[0];
        double dx = sums[1];
        for (int g = 0, q = 0; g < count; g++, q += 3) {
          int r = rows[g];
          double a = intercepts[1][r * interceptStrides[1]];
          double b = slopes[1][r * slopeStrides[1]];
          double logRate = b == 0 ? a : a + b * x;
          double sumY = statistics[q];
          double rowCount = statistics[q + 1];
          double rate = Math.exp(logRate);
          double value = rate == Double.POSITIVE_INFINITY ? Double.NEGATIVE_INFINITY
              : (sumY == 0 ? 0.0 : sumY * logRate) - rowCount * rate - statistics[q + 2];
          total += value;
          dx += 0.0 + (sumY - rowCount * rate) * b;
        }
        sums[0] = total;
        sums[1] = dx;
      }
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double logRate = args[0];
      double rate = Math.exp(logRate);
      if (gradient != null) {
        gradient[0] = 0.0;
        gradient[1] = x - rate;
      }
      if (logRate < 0) {
        // x log_rate - rate - lgamma(x + 1): all three terms are <= 0 here, so the sum does not
        // cancel, and stays finite where exp(log_rate) underflows (below about -745).
        return (x == 0 ? 0.0 : x * logRate) - rate - Gamma.logGamma(x + 1.0);
      }
      if (rate == Double.POSITIVE_INFINITY) {
        // Beyond log_rate 709.78 the log mass is below -e^709.78 = -1.8e308: it overflows.
        return Double.NEGATIVE_INFINITY;
      }
      return logMass(x, rate);
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

package org.hullbound.model.family;

import java.util.List;
import org.apache.commons.math3.special.Beta;
import org.apache.commons.math3.special.Gamma;

/**
 * The negative binomial family {@code (mean, size)}: a gamma mixture of Poissons with that mean and
 * variance {@code mean + mean^2/size}.
 *
 * <p>Log mass {@code lgamma(x + size) - lgamma(size) - lgamma(x + 1) + size log(size/(size + mean))
 * + x log(mean/(size + mean))} (Johnson, Kemp and Kotz, Univariate Discrete Distributions, 3rd ed.,
 * 2005, 5.1 with {@code P = mean/size}), as {@code size/(size + x)} times a binomial mass in
 * Loader's saddle-point form ({@link SaddlePoint}), whose differences stay precise where size and x
 * are near 1e15 and the terms cancel (the gamma ratio as {@code -log x - log B(x, size)} where it
 * does not apply);
 * {@code P(X <= n) = I_q(size, n + 1)} with {@code q = size/(size + mean)}. The derivative of a
 * truncation normaliser in {@code size} is numerical (Richardson-extrapolated central differences,
 * step {@code 1e-3 size}); in {@code mean} it is closed.
 */
final class NegativeBinomial {
  private NegativeBinomial() {}

  static Family family() {
    return SimpleFamily.of("negative-binomial", f -> List.of(new ByMeanSize(f)));
  }

  private static final class ByMeanSize extends DiscreteParametrisation {
    ByMeanSize(Family family) {
      super(family, SupportKind.COUNT, "mean", ArgumentDomain.POSITIVE, "size", ArgumentDomain.POSITIVE);
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double mean = args[0];
      double size = args[1];
      if (gradient != null) {
        gradient[0] = 0.0;
        gradient[1] = x / mean - (size + x) / (size + mean);
        gradient[2] = Gamma.digamma(x + size) - Gamma.digamma(size) - LogSpace.log1p(mean / size)
            + (mean - x) / (size + mean);
      }
      if (x == 0) {
        return -size * LogSpace.log1p(mean / size);
      }
      double trials = size + x;
      double p = size / trials;
      double stop = size / (size + mean);
      double go = mean / (size + mean);
      if (trials - size == x && SaddlePoint.applies(trials, stop, go)) {
        // pmf = size/(size + x) binomial(size; size + x, size/(size + mean)) (the form of R's
        // dnbinom_mu, after Loader 2000): precise in mean and size where size and x are near 1e15
        // and the terms below cancel; excess size - (size + x) stop = size (mean - x)/(size + mean)
        double excess = size * ((mean - x) / (size + mean));
        return Math.log(p) + SaddlePoint.binomial(size, trials, stop, go, excess);
      }
      double logGammaRatio = -Math.log(x) - Beta.logBeta(x, size);
      return logGammaRatio - size * LogSpace.log1p(mean / size) - x * LogSpace.log1p(size / mean);
    }

    @Override
    double logLowerTail(double n, double[] args) {
      double mean = args[0];
      double size = args[1];
      return IncompleteBeta.logRegularized(size / (size + mean), mean / (size + mean),
          -LogSpace.log1p(mean / size), -LogSpace.log1p(size / mean), size, n + 1.0);
    }

    @Override
    double logUpperTail(double n, double[] args) {
      double mean = args[0];
      double size = args[1];
      return IncompleteBeta.logRegularized(mean / (size + mean), size / (size + mean),
          -LogSpace.log1p(size / mean), -LogSpace.log1p(mean / size), n + 1.0, size);
    }

    @Override
    double cdfDerivative(int k, double n, double[] args, double logScale) {
      if (k != 0) {
        return Double.NaN;
      }
      // P(X <= n) = I_q(size, n + 1), q = size/(size + mean): dI/dq = q^(size-1) (1-q)^n / B(size, n + 1)
      // (A&S 6.6.1 with 26.5.1), dq/dmean = -size/(size + mean)^2.
      double mean = args[0];
      double size = args[1];
      double logQ = -LogSpace.log1p(mean / size);
      double log1mQ = -LogSpace.log1p(size / mean);
      double logDerivative = (size - 1.0) * logQ + (n == 0 ? 0.0 : n * log1mQ) - Beta.logBeta(size, n + 1.0)
          + Math.log(size) - 2.0 * Math.log(size + mean);
      return -Math.exp(logDerivative - logScale);
    }

    // lgamma(x + size) - lgamma(x + 1) + x log(mean/(size + mean)): differences
    // log((x + size)/(x + 1)) + const, falling in x exactly when size >= 1.
    @Override
    public Curvature curvatureInWholeValue(double[] knownArgs) {
      return known(knownArgs, 1) && knownArgs[1] >= 1
          ? Curvature.concave("negative-binomial log mass has differences log((x + size)/(x + 1))"
              + " + log(mean/(size + mean)), falling in x since size >= 1")
          : Curvature.notEstablished("negative-binomial log mass is concave in a whole value only"
              + " for a known size >= 1 (its differences log((x + size)/(x + 1)) rise when size"
              + " < 1)");
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k == 0) {
        return switch (scale) {
          // x log m - (r + x) log(r + m): d2 = -x/m^2 + (r + x)/(r + m)^2 = r/(r + m)^2 > 0 at x = 0.
          case NATURAL -> Curvature.notEstablished(
              "negative-binomial log mass in mean has second derivative -x/mean^2 + (size + x)/(size + mean)^2, positive at x = 0; concave in log(mean)");
          // m = e^u: x u - (r + x) log(r + e^u), d2 = -(r + x) r m/(r + m)^2.
          case LOG -> Curvature.concave(
              "negative-binomial log mass is concave in u = log(mean): x u - (size + x) log(size + exp(u)), second derivative -(size + x) size mean/(size + mean)^2 < 0");
          case LOGIT -> Reasons.notAnalysed(this, "mean", scale);
        };
      }
      return switch (scale) {
        // At x = 0: -r log(1 + m/r), d2 = m^2/(r (r + m)^2) > 0.
        case NATURAL -> Curvature.notEstablished(
            "negative-binomial log mass in size is not concave: at x = 0 its second derivative is mean^2/(size (size + mean)^2) > 0");
        default -> Reasons.notAnalysed(this, "size", scale);
      };
    }
  }
}

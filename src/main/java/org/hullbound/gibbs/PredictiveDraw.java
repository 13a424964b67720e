package org.hullbound.gibbs;

import java.util.List;
import java.util.random.RandomGenerator;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.CauchyDistribution;
import org.apache.commons.math3.distribution.ExponentialDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.IntegerDistribution;
import org.apache.commons.math3.distribution.LaplaceDistribution;
import org.apache.commons.math3.distribution.LogNormalDistribution;
import org.apache.commons.math3.distribution.LogisticDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.distribution.RealDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.distribution.UniformRealDistribution;
import org.apache.commons.math3.distribution.WeibullDistribution;
import org.hullbound.sampling.ConjugateDraws;

/**
 * An exact draw from a family of the model language given its named arguments, optionally
 * truncated to {@code [lower, upper]}: the draw of a missing observation that nothing depends on.
 *
 * <p>By inversion, {@code F^-1(F(lower) + U (F(upper) - F(lower)))} with one uniform (Devroye
 * 1986, section II.2), using commons-math3's distribution functions, so that truncation costs
 * nothing extra; the negative binomial as a gamma mixture of Poissons (Devroye 1986, X.4).
 */
final class PredictiveDraw {
  private PredictiveDraw() {}

  /** Whether {@link #draw} knows this family and parametrisation. */
  static boolean supports(String family, List<String> names) {
    try {
      realOrInteger(family, names, new double[names.size()], true);
      return true;
    } catch (UnsupportedOperationException unknown) {
      return false;
    } catch (RuntimeException invalidDummyArguments) {
      return true;
    }
  }

  /** A draw, natural scale. */
  static double draw(
      String family, List<String> names, double[] args, double lower, double upper,
      RandomGenerator rng) {
    if (family.equals("neg_binomial") && !(lower > 0) && upper == Double.POSITIVE_INFINITY) {
      double mean = args[names.indexOf("mean")];
      double size = args[names.indexOf("size")];
      double rate = ConjugateDraws.gamma(rng, size, size / mean);
      return new PoissonDistribution(null, rate, 1e-12, 10_000_000).inverseCumulativeProbability(
          rng.nextDouble());
    }
    Object distribution = realOrInteger(family, names, args, false);
    double u = rng.nextDouble();
    if (distribution instanceof RealDistribution real) {
      double lo = Double.isInfinite(lower) ? 0 : real.cumulativeProbability(lower);
      double hi = Double.isInfinite(upper) ? 1 : real.cumulativeProbability(upper);
      double p = lo + u * (hi - lo);
      return real.inverseCumulativeProbability(Math.min(Math.max(p, 0), 1));
    }
    IntegerDistribution integer = (IntegerDistribution) distribution;
    double lo =
        Double.isInfinite(lower) ? 0 : integer.cumulativeProbability((int) Math.ceil(lower) - 1);
    double hi =
        Double.isInfinite(upper) ? 1 : integer.cumulativeProbability((int) Math.floor(upper));
    double p = lo + u * (hi - lo);
    return integer.inverseCumulativeProbability(Math.min(Math.max(p, 0), 1));
  }

  private static double arg(List<String> names, double[] args, String name) {
    int k = names.indexOf(name);
    return k < 0 ? Double.NaN : args[k];
  }

  private static Object realOrInteger(
      String family, List<String> names, double[] args, boolean probeOnly) {
    double[] a = args;
    if (probeOnly) {
      a = new double[args.length];
      java.util.Arrays.fill(a, 1.0);
    }
    switch (family) {
      case "normal": {
        double mean = arg(names, a, "mean");
        double sd =
            names.contains("sd") ? arg(names, a, "sd")
                : names.contains("var") ? Math.sqrt(arg(names, a, "var"))
                    : names.contains("precision") ? 1 / Math.sqrt(arg(names, a, "precision"))
                        : unsupported(family, names);
        return new NormalDistribution(null, mean, sd);
      }
      case "lognormal":
        return new LogNormalDistribution(null, arg(names, a, "meanlog"), arg(names, a, "sdlog"));
      case "half_normal":
        return new HalfDistribution(new NormalDistribution(null, 0, arg(names, a, "sd")));
      case "student_t":
        return new ScaledT(arg(names, a, "df"), arg(names, a, "location"), arg(names, a, "scale"));
      case "cauchy":
        return new CauchyDistribution(null, arg(names, a, "location"), arg(names, a, "scale"));
      case "half_cauchy":
        return new HalfDistribution(new CauchyDistribution(null, 0, arg(names, a, "scale")));
      case "logistic":
        return new LogisticDistribution(null, arg(names, a, "location"), arg(names, a, "scale"));
      case "laplace":
        return new LaplaceDistribution(null, arg(names, a, "location"), arg(names, a, "scale"));
      case "exponential":
        return new ExponentialDistribution(null, 1 / arg(names, a, "rate"));
      case "gamma": {
        double shape = arg(names, a, "shape");
        double scale =
            names.contains("rate") ? 1 / arg(names, a, "rate")
                : names.contains("scale") ? arg(names, a, "scale") : unsupported(family, names);
        return new GammaDistribution(null, shape, scale);
      }
      case "inv_gamma":
        return new Reciprocal(
            new GammaDistribution(null, arg(names, a, "shape"), 1 / arg(names, a, "scale")));
      case "weibull":
        return new WeibullDistribution(null, arg(names, a, "shape"), arg(names, a, "scale"));
      case "beta":
        return new BetaDistribution(null, arg(names, a, "a"), arg(names, a, "b"));
      case "uniform":
        return new UniformRealDistribution(null, arg(names, a, "lower"), arg(names, a, "upper"));
      case "poisson": {
        double rate =
            names.contains("rate") ? arg(names, a, "rate")
                : names.contains("log_rate") ? Math.exp(arg(names, a, "log_rate"))
                    : unsupported(family, names);
        return new PoissonDistribution(null, rate, 1e-12, 10_000_000);
      }
      case "binomial":
      case "bernoulli": {
        int trials = family.equals("bernoulli") ? 1 : (int) Math.round(arg(names, a, "trials"));
        double p =
            names.contains("p") ? arg(names, a, "p")
                : names.contains("logit_p") ? 1 / (1 + Math.exp(-arg(names, a, "logit_p")))
                    : unsupported(family, names);
        return new BinomialDistribution(null, trials, p);
      }
      case "neg_binomial": {
        // Only reached when truncated: a Poisson-gamma mixture has no inverse CDF here.
        return unsupportedObject(family, names);
      }
      default:
        return unsupportedObject(family, names);
    }
  }

  private static double unsupported(String family, List<String> names) {
    throw new UnsupportedOperationException("no exact draw for " + family + names);
  }

  private static Object unsupportedObject(String family, List<String> names) {
    throw new UnsupportedOperationException("no exact draw for " + family + names);
  }

  /** |X| for X symmetric about 0: F(x) = 2 G(x) - 1. */
  private static final class HalfDistribution extends UnboundedAdapter {
    private final RealDistribution symmetric;

    HalfDistribution(RealDistribution symmetric) {
      this.symmetric = symmetric;
    }

    @Override
    public double cumulativeProbability(double x) {
      return x <= 0 ? 0 : 2 * symmetric.cumulativeProbability(x) - 1;
    }

    @Override
    public double inverseCumulativeProbability(double p) {
      return symmetric.inverseCumulativeProbability((1 + p) / 2);
    }
  }

  /** location + scale T for T ~ student t(df). */
  private static final class ScaledT extends UnboundedAdapter {
    private final TDistribution t;
    private final double location;
    private final double scale;

    ScaledT(double df, double location, double scale) {
      this.t = new TDistribution(null, df);
      this.location = location;
      this.scale = scale;
      if (!(scale > 0)) {
        throw new IllegalArgumentException("scale must be > 0, got " + scale);
      }
    }

    @Override
    public double cumulativeProbability(double x) {
      return t.cumulativeProbability((x - location) / scale);
    }

    @Override
    public double inverseCumulativeProbability(double p) {
      return location + scale * t.inverseCumulativeProbability(p);
    }
  }

  /** 1 / G for G positive: F(x) = 1 - G(1/x). */
  private static final class Reciprocal extends UnboundedAdapter {
    private final RealDistribution positive;

    Reciprocal(RealDistribution positive) {
      this.positive = positive;
    }

    @Override
    public double cumulativeProbability(double x) {
      return x <= 0 ? 0 : 1 - positive.cumulativeProbability(1 / x);
    }

    @Override
    public double inverseCumulativeProbability(double p) {
      return 1 / positive.inverseCumulativeProbability(1 - p);
    }
  }

  /** Only the two functions inversion needs; the rest of the interface is not used here. */
  private abstract static class UnboundedAdapter
      extends org.apache.commons.math3.distribution.AbstractRealDistribution {
    UnboundedAdapter() {
      super(null);
    }

    @Override
    public double density(double x) {
      throw new UnsupportedOperationException("density is not needed for inversion");
    }

    @Override
    public double getNumericalMean() {
      return Double.NaN;
    }

    @Override
    public double getNumericalVariance() {
      return Double.NaN;
    }

    @Override
    public double getSupportLowerBound() {
      return Double.NEGATIVE_INFINITY;
    }

    @Override
    public double getSupportUpperBound() {
      return Double.POSITIVE_INFINITY;
    }

    @Override
    public boolean isSupportLowerBoundInclusive() {
      return false;
    }

    @Override
    public boolean isSupportUpperBoundInclusive() {
      return false;
    }

    @Override
    public boolean isSupportConnected() {
      return true;
    }
  }
}

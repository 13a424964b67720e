package org.hullbound.model.family;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Set;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.RandomDistribution;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.CauchyDistribution;
import org.apache.commons.math3.distribution.EnumeratedIntegerDistribution;
import org.apache.commons.math3.distribution.ExponentialDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.LaplaceDistribution;
import org.apache.commons.math3.distribution.LogNormalDistribution;
import org.apache.commons.math3.distribution.LogisticDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PascalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.distribution.UniformIntegerDistribution;
import org.apache.commons.math3.distribution.UniformRealDistribution;
import org.apache.commons.math3.distribution.WeibullDistribution;
import org.apache.commons.math3.special.Beta;

/**
 * Test table: for every parametrisation, generators of valid arguments and values, a reference
 * log-density and (where it is accurate) a reference distribution function, each naming its source.
 */
final class FamilyCases {
  private FamilyCases() {}

  /** Maps a uniform {@code q} in (0, 1) to a value in the support. */
  interface ValueMap {
    double value(double[] args, double q);
  }

  interface Reference {
    double at(double x, double[] args);
  }

  /**
   * One parametrisation under test.
   *
   * @param width the spread of the density at these arguments, to size finite-difference steps
   * @param cdf reference distribution function {@code P(X <= x)}, or {@code null}
   */
  record Case(
      String label,
      Parametrisation parametrisation,
      Arbitrary<double[]> args,
      ValueMap values,
      Reference logDensity,
      Reference cdf,
      Reference width,
      String source) {
    @Override
    public String toString() {
      return label;
    }
  }

  /** A generated point: a case, its arguments and a value in the support. */
  record Point(Case testCase, double[] args, double x) {
    Parametrisation p() {
      return testCase.parametrisation();
    }

    @Override
    public String toString() {
      return testCase.label() + " args=" + Arrays.toString(args) + " x=" + x;
    }
  }

  static Parametrisation parametrisation(String family, String... names) {
    return Families.lookup(family).orElseThrow().match(Set.of(names)).orElseThrow();
  }

  static Arbitrary<Double> uniform(double lo, double hi) {
    return Arbitraries.doubles().between(0, 1).ofScale(15).withDistribution(RandomDistribution.uniform())
        .map(u -> lo + u * (hi - lo));
  }

  static Arbitrary<Double> logUniform(double lo, double hi) {
    return uniform(Math.log(lo), Math.log(hi)).map(Math::exp);
  }

  static Arbitrary<Double> whole(int lo, int hi) {
    return Arbitraries.integers().between(lo, hi).map(i -> (double) i);
  }

  @SafeVarargs
  @SuppressWarnings("varargs") // each is only read, so handing it on to List.of is safe
  static Arbitrary<double[]> args(Arbitrary<Double>... each) {
    return Combinators.combine(List.of(each))
        .as(list -> list.stream().mapToDouble(Double::doubleValue).toArray());
  }

  static final List<Case> CASES = build();

  static Arbitrary<Point> points() {
    return Arbitraries.of(CASES).flatMap(c -> Combinators.combine(c.args(), uniform(0.001, 0.999))
        .as((a, q) -> new Point(c, a, c.values().value(a, q))));
  }

  static Arbitrary<Point> continuousPoints() {
    return points().filter(p -> !p.p().discrete());
  }

  /**
   * A standardised value in {@code [-range, range]}, dense near 0 (where several curvature facts
   * change sign) and still reaching the tails: {@code range (2q - 1)^3}.
   */
  private static double spread(double q, double range) {
    double c = 2 * q - 1;
    return range * c * c * c;
  }

  private static double floorCount(double q, double span) {
    return Math.floor(q * span);
  }

  private static List<Case> build() {
    List<Case> cases = new ArrayList<>();
    String cm = "commons-math3 3.6.1 ";
    Arbitrary<Double> mean = uniform(-50, 50);
    Arbitrary<Double> positive = logUniform(0.01, 100);

    cases.add(new Case("normal(mean, sd)", parametrisation("normal", "mean", "sd"), args(mean, positive),
        (a, q) -> a[0] + a[1] * spread(q, 8),
        (x, a) -> new NormalDistribution(null, a[0], a[1]).logDensity(x),
        (x, a) -> new NormalDistribution(null, a[0], a[1]).cumulativeProbability(x),
        (x, a) -> a[1], cm + "NormalDistribution"));
    cases.add(new Case("normal(mean, var)", parametrisation("normal", "mean", "var"),
        args(mean, logUniform(1e-4, 1e4)),
        (a, q) -> a[0] + Math.sqrt(a[1]) * spread(q, 8),
        (x, a) -> new NormalDistribution(null, a[0], Math.sqrt(a[1])).logDensity(x),
        (x, a) -> new NormalDistribution(null, a[0], Math.sqrt(a[1])).cumulativeProbability(x),
        (x, a) -> Math.sqrt(a[1]), cm + "NormalDistribution with sd = sqrt(var)"));
    cases.add(new Case("normal(mean, precision)", parametrisation("normal", "mean", "precision"),
        args(mean, logUniform(1e-4, 1e4)),
        (a, q) -> a[0] + spread(q, 8) / Math.sqrt(a[1]),
        (x, a) -> new NormalDistribution(null, a[0], 1 / Math.sqrt(a[1])).logDensity(x),
        (x, a) -> new NormalDistribution(null, a[0], 1 / Math.sqrt(a[1])).cumulativeProbability(x),
        (x, a) -> 1 / Math.sqrt(a[1]), cm + "NormalDistribution with sd = 1/sqrt(precision)"));
    cases.add(new Case("lognormal", parametrisation("lognormal", "meanlog", "sdlog"),
        args(uniform(-5, 5), logUniform(0.05, 3)),
        (a, q) -> Math.exp(a[0] + a[1] * spread(q, 8)),
        (x, a) -> new LogNormalDistribution(null, a[0], a[1]).logDensity(x),
        (x, a) -> new LogNormalDistribution(null, a[0], a[1]).cumulativeProbability(x),
        (x, a) -> x * a[1], cm + "LogNormalDistribution(scale = meanlog, shape = sdlog)"));
    cases.add(new Case("half-normal", parametrisation("half-normal", "sd"), args(positive),
        (a, q) -> a[0] * 8 * q,
        // Johnson, Kotz and Balakrishnan (1994) vol. 1, 13.10: twice the normal(0, sd) density on x > 0.
        (x, a) -> Math.log(2) + new NormalDistribution(null, 0, a[0]).logDensity(x),
        (x, a) -> 2 * new NormalDistribution(null, 0, a[0]).cumulativeProbability(x) - 1,
        (x, a) -> Math.min(a[0], x), "folded " + cm + "NormalDistribution (JKB 1994, 13.10)"));
    cases.add(new Case("student-t", parametrisation("student-t", "df", "location", "scale"),
        args(logUniform(0.5, 200), mean, positive),
        (a, q) -> a[1] + a[2] * spread(q, 20),
        (x, a) -> new TDistribution(null, a[0]).logDensity((x - a[1]) / a[2]) - Math.log(a[2]),
        (x, a) -> studentTCdf((x - a[1]) / a[2], a[0]),
        (x, a) -> a[2], cm + "TDistribution, location-scale transformed (near the centre A&S 26.7.1 with"
            + " commons-math3 Beta.regularizedBeta)"));
    cases.add(new Case("cauchy", parametrisation("cauchy", "location", "scale"), args(mean, positive),
        (a, q) -> a[0] + a[1] * spread(q, 20),
        (x, a) -> Math.log(new CauchyDistribution(null, a[0], a[1]).density(x)),
        (x, a) -> new CauchyDistribution(null, a[0], a[1]).cumulativeProbability(x),
        (x, a) -> a[1], cm + "CauchyDistribution"));
    cases.add(new Case("half-cauchy", parametrisation("half-cauchy", "scale"), args(positive),
        (a, q) -> a[0] * 30 * q,
        // JKB (1994) vol. 1, ch. 16, folded at 0: twice the cauchy(0, scale) density on x > 0.
        (x, a) -> Math.log(2 * new CauchyDistribution(null, 0, a[0]).density(x)),
        (x, a) -> 2 * new CauchyDistribution(null, 0, a[0]).cumulativeProbability(x) - 1,
        (x, a) -> Math.min(a[0], x), "folded " + cm + "CauchyDistribution (JKB 1994, ch. 16)"));
    cases.add(new Case("logistic", parametrisation("logistic", "location", "scale"), args(mean, positive),
        (a, q) -> a[0] + a[1] * spread(q, 30),
        (x, a) -> Math.log(new LogisticDistribution(null, a[0], a[1]).density(x)),
        (x, a) -> new LogisticDistribution(null, a[0], a[1]).cumulativeProbability(x),
        (x, a) -> a[1], cm + "LogisticDistribution"));
    cases.add(new Case("laplace", parametrisation("laplace", "location", "scale"), args(mean, positive),
        (a, q) -> a[0] + a[1] * (spread(q, 20) + 0.0123),
        (x, a) -> new LaplaceDistribution(null, a[0], a[1]).logDensity(x),
        (x, a) -> new LaplaceDistribution(null, a[0], a[1]).cumulativeProbability(x),
        (x, a) -> Math.min(a[1], Math.abs(x - a[0])), cm + "LaplaceDistribution"));
    cases.add(new Case("exponential", parametrisation("exponential", "rate"), args(positive),
        (a, q) -> 30 * q / a[0],
        (x, a) -> new ExponentialDistribution(null, 1 / a[0]).logDensity(x),
        (x, a) -> new ExponentialDistribution(null, 1 / a[0]).cumulativeProbability(x),
        (x, a) -> Math.min(x, 1 / a[0]), cm + "ExponentialDistribution(mean = 1/rate)"));
    cases.add(new Case("gamma(shape, rate)", parametrisation("gamma", "shape", "rate"),
        args(logUniform(0.1, 50), positive),
        (a, q) -> a[0] / a[1] * Math.exp(8 * (q - 0.5)),
        (x, a) -> new GammaDistribution(null, a[0], 1 / a[1]).logDensity(x),
        (x, a) -> new GammaDistribution(null, a[0], 1 / a[1]).cumulativeProbability(x),
        (x, a) -> x, cm + "GammaDistribution(shape, scale = 1/rate)"));
    cases.add(new Case("gamma(shape, scale)", parametrisation("gamma", "shape", "scale"),
        args(logUniform(0.1, 50), positive),
        (a, q) -> a[0] * a[1] * Math.exp(8 * (q - 0.5)),
        (x, a) -> new GammaDistribution(null, a[0], a[1]).logDensity(x),
        (x, a) -> new GammaDistribution(null, a[0], a[1]).cumulativeProbability(x),
        (x, a) -> x, cm + "GammaDistribution(shape, scale)"));
    cases.add(new Case("inverse-gamma", parametrisation("inverse-gamma", "shape", "scale"),
        args(logUniform(0.1, 50), positive),
        (a, q) -> a[1] / a[0] * Math.exp(8 * (q - 0.5)),
        // JKB (1994) vol. 1, 17.8.3: if 1/X ~ gamma(shape, rate = scale), f_X(x) = f_{1/X}(1/x)/x^2.
        (x, a) -> new GammaDistribution(null, a[0], 1 / a[1]).logDensity(1 / x) - 2 * Math.log(x),
        (x, a) -> 1 - new GammaDistribution(null, a[0], 1 / a[1]).cumulativeProbability(1 / x),
        (x, a) -> x, "reciprocal of " + cm + "GammaDistribution (JKB 1994, 17.8.3)"));
    cases.add(new Case("weibull", parametrisation("weibull", "shape", "scale"),
        args(logUniform(0.2, 20), positive),
        (a, q) -> a[1] * Math.exp(6 * (q - 0.5)),
        (x, a) -> new WeibullDistribution(null, a[0], a[1]).logDensity(x),
        (x, a) -> new WeibullDistribution(null, a[0], a[1]).cumulativeProbability(x),
        (x, a) -> x / Math.max(1, a[0]), cm + "WeibullDistribution(alpha = shape, beta = scale)"));
    cases.add(new Case("beta", parametrisation("beta", "a", "b"), args(logUniform(0.1, 50), logUniform(0.1, 50)),
        (a, q) -> q,
        (x, a) -> new BetaDistribution(null, a[0], a[1]).logDensity(x),
        (x, a) -> new BetaDistribution(null, a[0], a[1]).cumulativeProbability(x),
        (x, a) -> Math.min(x, 1 - x) / Math.sqrt(1 + a[0] + a[1]), cm + "BetaDistribution"));
    cases.add(new Case("uniform", parametrisation("uniform", "lower", "upper"),
        Combinators.combine(mean, positive).as((lower, width) -> new double[] {lower, lower + width}),
        (a, q) -> a[0] + q * (a[1] - a[0]),
        (x, a) -> new UniformRealDistribution(null, a[0], a[1]).logDensity(x),
        (x, a) -> new UniformRealDistribution(null, a[0], a[1]).cumulativeProbability(x),
        (x, a) -> Math.min(x - a[0], a[1] - x), cm + "UniformRealDistribution"));
    cases.add(new Case("poisson(rate)", parametrisation("poisson", "rate"), args(logUniform(0.01, 1e6)),
        (a, q) -> floorCount(q, 3 * a[0] + 10),
        (x, a) -> poisson(a[0]).logProbability((int) x),
        (x, a) -> poisson(a[0]).cumulativeProbability((int) x),
        (x, a) -> 1.0, cm + "PoissonDistribution"));
    cases.add(new Case("poisson(log_rate)", parametrisation("poisson", "log_rate"), args(uniform(-5, 14)),
        (a, q) -> floorCount(q, 3 * Math.exp(a[0]) + 10),
        (x, a) -> poisson(Math.exp(a[0])).logProbability((int) x),
        (x, a) -> poisson(Math.exp(a[0])).cumulativeProbability((int) x),
        (x, a) -> 1.0, cm + "PoissonDistribution(rate = exp(log_rate))"));
    cases.add(new Case("binomial(trials, p)", parametrisation("binomial", "trials", "p"),
        args(whole(0, 1000), uniform(0.001, 0.999)),
        (a, q) -> Math.min(a[0], floorCount(q, a[0] + 1)),
        (x, a) -> new BinomialDistribution(null, (int) a[0], a[1]).logProbability((int) x),
        (x, a) -> new BinomialDistribution(null, (int) a[0], a[1]).cumulativeProbability((int) x),
        (x, a) -> 1.0, cm + "BinomialDistribution"));
    cases.add(new Case("binomial(trials, logit_p)", parametrisation("binomial", "trials", "logit_p"),
        args(whole(0, 1000), uniform(-10, 10)),
        (a, q) -> Math.min(a[0], floorCount(q, a[0] + 1)),
        (x, a) -> new BinomialDistribution(null, (int) a[0], invLogit(a[1])).logProbability((int) x),
        (x, a) -> new BinomialDistribution(null, (int) a[0], invLogit(a[1])).cumulativeProbability((int) x),
        (x, a) -> 1.0, cm + "BinomialDistribution(p = expit(logit_p))"));
    cases.add(new Case("bernoulli(p)", parametrisation("bernoulli", "p"), args(uniform(0.001, 0.999)),
        (a, q) -> q < 0.5 ? 0 : 1,
        (x, a) -> new BinomialDistribution(null, 1, a[0]).logProbability((int) x),
        (x, a) -> new BinomialDistribution(null, 1, a[0]).cumulativeProbability((int) x),
        (x, a) -> 1.0, cm + "BinomialDistribution(trials = 1)"));
    cases.add(new Case("bernoulli(logit_p)", parametrisation("bernoulli", "logit_p"), args(uniform(-10, 10)),
        (a, q) -> q < 0.5 ? 0 : 1,
        (x, a) -> new BinomialDistribution(null, 1, invLogit(a[0])).logProbability((int) x),
        (x, a) -> new BinomialDistribution(null, 1, invLogit(a[0])).cumulativeProbability((int) x),
        (x, a) -> 1.0, cm + "BinomialDistribution(trials = 1, p = expit(logit_p))"));
    cases.add(new Case("negative-binomial, whole size", parametrisation("negative-binomial", "mean", "size"),
        args(logUniform(0.01, 1000), whole(1, 50)),
        (a, q) -> floorCount(q, 3 * a[0] + 10),
        (x, a) -> pascal(a).logProbability((int) x),
        (x, a) -> pascal(a).cumulativeProbability((int) x),
        (x, a) -> 1.0, cm + "PascalDistribution(r = size, p = size/(size + mean))"));
    cases.add(new Case("negative-binomial, any size", parametrisation("negative-binomial", "mean", "size"),
        args(logUniform(0.01, 1000), logUniform(0.05, 100)),
        (a, q) -> floorCount(q, 3 * a[0] + 10),
        // Johnson, Kemp and Kotz (2005), Univariate Discrete Distributions, 5.1: Gamma(x + size)/(Gamma(size) x!)
        // (size/(size+mean))^size (mean/(size+mean))^x, the gamma ratio written as 1/(x B(x, size)).
        (x, a) -> (x == 0 ? 0 : -Math.log(x) - Beta.logBeta(x, a[1]))
            + a[1] * Math.log(a[1] / (a[1] + a[0])) + x * Math.log(a[0] / (a[1] + a[0])),
        null,
        (x, a) -> 1.0, "closed form, Johnson, Kemp and Kotz 2005, 5.1"));
    cases.add(new Case("whole-uniform", parametrisation("whole-uniform", "lower", "upper"),
        Combinators.combine(whole(-50, 50), whole(0, 100)).as((lower, span) -> new double[] {lower, lower + span}),
        (a, q) -> a[0] + Math.min(a[1] - a[0], floorCount(q, a[1] - a[0] + 1)),
        (x, a) -> new UniformIntegerDistribution(null, (int) a[0], (int) a[1]).logProbability((int) x),
        (x, a) -> new UniformIntegerDistribution(null, (int) a[0], (int) a[1]).cumulativeProbability((int) x),
        (x, a) -> 1.0, cm + "UniformIntegerDistribution"));
    for (int categories : new int[] {2, 5}) {
      cases.add(categorical(categories, cm));
    }
    return List.copyOf(cases);
  }

  /**
   * The categorical over 1 .. K with K positive weights, which the family normalises, as does
   * commons-math3's EnumeratedIntegerDistribution; K = 2 is the two-valued case.
   */
  private static Case categorical(int categories, String cm) {
    List<Arbitrary<Double>> weights = new ArrayList<>();
    for (int k = 0; k < categories; k++) {
      weights.add(logUniform(0.01, 100));
    }
    int[] values = new int[categories];
    for (int k = 0; k < categories; k++) {
      values[k] = k + 1;
    }
    Parametrisation p = Categorical.withCategories(parametrisation("categorical", "p"), categories);
    return new Case("categorical(p), K = " + categories, p,
        Combinators.combine(weights).as(list -> list.stream().mapToDouble(Double::doubleValue).toArray()),
        (a, q) -> 1 + Math.min(categories - 1, floorCount(q, categories)),
        (x, a) -> new EnumeratedIntegerDistribution(null, values, a).logProbability((int) x),
        (x, a) -> new EnumeratedIntegerDistribution(null, values, a).cumulativeProbability((int) x),
        (x, a) -> 1.0, cm + "EnumeratedIntegerDistribution (weights normalised)");
  }

  /**
   * Whether argument {@code k} of {@code p} is a whole number (binomial trials, whole-uniform
   * bounds): the log-density is not differentiable in it, and its gradient entry is 0 by
   * convention.
   */
  static boolean wholeArgument(Parametrisation p, int k) {
    return p instanceof BaseParametrisation base
        && (base.domain(k) == ArgumentDomain.WHOLE || base.domain(k) == ArgumentDomain.INTEGER);
  }

  /**
   * The t distribution function. Within one scale unit of the centre, A&S 26.7.1 written with
   * the symmetry of the incomplete beta (A&S 26.5.2): F(t) = 1/2 + sign(t) I_{t^2/(df + t^2)}(1/2,
   * df/2) / 2, whose argument is small there; commons-math3 3.6.1's TDistribution evaluates I at
   * df/(df + t^2), near 1, and was seen to lose 5e-10 of F at t = -1.3e-6, df = 32. Further out,
   * where its argument is not near 1 and the tail needs no subtraction, commons-math3 itself.
   */
  private static double studentTCdf(double t, double df) {
    if (Math.abs(t) > 1) {
      return new TDistribution(null, df).cumulativeProbability(t);
    }
    double half = 0.5 * Beta.regularizedBeta(t * t / (df + t * t), 0.5, 0.5 * df);
    return t < 0 ? 0.5 - half : 0.5 + half;
  }

  static double invLogit(double x) {
    return 1 / (1 + Math.exp(-x));
  }

  private static PoissonDistribution poisson(double rate) {
    return new PoissonDistribution(null, rate, 1e-15, 10_000_000);
  }

  private static PascalDistribution pascal(double[] a) {
    return new PascalDistribution(null, (int) a[1], a[1] / (a[1] + a[0]));
  }
}

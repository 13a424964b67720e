package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Set;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import java.util.stream.Stream;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.CauchyDistribution;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.ExponentialDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.IntegerDistribution;
import org.apache.commons.math3.distribution.LaplaceDistribution;
import org.apache.commons.math3.distribution.LogNormalDistribution;
import org.apache.commons.math3.distribution.LogisticDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PascalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.distribution.UniformRealDistribution;
import org.apache.commons.math3.distribution.WeibullDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Draws of every family against commons-math3's distribution functions (the reference library):
 * a Kolmogorov-Smirnov test for continuous families and a chi-square test over the mass function
 * for discrete ones, each at level 1e-5 with a fixed seed.
 *
 * <p>Level and power: with 6500 draws the KS test at level 1e-5 detects a distribution-function
 * error of about sqrt(-ln(1e-5 / 2) / 2) / sqrt(6500) = 2.47 / sqrt(6500) = 0.031 (asymptotic
 * critical value, common practice), e.g. a location shift of 0.08 sd of a normal, as 4000 draws
 * did at level 0.001; the chi-square tests get the same 1.6 times larger noncentrality for the
 * larger critical value. Over the 44 checks below a false alarm has probability at most 4.4e-4
 * per fresh seed (Bonferroni; DEVELOPERS.md, Tests); the seeds are fixed, so the outcome is
 * reproducible.
 */
final class FamilyDrawsTest {
  private static final int DRAWS = 6500;
  private static final double LEVEL = 1e-5;

  private static Parametrisation parametrisation(String family, String... names) {
    return Families.lookup(family).orElseThrow().match(Set.of(names)).orElseThrow();
  }

  /** args are given in the parametrisation's own order. */
  private static Arguments continuous(
      String family, String[] names, double[] args, org.apache.commons.math3.distribution.RealDistribution reference) {
    Parametrisation p = parametrisation(family, names);
    double[] ordered = order(p, names, args);
    return Arguments.of(family + Arrays.toString(names) + Arrays.toString(args), p, ordered, reference);
  }

  private static double[] order(Parametrisation p, String[] names, double[] args) {
    double[] ordered = new double[args.length];
    for (int i = 0; i < names.length; i++) {
      ordered[p.argumentNames().indexOf(names[i])] = args[i];
    }
    return ordered;
  }

  static Stream<Arguments> continuousCases() {
    return Stream.of(
        continuous("normal", new String[] {"mean", "sd"}, new double[] {1.5, 2}, new NormalDistribution(1.5, 2)),
        continuous("normal", new String[] {"mean", "var"}, new double[] {-3, 4}, new NormalDistribution(-3, 2)),
        continuous("normal", new String[] {"mean", "precision"}, new double[] {0, 100}, new NormalDistribution(0, 0.1)),
        continuous("normal", new String[] {"mean", "sd"}, new double[] {1e6, 1e-6}, new NormalDistribution(1e6, 1e-6)),
        continuous("lognormal", new String[] {"meanlog", "sdlog"}, new double[] {0.5, 0.8}, new LogNormalDistribution(0.5, 0.8)),
        continuous("half-normal", new String[] {"sd"}, new double[] {3}, halfNormal(3)),
        continuous("student-t", new String[] {"df", "location", "scale"}, new double[] {3, 1, 2}, shifted(new TDistribution(3), 1, 2)),
        continuous("student-t", new String[] {"df", "location", "scale"}, new double[] {0.7, 0, 1}, new TDistribution(0.7)),
        continuous("student-t", new String[] {"df", "location", "scale"}, new double[] {1e4, 0, 1}, new TDistribution(1e4)),
        continuous("cauchy", new String[] {"location", "scale"}, new double[] {-2, 0.5}, new CauchyDistribution(-2, 0.5)),
        continuous("half-cauchy", new String[] {"scale"}, new double[] {2.5}, halfCauchy(2.5)),
        continuous("logistic", new String[] {"location", "scale"}, new double[] {1, 3}, new LogisticDistribution(1, 3)),
        continuous("laplace", new String[] {"location", "scale"}, new double[] {-1, 0.5}, new LaplaceDistribution(-1, 0.5)),
        continuous("exponential", new String[] {"rate"}, new double[] {0.2}, new ExponentialDistribution(5)),
        continuous("gamma", new String[] {"shape", "rate"}, new double[] {2.5, 4}, new GammaDistribution(2.5, 0.25)),
        continuous("gamma", new String[] {"shape", "scale"}, new double[] {0.3, 2}, new GammaDistribution(0.3, 2)),
        continuous("gamma", new String[] {"shape", "rate"}, new double[] {1, 1}, new GammaDistribution(1, 1)),
        continuous("gamma", new String[] {"shape", "rate"}, new double[] {500, 1}, new GammaDistribution(500, 1)),
        continuous("inverse-gamma", new String[] {"shape", "scale"}, new double[] {3, 2}, reciprocalGamma(3, 2)),
        continuous("weibull", new String[] {"shape", "scale"}, new double[] {1.7, 3}, new WeibullDistribution(1.7, 3)),
        continuous("beta", new String[] {"a", "b"}, new double[] {2, 5}, new BetaDistribution(2, 5)),
        continuous("beta", new String[] {"a", "b"}, new double[] {0.4, 0.6}, new BetaDistribution(0.4, 0.6)),
        continuous("uniform", new String[] {"lower", "upper"}, new double[] {-1, 4}, new UniformRealDistribution(-1, 4)));
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("continuousCases")
  void continuousDrawsFollowTheirDistributionFunction(
      String name, Parametrisation p, double[] args,
      org.apache.commons.math3.distribution.RealDistribution reference) {
    RandomGenerator rng = rng(name.hashCode());
    double[] draws = new double[DRAWS];
    for (int i = 0; i < DRAWS; i++) {
      draws[i] = FamilyDraws.draw(p, args, rng);
    }
    double pValue = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(reference, draws);
    assertTrue(pValue > LEVEL, name + ": KS p-value " + pValue);
  }

  private static Arguments discrete(String family, String[] names, double[] args, IntegerDistribution reference) {
    Parametrisation p = parametrisation(family, names);
    return Arguments.of(family + Arrays.toString(names) + Arrays.toString(args), p, order(p, names, args), reference);
  }

  static Stream<Arguments> discreteCases() {
    return Stream.of(
        discrete("poisson", new String[] {"rate"}, new double[] {3.5}, new PoissonDistribution(3.5)),
        discrete("poisson", new String[] {"rate"}, new double[] {10}, new PoissonDistribution(10)),
        discrete("poisson", new String[] {"rate"}, new double[] {47.3}, new PoissonDistribution(47.3)),
        discrete("poisson", new String[] {"log_rate"}, new double[] {Math.log(2500)}, new PoissonDistribution(2500)),
        discrete("binomial", new String[] {"trials", "p"}, new double[] {20, 0.3}, new BinomialDistribution(20, 0.3)),
        discrete("binomial", new String[] {"trials", "p"}, new double[] {1000, 0.02}, new BinomialDistribution(1000, 0.02)),
        discrete("binomial", new String[] {"trials", "logit_p"}, new double[] {500, 0.4}, new BinomialDistribution(500, 1 / (1 + Math.exp(-0.4)))),
        discrete("bernoulli", new String[] {"p"}, new double[] {0.7}, new BinomialDistribution(1, 0.7)),
        discrete("bernoulli", new String[] {"logit_p"}, new double[] {-2}, new BinomialDistribution(1, 1 / (1 + Math.exp(2)))),
        // negative-binomial(mean, size): commons-math's Pascal(r = size, p = size / (size + mean)) counts failures.
        discrete("negative-binomial", new String[] {"mean", "size"}, new double[] {6, 3}, new PascalDistribution(3, 3.0 / 9)),
        discrete("whole-uniform", new String[] {"lower", "upper"}, new double[] {-3, 12},
            new org.apache.commons.math3.distribution.UniformIntegerDistribution(-3, 12)),
        Arguments.of("categorical[0.5, 0.2, 0.3]",
            Categorical.withCategories(parametrisation("categorical", "p"), 3),
            new double[] {0.5, 0.2, 0.3},
            new org.apache.commons.math3.distribution.EnumeratedIntegerDistribution(
                new int[] {1, 2, 3}, new double[] {0.5, 0.2, 0.3})));
  }

  /**
   * Chi-square goodness of fit over the values 0, 1, ..., pooling the tails so that every cell
   * expects at least 5 draws (common practice, Cochran 1954); level 1e-5.
   */
  @ParameterizedTest(name = "{0}")
  @MethodSource("discreteCases")
  void discreteDrawsFollowTheirMassFunction(
      String name, Parametrisation p, double[] args, IntegerDistribution reference) {
    RandomGenerator rng = rng(name.hashCode());
    int[] values = new int[DRAWS];
    for (int i = 0; i < DRAWS; i++) {
      double x = FamilyDraws.draw(p, args, rng);
      assertEquals(Math.rint(x), x, name + ": a whole number");
      values[i] = (int) x;
    }
    assertTrue(chiSquarePValue(values, reference) > LEVEL, name);
  }

  static double chiSquarePValue(int[] values, IntegerDistribution reference) {
    // Cells [lo, hi] of consecutive values, each expecting >= 5 draws.
    int lo = reference.inverseCumulativeProbability(1e-9);
    int hi = reference.inverseCumulativeProbability(1 - 1e-9);
    java.util.List<int[]> cells = new java.util.ArrayList<>();
    int start = Integer.MIN_VALUE;
    double expected = 0;
    for (int k = lo; k <= hi; k++) {
      expected += DRAWS * reference.probability(k);
      if (expected >= 5) {
        cells.add(new int[] {start, k});
        start = k + 1;
        expected = 0;
      }
    }
    cells.get(cells.size() - 1)[1] = Integer.MAX_VALUE;
    double statistic = 0;
    for (int[] cell : cells) {
      double p = probability(reference, cell[0], cell[1]);
      long observed = Arrays.stream(values).filter(v -> v >= cell[0] && v <= cell[1]).count();
      statistic += (observed - DRAWS * p) * (observed - DRAWS * p) / (DRAWS * p);
    }
    return 1 - new ChiSquaredDistribution(cells.size() - 1).cumulativeProbability(statistic);
  }

  private static double probability(IntegerDistribution d, int from, int to) {
    double upper = to == Integer.MAX_VALUE ? 1 : d.cumulativeProbability(to);
    double lower = from == Integer.MIN_VALUE ? 0 : d.cumulativeProbability(from - 1);
    return upper - lower;
  }

  /**
   * Truncated draws against the truncated distribution function {@code (F(x) - F(lo)) / (F(hi) -
   * F(lo))} of commons-math3: by rejection (most of the mass kept) and by inversion (little kept).
   * Far tails where commons-math3 underflows are checked against the exponential limit instead.
   */
  static Stream<Arguments> truncatedCases() {
    return Stream.of(
        Arguments.of("normal within -1 .. 2 (rejection)", parametrisation("normal", "mean", "sd"), new double[] {0, 1}, -1.0, 2.0, new NormalDistribution(0, 1)),
        Arguments.of("normal within 2.5 .. inf (inversion)", parametrisation("normal", "mean", "sd"), new double[] {0, 1}, 2.5, Double.POSITIVE_INFINITY, new NormalDistribution(0, 1)),
        Arguments.of("normal within -inf .. -3 (inversion from the upper bound)", parametrisation("normal", "mean", "sd"), new double[] {0, 1}, Double.NEGATIVE_INFINITY, -3.0, new NormalDistribution(0, 1)),
        Arguments.of("gamma within 0 .. 0.1 (inversion)", parametrisation("gamma", "shape", "rate"), new double[] {2, 1}, 0.0, 0.1, new GammaDistribution(2, 1)),
        Arguments.of("half-cauchy within 0 .. 50", parametrisation("half-cauchy", "scale"), new double[] {1}, 0.0, 50.0, halfCauchy(1)),
        Arguments.of("student-t within 10 .. 20 (inversion)", parametrisation("student-t", "df", "location", "scale"), new double[] {4, 0, 1}, 10.0, 20.0, new TDistribution(4)));
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("truncatedCases")
  void truncatedDrawsFollowTheTruncatedDistributionFunction(
      String name, Parametrisation p, double[] args, double lower, double upper,
      org.apache.commons.math3.distribution.RealDistribution whole) {
    RandomGenerator rng = rng(name.hashCode());
    double[] draws = new double[DRAWS];
    for (int i = 0; i < DRAWS; i++) {
      draws[i] = FamilyDraws.drawBetween(p, args, lower, upper, rng);
      assertTrue(draws[i] >= lower && draws[i] <= upper, name + ": inside the interval");
    }
    double fLower = Double.isInfinite(lower) ? 0 : whole.cumulativeProbability(lower);
    double fUpper = Double.isInfinite(upper) ? 1 : whole.cumulativeProbability(upper);
    var truncated = new org.apache.commons.math3.distribution.AbstractRealDistribution(null) {
      @Override
      public double cumulativeProbability(double x) {
        if (x <= lower) {
          return 0;
        }
        if (x >= upper) {
          return 1;
        }
        return (whole.cumulativeProbability(x) - fLower) / (fUpper - fLower);
      }

      @Override public double density(double x) { throw new UnsupportedOperationException(); }
      @Override public double getNumericalMean() { return Double.NaN; }
      @Override public double getNumericalVariance() { return Double.NaN; }
      @Override public double getSupportLowerBound() { return lower; }
      @Override public double getSupportUpperBound() { return upper; }
      @Override @SuppressWarnings("deprecation") public boolean isSupportLowerBoundInclusive() { return true; }
      @Override @SuppressWarnings("deprecation") public boolean isSupportUpperBoundInclusive() { return true; }
      @Override public boolean isSupportConnected() { return true; }
    };
    double pValue = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(truncated, draws);
    assertTrue(pValue > LEVEL, name + ": KS p-value " + pValue);
  }

  /**
   * normal within a .. inf for a = 37 and 1e3: (X - a) a tends to an exponential(1) (Mills' ratio,
   * Feller 1968, VII.1, lemma 2); at a = 37 the relative error of that limit is about 2/a^2 =
   * 0.15%, below the KS test's resolution at 6500 draws, so the test compares with exponential(1).
   */
  @Test
  void farNormalTailScaledByItsBoundIsExponential() {
    Parametrisation normal = parametrisation("normal", "mean", "sd");
    for (double a : new double[] {37, 1e3}) {
      RandomGenerator rng = rng((long) a);
      double[] scaled = new double[DRAWS];
      for (int i = 0; i < DRAWS; i++) {
        double x = FamilyDraws.drawBetween(normal, new double[] {0, 1}, a, Double.POSITIVE_INFINITY, rng);
        assertTrue(x >= a && Double.isFinite(x));
        scaled[i] = (x - a) * a;
      }
      double pValue = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(new ExponentialDistribution(1), scaled);
      assertTrue(pValue > LEVEL, "a = " + a + ": KS p-value " + pValue);
    }
  }

  @Test
  void truncatedCountsStayInsideAndFollowTheTruncatedMass() {
    Parametrisation poisson = parametrisation("poisson", "rate");
    RandomGenerator rng = rng(11);
    PoissonDistribution whole = new PoissonDistribution(4);
    double mass = whole.cumulativeProbability(20) - whole.cumulativeProbability(11);
    int[] counts = new int[21];
    for (int i = 0; i < DRAWS; i++) {
      double x = FamilyDraws.drawBetween(poisson, new double[] {4}, 12, 20, rng);
      assertTrue(x >= 12 && x <= 20, "inside 12 .. 20: " + x);
      counts[(int) x]++;
    }
    // Chi-square over 12, 13, 14, 15 and 16..20 pooled (each expects >= 5 of 6500).
    double statistic = 0;
    int[][] cells = {{12, 12}, {13, 13}, {14, 14}, {15, 20}};
    for (int[] cell : cells) {
      double p = (whole.cumulativeProbability(cell[1]) - whole.cumulativeProbability(cell[0] - 1)) / mass;
      int observed = 0;
      for (int k = cell[0]; k <= cell[1]; k++) {
        observed += counts[k];
      }
      statistic += Math.pow(observed - DRAWS * p, 2) / (DRAWS * p);
    }
    double pValue = 1 - new ChiSquaredDistribution(cells.length - 1).cumulativeProbability(statistic);
    assertTrue(pValue > LEVEL, "chi-square p-value " + pValue);
  }

  @Test
  void sameSeedGivesTheSameDraws() {
    Parametrisation gamma = parametrisation("gamma", "shape", "rate");
    double[] first = new double[50];
    double[] second = new double[50];
    RandomGenerator a = rng(5);
    RandomGenerator b = rng(5);
    for (int i = 0; i < 50; i++) {
      first[i] = FamilyDraws.draw(gamma, new double[] {0.5, 2}, a);
      second[i] = FamilyDraws.draw(gamma, new double[] {0.5, 2}, b);
    }
    assertArrayEquals(first, second);
  }

  @Test
  void tinyShapesStayInsideTheSupport() {
    Parametrisation gamma = parametrisation("gamma", "shape", "rate");
    Parametrisation beta = parametrisation("beta", "a", "b");
    RandomGenerator rng = rng(9);
    for (int i = 0; i < 1000; i++) {
      double g = FamilyDraws.draw(gamma, new double[] {1e-3, 1}, rng);
      double x = FamilyDraws.draw(beta, new double[] {1e-3, 1e-3}, rng);
      assertTrue(g > 0 && Double.isFinite(g), "gamma draw in (0, inf): " + g);
      assertTrue(x > 0 && x < 1, "beta draw in (0, 1): " + x);
    }
  }

  @Test
  void invalidArgumentsAreNamed() {
    Parametrisation normal = parametrisation("normal", "mean", "sd");
    RandomGenerator rng = rng(1);
    IllegalArgumentException bad =
        assertThrows(IllegalArgumentException.class, () -> FamilyDraws.draw(normal, new double[] {0, -1}, rng));
    assertTrue(bad.getMessage().contains("sd"), bad.getMessage());
    assertThrows(IllegalArgumentException.class, () -> FamilyDraws.draw(normal, new double[] {0}, rng));
    assertThrows(
        IllegalArgumentException.class,
        () -> FamilyDraws.drawBetween(normal, new double[] {0, 1}, 2, 1, rng));
    assertThrows(IllegalArgumentException.class, () -> FamilyDraws.draw(null, new double[] {0, 1}, rng));
  }

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  private static org.apache.commons.math3.distribution.RealDistribution halfNormal(double sd) {
    return folded(new NormalDistribution(0, sd));
  }

  private static org.apache.commons.math3.distribution.RealDistribution halfCauchy(double scale) {
    return folded(new CauchyDistribution(0, scale));
  }

  /** |X| for X symmetric about 0: F(x) = 2 G(x) - 1. */
  private static org.apache.commons.math3.distribution.RealDistribution folded(
      org.apache.commons.math3.distribution.RealDistribution symmetric) {
    return cdfOnly(x -> x <= 0 ? 0 : 2 * symmetric.cumulativeProbability(x) - 1);
  }

  private static org.apache.commons.math3.distribution.RealDistribution shifted(
      org.apache.commons.math3.distribution.RealDistribution standard, double location, double scale) {
    return cdfOnly(x -> standard.cumulativeProbability((x - location) / scale));
  }

  /** 1 / G with G ~ gamma(shape, rate = scale): F(x) = 1 - G(1 / x). */
  private static org.apache.commons.math3.distribution.RealDistribution reciprocalGamma(double shape, double scale) {
    GammaDistribution g = new GammaDistribution(shape, 1 / scale);
    return cdfOnly(x -> x <= 0 ? 0 : 1 - g.cumulativeProbability(1 / x));
  }

  private static org.apache.commons.math3.distribution.RealDistribution cdfOnly(
      java.util.function.DoubleUnaryOperator cdf) {
    return new org.apache.commons.math3.distribution.AbstractRealDistribution(null) {
      @Override public double cumulativeProbability(double x) { return cdf.applyAsDouble(x); }
      @Override public double density(double x) { throw new UnsupportedOperationException(); }
      @Override public double getNumericalMean() { return Double.NaN; }
      @Override public double getNumericalVariance() { return Double.NaN; }
      @Override public double getSupportLowerBound() { return Double.NEGATIVE_INFINITY; }
      @Override public double getSupportUpperBound() { return Double.POSITIVE_INFINITY; }
      @Override @SuppressWarnings("deprecation") public boolean isSupportLowerBoundInclusive() { return false; }
      @Override @SuppressWarnings("deprecation") public boolean isSupportUpperBoundInclusive() { return false; }
      @Override public boolean isSupportConnected() { return true; }
    };
  }
}

package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.EdgeCasesMode;
import org.apache.commons.math3.special.Gamma;
import org.hullbound.model.family.FamilyCases.Point;
import org.junit.jupiter.api.Test;

/**
 * The censored term {@code log P(lo < X <= hi)} ({@link Censored}): against each family's reference
 * distribution function at ordinary limits, against asymptotic series at extreme ones (where
 * {@code F} or {@code 1 - F} underflows or rounds to 1), and its gradient against finite
 * differences.
 */
class CensoredTest {
  private static final double HALF_LOG_TWO_PI = 0.5 * Math.log(2 * Math.PI);

  private static double logP(Parametrisation observed, double lo, double hi, double... args) {
    double[] all = Arrays.copyOf(args, args.length + 1);
    all[args.length] = hi;
    return Censored.of(observed).orElseThrow().logDensity(lo, all);
  }

  private static Parametrisation family(String name, String... arguments) {
    return FamilyCases.parametrisation(name, arguments);
  }

  @Provide
  Arbitrary<Point> points() {
    return FamilyCases.continuousPoints();
  }

  /**
   * Right, left and interval censoring at generated points agree with the case's reference
   * distribution function (commons-math3 3.6.1 and the folded forms named in {@code FamilyCases}),
   * whose values are accurate to about 1e-14 absolute (the tolerance of {@code
   * TruncationProperties}, which checks the same tails as truncation normalisers).
   */
  @Property(tries = 2000, seed = "20261203", edgeCases = EdgeCasesMode.NONE)
  void agreesWithTheReferenceDistributionFunction(@ForAll("points") Point point) {
    Parametrisation p = point.p();
    double x = point.x();
    double[] a = point.args();
    double f = point.testCase().cdf().at(x, a);
    double upper = x + 0.5 * point.testCase().width().at(x, a);
    double g = point.testCase().cdf().at(upper, a);
    // commons-math3's TDistribution is off by up to about 2e-10 near the centre (against the
    // closed form F(t) = 1/2 + t / (2 sqrt(2 + t^2)) for df = 2, evaluated with mpmath 1.3.0 at 30
    // digits at a point this property generated); the other references by about 1e-14.
    double absolute = p.family().name().equals("student-t") ? 1e-9 : 1e-12;
    assertEquals(1 - f, Math.exp(logP(p, x, Double.POSITIVE_INFINITY, a)), absolute + 1e-9 * (1 - f),
        point + " right");
    assertEquals(f, Math.exp(logP(p, Double.NEGATIVE_INFINITY, x, a)), absolute + 1e-9 * f, point + " left");
    assertEquals(g - f, Math.exp(logP(p, x, upper, a)), absolute + 1e-9 * (g - f), point + " interval");
  }

  /** log Q(z) by the asymptotic series of Abramowitz and Stegun (1964) 26.2.12, z large. */
  private static double logNormalUpperBySeries(double z) {
    double z2 = z * z;
    double series = 1 - 1 / z2 + 3 / (z2 * z2) - 15 / (z2 * z2 * z2) + 105 / (z2 * z2 * z2 * z2);
    return -0.5 * z2 - HALF_LOG_TWO_PI - Math.log(z) + Math.log(series);
  }

  @Test
  void normalRightCensoredFortySdAboveTheMean() {
    Parametrisation normal = family("normal", "mean", "sd");
    // Q(40) is about 3.7e-350, below the smallest double; its log is not.
    double expected = logNormalUpperBySeries(40);
    assertEquals(expected, logP(normal, 3 + 40 * 2, Double.POSITIVE_INFINITY, 3, 2), 1e-12 * Math.abs(expected));
    // Left-censored 40 sd below: the same tail.
    assertEquals(expected, logP(normal, Double.NEGATIVE_INFINITY, 3 - 40 * 2, 3, 2), 1e-12 * Math.abs(expected));
    // The precision and variance forms read the same tail.
    assertEquals(expected, logP(family("normal", "mean", "precision"), 40, Double.POSITIVE_INFINITY, 0, 1),
        1e-12 * Math.abs(expected));
    assertEquals(expected, logP(family("normal", "mean", "var"), 80, Double.POSITIVE_INFINITY, 0, 4),
        1e-12 * Math.abs(expected));
    // Left-censored 40 sd above the mean: F = 1 - Q(40), whose log rounds to 0 and must not be NaN.
    assertEquals(0.0, logP(normal, Double.NEGATIVE_INFINITY, 83, 3, 2), 0.0);
  }

  /**
   * {@code log} of the integral of the standard normal density over {@code [z, z + w]}, as {@code
   * log phi(z) + log of the integral over [0, w] of exp(-z t - t^2/2)}, the latter by composite
   * Simpson on 2000 panels (error about (w/2000)^4 z^4/180 relative): a second method that uses
   * no distribution function at all.
   */
  private static double logNormalIntervalByQuadrature(double z, double w) {
    int panels = 2000;
    double h = w / panels;
    double sum = 0;
    for (int i = 0; i <= panels; i++) {
      double t = i * h;
      double weight = i == 0 || i == panels ? 1 : i % 2 == 1 ? 4 : 2;
      sum += weight * Math.exp(-z * t - 0.5 * t * t);
    }
    return -0.5 * z * z - HALF_LOG_TWO_PI + Math.log(sum * h / 3);
  }

  /**
   * Intervals far in the tail, where {@code F(lo)} and {@code F(hi)} are both 1 in doubles and a
   * difference of distribution functions would be 0: the log of the probability must match a
   * quadrature of the density.
   */
  @Test
  void normalIntervalInTheFarTailDoesNotCancel() {
    Parametrisation normal = family("normal", "mean", "sd");
    assertEquals(logNormalIntervalByQuadrature(8, 0.001), logP(normal, 8, 8.001, 0, 1), 1e-10);
    assertEquals(logNormalIntervalByQuadrature(8, 0.001), logP(normal, -8.001, -8, 0, 1), 1e-10);
    double far = logNormalIntervalByQuadrature(38, 0.5);
    assertEquals(far, logP(normal, 38, 38.5, 0, 1), 1e-10 * Math.abs(far));
    assertEquals(far, logP(normal, 5 + 38 * 3, 5 + 38.5 * 3, 5, 3), 1e-10 * Math.abs(far));
  }

  @Test
  void lognormalRightCensoredFortySdlogAboveTheMeanlog() {
    double expected = logNormalUpperBySeries(40);
    assertEquals(expected, logP(family("lognormal", "meanlog", "sdlog"), Math.exp(1 + 40 * 0.5),
        Double.POSITIVE_INFINITY, 1, 0.5), 1e-10 * Math.abs(expected));
  }

  /** Weibull: log S(c) = -(c/scale)^shape exactly (JKB 1994, vol. 1, 21.3). */
  @Test
  void weibullTailsInClosedForm() {
    Parametrisation weibull = family("weibull", "shape", "scale");
    assertEquals(-Math.pow(1e3, 2.5), logP(weibull, 2e3, Double.POSITIVE_INFINITY, 2.5, 2), 1e-12 * Math.pow(1e3, 2.5));
    // Left-censored at a tiny limit: log F = log(1 - exp(-t)) = log t - t/2 + ..., t = 1e-300.
    double t = Math.pow(1e-150, 2);
    assertEquals(Math.log(t), logP(weibull, Double.NEGATIVE_INFINITY, 1e-150, 2, 1), 1e-12 * 700);
    // Left-censored far above the scale: log F = log1p(-exp(-t)) = -exp(-t), t = 100.
    assertEquals(-Math.exp(-100), logP(weibull, 0, 10, 2, 1), 1e-12 * Math.exp(-100));
  }

  /** Exponential: log S(c) = -rate c. */
  @Test
  void exponentialRightCensoredFarOut() {
    assertEquals(-1e5, logP(family("exponential", "rate"), 1e6, Double.POSITIVE_INFINITY, 0.1), 1e-7);
  }

  /** Logistic: log S = -log(1 + exp(z)) = -z - log1p(exp(-z)). */
  @Test
  void logisticRightCensoredFarOut() {
    double z = 800;
    assertEquals(-z - Math.log1p(Math.exp(-z)),
        logP(family("logistic", "location", "scale"), 2 + 3 * z, Double.POSITIVE_INFINITY, 2, 3), 1e-12 * z);
    assertEquals(-z, logP(family("logistic", "location", "scale"), Double.NEGATIVE_INFINITY, 2 - 3 * z, 2, 3),
        1e-12 * z);
  }

  /**
   * Gamma far tails: {@code Q(a, x) ~ x^(a-1) e^-x / Gamma(a) (1 + (a-1)/x + (a-1)(a-2)/x^2 + ...)}
   * for large x (Abramowitz and Stegun 1964, 6.5.32), and {@code P(a, x) ~ x^a e^-x / Gamma(a+1) (1
   * + x/(a+1) + ...)} for small x (6.5.29).
   */
  @Test
  void gammaFarTailsAgreeWithTheAsymptoticSeries() {
    double a = 2.5;
    double x = 2000;
    double series = 1 + (a - 1) / x + (a - 1) * (a - 2) / (x * x) + (a - 1) * (a - 2) * (a - 3) / (x * x * x);
    double upper = (a - 1) * Math.log(x) - x - Gamma.logGamma(a) + Math.log(series);
    assertEquals(upper, logP(family("gamma", "shape", "rate"), x / 4, Double.POSITIVE_INFINITY, a, 4),
        1e-12 * Math.abs(upper));
    assertEquals(upper, logP(family("gamma", "shape", "scale"), x * 0.25, Double.POSITIVE_INFINITY, a, 0.25),
        1e-12 * Math.abs(upper));
    double small = 1e-200;
    double lower = a * Math.log(small) - Gamma.logGamma(a + 1);
    assertEquals(lower, logP(family("gamma", "shape", "rate"), 0, small, a, 1), 1e-12 * Math.abs(lower));
  }

  /** The gradient in every argument (and in both limits) against central differences. */
  @Property(tries = 1500, seed = "20261204", edgeCases = EdgeCasesMode.NONE)
  void gradientAgreesWithDifferences(@ForAll("points") Point point) {
    Parametrisation censored = Censored.of(point.p()).orElseThrow();
    double[] a = point.args();
    double x = point.x();
    double width = point.testCase().width().at(x, a);
    double[][] limits =
        {{x, Double.POSITIVE_INFINITY}, {Double.NEGATIVE_INFINITY, x}, {x, x + 0.5 * width}};
    for (double[] limit : limits) {
      double[] all = Arrays.copyOf(a, a.length + 1);
      all[a.length] = limit[1];
      double[] gradient = new double[all.length + 1];
      double value = censored.logDensity(limit[0], all, gradient);
      if (!(value > -30) || point.p().support() == SupportKind.BETWEEN_FIRST_TWO_ARGUMENTS) {
        continue;
      }
      for (int k = 0; k < a.length; k++) {
        int argument = k;
        double h = Differences.argumentStep(point, k, 1e-4);
        double numeric = Differences.derivative(
            t -> censored.logDensity(limit[0], Differences.with(all, argument, t)), all[k], h);
        assertEquals(numeric, gradient[1 + k], 1e-5 * (1 + Math.abs(numeric)),
            point + " limits " + Arrays.toString(limit) + " d/d" + censored.argumentNames().get(k));
      }
      double h = 1e-4 * width;
      if (Double.isFinite(limit[0])) {
        double numeric = Differences.derivative(t -> censored.logDensity(t, all), limit[0], h);
        assertEquals(numeric, gradient[0], 1e-5 * (1 + Math.abs(numeric)), point + " d/dlower");
      }
      if (Double.isFinite(limit[1])) {
        double numeric = Differences.derivative(
            t -> censored.logDensity(limit[0], Differences.with(all, a.length, t)), limit[1], h);
        assertEquals(numeric, gradient[1 + a.length], 1e-5 * (1 + Math.abs(numeric)), point + " d/dupper");
      }
    }
  }

  @Test
  void discreteFamiliesHaveNoCensoredForm() {
    assertFalse(Censored.of(family("poisson", "rate")).isPresent());
    assertFalse(Censored.of(family("binomial", "trials", "p")).isPresent());
    assertTrue(Censored.isCensored(Censored.of(family("weibull", "shape", "scale")).orElseThrow()));
    assertEquals("censored weibull", Censored.of(family("weibull", "shape", "scale")).orElseThrow().family().name());
  }

  @Test
  void emptyOrReversedLimitsHaveNoProbability() {
    Parametrisation normal = family("normal", "mean", "sd");
    assertEquals(Double.NEGATIVE_INFINITY, logP(normal, 1, 1, 0, 1));
    assertEquals(Double.NEGATIVE_INFINITY, logP(normal, 2, 1, 0, 1));
    assertTrue(Double.isNaN(logP(normal, Double.NaN, 1, 0, 1)));
  }
}

package org.hullbound.hull;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.GumbelDistribution;
import org.apache.commons.math3.distribution.LogisticDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.special.Erf;

/**
 * A log-concave test density in both forms with its support and a reference distribution function
 * from outside the project (commons-math3 3.6.1, or the error function for truncated normals).
 */
record Target(
    String name, DifferentiableLogDensity density, Support support, DoubleUnaryOperator cdf) {

  LogDensity valueOnly() {
    DifferentiableLogDensity d = density;
    return x -> d.evaluate(x).value();
  }

  CdfReference reference() {
    return CdfReference.of(cdf);
  }

  AdaptiveRejectionSampler sampler(boolean derivativeFree, HullOptions options) {
    return derivativeFree
        ? AdaptiveRejectionSampler.derivativeFree(valueOnly(), support, options)
        : AdaptiveRejectionSampler.withDerivatives(density, support, options);
  }

  /**
   * The same distribution with {@code constant} added to h: a log-density is defined only up to a
   * constant, so the draws must not change in law.
   */
  Target plus(double constant) {
    DifferentiableLogDensity d = density;
    return new Target(
        name + " + " + constant,
        x -> {
          Evaluation e = d.evaluate(x);
          return new Evaluation(e.value() + constant, e.slope());
        },
        support,
        cdf);
  }

  @Override
  public String toString() {
    return name;
  }

  static Target normal(double mean, double sd) {
    NormalDistribution reference = new NormalDistribution(null, mean, sd);
    return new Target(
        "normal(" + mean + ", " + sd + ")",
        x -> {
          double z = (x - mean) / sd;
          return new Evaluation(-0.5 * z * z, -z / sd);
        },
        Support.real(),
        reference::cumulativeProbability);
  }

  /** Gamma with shape k &gt;= 1 and scale theta: h = (k - 1) log x - x / theta on x &gt; 0. */
  static Target gamma(double shape, double scale) {
    GammaDistribution reference = new GammaDistribution(null, shape, scale);
    return new Target(
        "gamma(" + shape + ", " + scale + ")",
        x -> new Evaluation((shape - 1) * Math.log(x) - x / scale, (shape - 1) / x - 1 / scale),
        Support.above(0),
        reference::cumulativeProbability);
  }

  /** Beta(a, b), a, b &gt;= 1: h = (a - 1) log x + (b - 1) log(1 - x) on [0, 1]. */
  static Target beta(double a, double b) {
    BetaDistribution reference = new BetaDistribution(null, a, b);
    return new Target(
        "beta(" + a + ", " + b + ")",
        x ->
            new Evaluation(
                (a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x), (a - 1) / x - (b - 1) / (1 - x)),
        Support.between(0, 1),
        reference::cumulativeProbability);
  }

  /** Logistic(mu, s): h = -|z| - 2 log(1 + exp(-|z|)), z = (x - mu) / s, h' = -tanh(z / 2) / s. */
  static Target logistic(double mu, double s) {
    LogisticDistribution reference = new LogisticDistribution(null, mu, s);
    return new Target(
        "logistic(" + mu + ", " + s + ")",
        x -> {
          double z = (x - mu) / s;
          double a = Math.abs(z);
          return new Evaluation(-a - 2 * Math.log1p(Math.exp(-a)), -Math.tanh(0.5 * z) / s);
        },
        Support.real(),
        reference::cumulativeProbability);
  }

  /** Gumbel(mu, beta) of the maximum: h = -z - exp(-z), z = (x - mu) / beta. */
  static Target gumbel(double mu, double beta) {
    GumbelDistribution reference = new GumbelDistribution(null, mu, beta);
    return new Target(
        "gumbel(" + mu + ", " + beta + ")",
        x -> {
          double z = (x - mu) / beta;
          double e = Math.exp(-z);
          return new Evaluation(-z - e, (e - 1) / beta);
        },
        Support.real(),
        reference::cumulativeProbability);
  }

  /** Normal(mean, sd) truncated to {@code support}. */
  static Target truncatedNormal(double mean, double sd, Support support) {
    CdfReference reference =
        CdfReference.truncatedNormal(mean, sd, support.lower(), support.upper());
    return new Target(
        "normal(" + mean + ", " + sd + ") on " + support,
        x -> {
          double z = (x - mean) / sd;
          return new Evaluation(-0.5 * z * z, -z / sd);
        },
        support,
        reference::cumulativeProbability);
  }

  /**
   * A flat top on [-1, 1] with normal shoulders of sd {@code sd} out to the bounds -b and b (b &gt;
   * 1): h = 0 on the plateau and -(|x| - 1)^2 / (2 sd^2) beyond, concave with a continuous slope.
   * Its CDF in closed form: the plateau is linear and each shoulder is a normal integral, sd
   * sqrt(2 pi) (Phi((|x| - 1) / sd) - 1/2), with Phi from commons-math3 {@link Erf#erf}
   * (Phi(z) = (1 + erf(z / sqrt 2)) / 2, Abramowitz and Stegun 1964, 7.1.1 and 26.2.29).
   */
  static Target plateau(double sd, double b) {
    double shoulder = sd * Math.sqrt(Math.PI / 2) * Erf.erf((b - 1) / (sd * Math.sqrt(2)));
    double total = 2 + 2 * shoulder;
    DoubleUnaryOperator outer =
        t -> sd * Math.sqrt(Math.PI / 2) * Erf.erf(t / (sd * Math.sqrt(2)));
    return new Target(
        "plateau(sd " + sd + ") on [" + -b + ", " + b + "]",
        x -> {
          double t = Math.abs(x) - 1;
          if (t <= 0) {
            return new Evaluation(0, 0);
          }
          return new Evaluation(-0.5 * t * t / (sd * sd), -Math.signum(x) * t / (sd * sd));
        },
        Support.between(-b, b),
        x -> {
          if (x <= -b) {
            return 0;
          }
          if (x >= b) {
            return 1;
          }
          double below =
              x < -1
                  ? shoulder - outer.applyAsDouble(-x - 1)
                  : x <= 1 ? shoulder + (x + 1) : shoulder + 2 + outer.applyAsDouble(x - 1);
          return below / total;
        });
  }
}

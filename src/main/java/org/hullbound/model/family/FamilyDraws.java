package org.hullbound.model.family;

import java.util.List;
import java.util.random.RandomGenerator;

/**
 * Random draws from every family of the model language, optionally truncated to {@code [lower,
 * upper]}: what simulating data from a model (simulation-based calibration) needs.
 *
 * <p>Why here: the families know their arguments and tails, and a simulator should not depend on
 * a sampler package. The algorithms are standard and cited beside each family: inversion where
 * the quantile function is closed-form (Devroye 1986, <i>Non-Uniform Random Variate
 * Generation</i>, section II.2), the JDK's ziggurat normal ({@link RandomGenerator#nextGaussian()},
 * McFarland 2016), Marsaglia and Tsang (2000) for the gamma, Hörmann (1993) transformed rejection
 * (PTRS) for large Poisson rates, and Knuth's beta splitting (TAOCP vol. 2, 3.4.1) for large
 * binomial trial counts. Truncation: rejection from the whole family while the kept mass is at
 * least 1/4, otherwise numerical inversion of the family's own {@link
 * Parametrisation#logProbabilityBetween} in log space, so that far tails ({@code normal within 37
 * .. inf}) are drawn as exactly as the family's tail functions allow.
 *
 * <table>
 *   <caption>Draws used per family</caption>
 *   <tr><th>family</th><th>draw</th></tr>
 *   <tr><td>normal, lognormal, half-normal</td><td>ziggurat normal; exp; absolute value</td></tr>
 *   <tr><td>student-t</td><td>normal over sqrt(chi-square / df), chi-square = 2 gamma(df/2)</td></tr>
 *   <tr><td>cauchy, half-cauchy, logistic, laplace, exponential, weibull, uniform</td><td>inversion</td></tr>
 *   <tr><td>gamma, inverse-gamma, beta</td><td>Marsaglia-Tsang gamma (log scale below shape 1); reciprocal; gamma ratio</td></tr>
 *   <tr><td>poisson</td><td>sequential inversion below rate 10, PTRS above</td></tr>
 *   <tr><td>binomial, bernoulli</td><td>beta splitting above 64 trials, then Bernoulli sums</td></tr>
 *   <tr><td>negative-binomial</td><td>gamma mixture of Poissons (Devroye 1986, X.4)</td></tr>
 * </table>
 */
public final class FamilyDraws {
  /** Below this kept mass a truncated draw is made by inversion rather than by rejection. */
  private static final double LOG_REJECTION_MASS = Math.log(0.25);

  private static final int BISECTION_STEPS = 200;

  private FamilyDraws() {}

  /**
   * A draw from {@code family} with {@code args} in the order of {@link
   * Parametrisation#argumentNames()}.
   *
   * @throws IllegalArgumentException if the arguments are invalid (the family's own message)
   */
  public static double draw(Parametrisation family, double[] args, RandomGenerator rng) {
    check(family, args, rng);
    return whole(family, args, rng);
  }

  /**
   * A draw from {@code family} truncated to {@code [lower, upper]} ({@code within lower ..
   * upper}); infinite bounds leave a side open.
   *
   * @throws IllegalArgumentException if the arguments are invalid, {@code lower >= upper}, or the
   *     interval has no probability
   */
  public static double drawBetween(
      Parametrisation family, double[] args, double lower, double upper, RandomGenerator rng) {
    check(family, args, rng);
    if (!(lower < upper)) {
      throw new IllegalArgumentException(
          "lower must be < upper, got " + lower + " and " + upper);
    }
    if (lower == Double.NEGATIVE_INFINITY && upper == Double.POSITIVE_INFINITY) {
      return whole(family, args, rng);
    }
    double[] ignored = new double[args.length];
    double logMass = family.logProbabilityBetween(lower, upper, args, ignored);
    if (!(logMass > Double.NEGATIVE_INFINITY)) {
      throw new IllegalArgumentException(
          family.signature() + " has no probability in [" + lower + ", " + upper + "]");
    }
    if (logMass >= LOG_REJECTION_MASS) {
      // Expected tries at most 4; the cap only guards a family whose mass was misjudged.
      for (int attempt = 0; attempt < 10_000; attempt++) {
        double x = whole(family, args, rng);
        if (x >= lower && x <= upper) {
          return x;
        }
      }
    }
    return family.discrete()
        ? invertDiscrete(family, args, lower, upper, logMass, rng)
        : invertContinuous(family, args, lower, upper, logMass, rng);
  }

  private static void check(Parametrisation family, double[] args, RandomGenerator rng) {
    if (family == null || args == null || rng == null) {
      throw new IllegalArgumentException("family, args and rng must not be null");
    }
    if (args.length != family.argumentNames().size()) {
      throw new IllegalArgumentException(
          "args must hold " + family.argumentNames().size() + " values for "
              + family.signature() + ", got " + args.length);
    }
    String problem = family.checkArguments(args);
    if (problem != null) {
      throw new IllegalArgumentException(family.signature() + ": " + problem);
    }
  }

  /**
   * Inversion of the truncated distribution function by bisection: find x with log P(lower <= X
   * <= x) = log U + log mass, measured from whichever bound is finite.
   */
  private static double invertContinuous(
      Parametrisation family, double[] args, double lower, double upper, double logMass,
      RandomGenerator rng) {
    double[] ignored = new double[args.length];
    double logTarget = Math.log(openUniform(rng)) + logMass;
    boolean fromLower = lower > Double.NEGATIVE_INFINITY;
    // F(x) grows in x from the lower bound, or the upper-tail mass shrinks in x from the upper one.
    double a = fromLower ? lower : bracketDown(family, args, upper, logTarget, ignored);
    double b = fromLower ? bracketUp(family, args, lower, upper, logTarget, ignored) : upper;
    for (int step = 0; step < BISECTION_STEPS; step++) {
      double middle = a + (b - a) / 2;
      if (!(middle > a && middle < b)) {
        break;
      }
      double logP = fromLower
          ? family.logProbabilityBetween(lower, middle, args, ignored)
          : family.logProbabilityBetween(middle, upper, args, ignored);
      if (fromLower == (logP < logTarget)) {
        a = middle;
      } else {
        b = middle;
      }
    }
    return a + (b - a) / 2;
  }

  private static double bracketUp(
      Parametrisation family, double[] args, double lower, double upper, double logTarget,
      double[] ignored) {
    if (upper < Double.POSITIVE_INFINITY) {
      return upper;
    }
    double width = Math.max(1.0, Math.abs(lower) * 1e-3);
    double b = lower + width;
    while (family.logProbabilityBetween(lower, b, args, ignored) < logTarget) {
      width *= 2;
      b = lower + width;
      if (width > Double.MAX_VALUE / 4) {
        return Double.MAX_VALUE;
      }
    }
    return b;
  }

  private static double bracketDown(
      Parametrisation family, double[] args, double upper, double logTarget, double[] ignored) {
    double width = Math.max(1.0, Math.abs(upper) * 1e-3);
    double a = upper - width;
    while (family.logProbabilityBetween(a, upper, args, ignored) < logTarget) {
      width *= 2;
      a = upper - width;
      if (width > Double.MAX_VALUE / 4) {
        return -Double.MAX_VALUE;
      }
    }
    return a;
  }

  /** The smallest whole k in the interval with log P(first <= X <= k) >= log U + log mass. */
  private static double invertDiscrete(
      Parametrisation family, double[] args, double lower, double upper, double logMass,
      RandomGenerator rng) {
    double[] ignored = new double[args.length];
    double logTarget = Math.log(openUniform(rng)) + logMass;
    double supportLower = switch (family.support()) {
      case WHOLE_BETWEEN_FIRST_TWO_ARGUMENTS -> args[0];
      case CATEGORY -> 1;
      default -> 0;
    };
    double first = Math.max(supportLower, Math.ceil(lower));
    double last = Math.floor(upper);
    double a = first - 1;
    double b;
    if (last < Double.POSITIVE_INFINITY) {
      b = last;
    } else {
      double width = 1;
      b = first;
      while (family.logProbabilityBetween(first, b, args, ignored) < logTarget) {
        width *= 2;
        b = first + width;
      }
    }
    // Invariant: P(first..a) < target <= P(first..b).
    while (b - a > 1) {
      double middle = Math.floor(a + (b - a) / 2);
      if (family.logProbabilityBetween(first, middle, args, ignored) < logTarget) {
        a = middle;
      } else {
        b = middle;
      }
    }
    return b;
  }

  private static double whole(Parametrisation family, double[] args, RandomGenerator rng) {
    List<String> names = family.argumentNames();
    switch (family.family().name()) {
      case "normal":
        return arg(names, args, "mean") + normalSd(names, args) * rng.nextGaussian();
      case "lognormal":
        return Math.exp(arg(names, args, "meanlog") + arg(names, args, "sdlog") * rng.nextGaussian());
      case "half-normal":
        return Math.abs(arg(names, args, "sd") * rng.nextGaussian());
      case "student-t": {
        double df = arg(names, args, "df");
        double chiSquare = 2 * standardGamma(df / 2, rng);
        return arg(names, args, "location")
            + arg(names, args, "scale") * rng.nextGaussian() / Math.sqrt(chiSquare / df);
      }
      case "cauchy":
        return arg(names, args, "location") + arg(names, args, "scale") * standardCauchy(rng);
      case "half-cauchy":
        return Math.abs(arg(names, args, "scale") * standardCauchy(rng));
      case "logistic": {
        double u = openUniform(rng);
        return arg(names, args, "location") + arg(names, args, "scale") * Math.log(u / (1 - u));
      }
      case "laplace": {
        // Inversion of F(x) = 1/2 e^x (x < 0), 1 - 1/2 e^-x: a signed exponential.
        double e = -Math.log(openUniform(rng));
        double sign = rng.nextBoolean() ? 1 : -1;
        return arg(names, args, "location") + arg(names, args, "scale") * sign * e;
      }
      case "exponential":
        return -Math.log(openUniform(rng)) / arg(names, args, "rate");
      case "gamma": {
        double scale = names.contains("rate") ? 1 / arg(names, args, "rate") : arg(names, args, "scale");
        return positive(standardGamma(arg(names, args, "shape"), rng) * scale);
      }
      case "inverse-gamma":
        return positive(arg(names, args, "scale") / standardGamma(arg(names, args, "shape"), rng));
      case "weibull":
        return arg(names, args, "scale")
            * Math.pow(-Math.log(openUniform(rng)), 1 / arg(names, args, "shape"));
      case "beta":
        return beta(arg(names, args, "a"), arg(names, args, "b"), rng);
      case "uniform": {
        double lo = arg(names, args, "lower");
        double hi = arg(names, args, "upper");
        return lo + (hi - lo) * openUniform(rng);
      }
      case "poisson":
        return poisson(names.contains("rate") ? arg(names, args, "rate")
            : Math.exp(arg(names, args, "log_rate")), rng);
      case "binomial":
        return binomial(arg(names, args, "trials"), probability(names, args), rng);
      case "bernoulli":
        return rng.nextDouble() < probability(names, args) ? 1 : 0;
      case "negative-binomial": {
        double mean = arg(names, args, "mean");
        double size = arg(names, args, "size");
        return poisson(standardGamma(size, rng) * (mean / size), rng);
      }
      case "whole-uniform":
        return args[0] + Math.min(args[1] - args[0],
            Math.floor(rng.nextDouble() * (args[1] - args[0] + 1)));
      case "categorical": {
        double total = 0;
        for (double w : args) {
          total += w;
        }
        double target = rng.nextDouble() * total;
        double running = 0;
        for (int k = 0; k < args.length; k++) {
          running += args[k];
          if (target < running) {
            return k + 1;
          }
        }
        return args.length;
      }
      default:
        throw new IllegalArgumentException(
            "family must be one of the model language's, got " + family.family().name());
    }
  }

  private static double arg(List<String> names, double[] args, String name) {
    return args[names.indexOf(name)];
  }

  private static double normalSd(List<String> names, double[] args) {
    if (names.contains("sd")) {
      return arg(names, args, "sd");
    }
    if (names.contains("var")) {
      return Math.sqrt(arg(names, args, "var"));
    }
    return 1 / Math.sqrt(arg(names, args, "precision"));
  }

  private static double probability(List<String> names, double[] args) {
    if (names.contains("p")) {
      return arg(names, args, "p");
    }
    double logit = arg(names, args, "logit_p");
    return logit >= 0 ? 1 / (1 + Math.exp(-logit)) : Math.exp(logit) / (1 + Math.exp(logit));
  }

  /** A uniform in (0, 1), never 0, so that logarithms and ratios stay finite. */
  private static double openUniform(RandomGenerator rng) {
    double u;
    do {
      u = rng.nextDouble();
    } while (u == 0);
    return u;
  }

  /** The smallest positive double instead of an underflowed 0, to stay inside (0, inf). */
  private static double positive(double x) {
    return x > 0 ? x : Double.MIN_VALUE;
  }

  private static double standardCauchy(RandomGenerator rng) {
    return Math.tan(Math.PI * (openUniform(rng) - 0.5));
  }

  private static double standardGamma(double shape, RandomGenerator rng) {
    return Math.exp(logStandardGamma(shape, rng));
  }

  /**
   * log G for G ~ gamma(shape, 1): Marsaglia and Tsang (2000), ACM TOMS 26(3), for shape >= 1; below
   * 1, G = G' U^(1/shape) with G' ~ gamma(shape + 1) (their section 6), kept in logs so that tiny
   * shapes do not underflow.
   */
  private static double logStandardGamma(double shape, RandomGenerator rng) {
    if (shape < 1) {
      return logStandardGamma(shape + 1, rng) + Math.log(openUniform(rng)) / shape;
    }
    // (1) d = a - 1/3, c = 1 / sqrt(9 d).
    double d = shape - 1.0 / 3;
    double c = 1 / Math.sqrt(9 * d);
    for (int tries = 0; tries < REJECTION_TRIES; tries++) {
      // (2) x normal, v = (1 + c x)^3, retry when v <= 0.
      double x = rng.nextGaussian();
      double v = 1 + c * x;
      if (v <= 0) {
        continue;
      }
      v = v * v * v;
      // (3) squeeze, then (4) the exact test, both on a fresh uniform.
      double u = openUniform(rng);
      double x2 = x * x;
      if (u < 1 - 0.0331 * x2 * x2 || Math.log(u) < 0.5 * x2 + d * (1 - v + Math.log(v))) {
        return Math.log(d) + Math.log(v);
      }
    }
    throw noAcceptance("gamma draw of shape " + shape);
  }

  /**
   * Tries one rejection draw may make: Marsaglia-Tsang accepts with probability above 0.95 for
   * shape &gt;= 1 (their paper, recalled from memory) and PTRS above 0.89 for rate &gt;= 10
   * (Hörmann 1993, recalled from memory), so a correct draw needs more with probability below
   * 0.11^1000; the cap turns arguments the checks let through by mistake into an error, not a hang.
   */
  private static final int REJECTION_TRIES = 1000;

  private static IllegalStateException noAcceptance(String draw) {
    return new IllegalStateException(
        draw + ": no proposal accepted in " + REJECTION_TRIES + " tries");
  }

  /** X = G_a / (G_a + G_b), in logs (Devroye 1986, IX.3). */
  private static double beta(double a, double b, RandomGenerator rng) {
    double logA = logStandardGamma(a, rng);
    double logB = logStandardGamma(b, rng);
    double x = 1 / (1 + Math.exp(logB - logA));
    if (x <= 0) {
      return Double.MIN_VALUE;
    }
    return x >= 1 ? Math.nextDown(1.0) : x;
  }

  private static double poisson(double rate, RandomGenerator rng) {
    if (rate == 0) {
      return 0;
    }
    if (rate < 10) {
      // Sequential search inversion (Devroye 1986, X.3.3): at most about rate + a few steps.
      double u = rng.nextDouble();
      double p = Math.exp(-rate);
      double cumulative = p;
      int k = 0;
      while (u > cumulative && p > 0) {
        k++;
        p *= rate / k;
        cumulative += p;
      }
      return k;
    }
    return poissonTransformedRejection(rate, rng);
  }

  /**
   * PTRS: Hörmann (1993), "The transformed rejection method for generating Poisson random
   * variables", Insurance: Mathematics and Economics 12, 39-45; valid for rate >= 10.
   */
  private static double poissonTransformedRejection(double rate, RandomGenerator rng) {
    double logRate = Math.log(rate);
    double sqrtRate = Math.sqrt(rate);
    double b = 0.931 + 2.53 * sqrtRate;
    double a = -0.059 + 0.02483 * b;
    double inverseAlpha = 1.1239 + 1.1328 / (b - 3.4);
    double vr = 0.9277 - 3.6224 / (b - 2);
    for (int tries = 0; tries < REJECTION_TRIES; tries++) {
      // (1) U uniform on (-1/2, 1/2), V uniform on (0, 1).
      double u = rng.nextDouble() - 0.5;
      double v = openUniform(rng);
      double us = 0.5 - Math.abs(u);
      double k = Math.floor((2 * a / us + b) * u + rate + 0.43);
      // (2) the quick acceptance region.
      if (us >= 0.07 && v <= vr) {
        return k;
      }
      // (3) outside the support or in the thin rejection strip.
      if (k < 0 || (us < 0.013 && v > us)) {
        continue;
      }
      // (4) the exact test against the Poisson mass.
      double left = Math.log(v) + Math.log(inverseAlpha) - Math.log(a / (us * us) + b);
      double right = -rate + k * logRate - org.apache.commons.math3.special.Gamma.logGamma(k + 1);
      if (left <= right) {
        return k;
      }
    }
    throw noAcceptance("Poisson draw of rate " + rate);
  }

  /**
   * Knuth (TAOCP vol. 2, 3rd ed., 3.4.1, exercise on the binomial): split n trials at the i-th
   * order statistic of n uniforms, a beta(i, n + 1 - i) draw, until few trials remain; then count
   * Bernoulli successes.
   */
  private static double binomial(double trials, double p, RandomGenerator rng) {
    long n = Math.round(trials);
    double successes = 0;
    while (n > 64) {
      long i = 1 + n / 2;
      double x = beta(i, n + 1 - i, rng);
      if (x >= p) {
        // The i-th smallest uniform lies above p: successes are among the i - 1 below it.
        n = i - 1;
        p = p / x;
      } else {
        successes += i;
        n = n - i;
        p = (p - x) / (1 - x);
      }
    }
    for (long t = 0; t < n; t++) {
      if (rng.nextDouble() < p) {
        successes++;
      }
    }
    return successes;
  }
}

package org.hullbound.sampling;

import java.util.random.RandomGenerator;

/**
 * Exact draws from the distributions that conjugate Gibbs updates produce: normal, gamma (and its
 * inverse), beta.
 *
 * <p>A conjugate full conditional needs a draw with new parameters every sweep, so these are
 * static, allocation-free methods that validate their arguments on every call, rather than sampler
 * objects. Sources: gamma by Marsaglia and Tsang (2000), "A simple method for generating gamma
 * variables", ACM TOMS 26(3), including their boost {@code Gamma(a) = Gamma(a + 1) U^(1/a)} for
 * {@code a < 1}; beta as {@code X / (X + Y)} of two gammas (Devroye 1986, chapter IX); normal
 * by the generator's own {@link RandomGenerator#nextGaussian()} (a ziggurat in the JDK,
 * McFarland 2016).
 *
 * <table>
 *   <caption>Draws and the random numbers they use</caption>
 *   <tr><td>{@link #normal}</td><td>one {@code nextGaussian}</td></tr>
 *   <tr><td>{@link #gamma}, {@link #logGamma}, {@link #inverseGamma}</td>
 *   <td>per try one normal and one uniform (about 1.02 tries for shape 1, fewer above); one more
 *   uniform when shape &lt; 1</td></tr>
 *   <tr><td>{@link #beta}</td><td>two gammas</td></tr>
 * </table>
 *
 * <p>Tiny shapes: a {@code Gamma(0.001)} draw is below {@code 1e-300} with probability near one
 * half, so {@link #gamma} may round to 0; {@link #logGamma} returns the draw's logarithm without
 * underflow, and {@link #beta} works in log space for shapes below 1 (it can still round to exactly
 * 0 or 1 when the parameters are tiny, which is then the correctly rounded value).
 */
public final class ConjugateDraws {
  private ConjugateDraws() {}

  /**
   * A draw from the normal distribution with this mean and standard deviation.
   *
   * @param mean finite
   * @param sd finite and {@code > 0}
   */
  public static double normal(RandomGenerator rng, double mean, double sd) {
    Arguments.finite("mean", mean);
    Arguments.positive("sd", sd);
    return mean + sd * rng.nextGaussian();
  }

  /**
   * A draw from the gamma distribution with density proportional to {@code x^(shape-1)
   * exp(-rate x)}.
   *
   * @param shape finite and {@code > 0}
   * @param rate finite and {@code > 0}
   */
  public static double gamma(RandomGenerator rng, double shape, double rate) {
    Arguments.positive("shape", shape);
    Arguments.positive("rate", rate);
    if (shape >= 1) {
      return standardGammaAtLeastOne(rng, shape) / rate;
    }
    return Math.exp(logStandardGammaBelowOne(rng, shape) - Math.log(rate));
  }

  /**
   * The logarithm of a {@code Gamma(shape, rate)} draw, computed without underflow for tiny
   * shapes.
   *
   * @param shape finite and {@code > 0}
   * @param rate finite and {@code > 0}
   */
  public static double logGamma(RandomGenerator rng, double shape, double rate) {
    Arguments.positive("shape", shape);
    Arguments.positive("rate", rate);
    double logStandard = shape >= 1
        ? Math.log(standardGammaAtLeastOne(rng, shape))
        : logStandardGammaBelowOne(rng, shape);
    return logStandard - Math.log(rate);
  }

  /**
   * A draw from the inverse gamma distribution, density proportional to {@code x^(-shape-1)
   * exp(-scale / x)}: {@code scale / Gamma(shape, 1)}, the conjugate update of a normal variance.
   *
   * @param shape finite and {@code > 0}
   * @param scale finite and {@code > 0}
   */
  public static double inverseGamma(RandomGenerator rng, double shape, double scale) {
    Arguments.positive("shape", shape);
    Arguments.positive("scale", scale);
    if (shape >= 1) {
      return scale / standardGammaAtLeastOne(rng, shape);
    }
    return Math.exp(Math.log(scale) - logStandardGammaBelowOne(rng, shape));
  }

  /**
   * A draw from the beta distribution with density proportional to {@code x^(a-1) (1-x)^(b-1)} on
   * (0, 1), as {@code X / (X + Y)} with {@code X ~ Gamma(a)}, {@code Y ~ Gamma(b)}.
   *
   * @param a finite and {@code > 0}
   * @param b finite and {@code > 0}
   */
  public static double beta(RandomGenerator rng, double a, double b) {
    Arguments.positive("a", a);
    Arguments.positive("b", b);
    if (a >= 1 && b >= 1) {
      double x = standardGammaAtLeastOne(rng, a);
      double y = standardGammaAtLeastOne(rng, b);
      return x / (x + y);
    }
    // Below shape 1 either gamma may underflow; X / (X + Y) = 1 / (1 + exp(log Y - log X)).
    double logX = a >= 1 ? Math.log(standardGammaAtLeastOne(rng, a))
        : logStandardGammaBelowOne(rng, a);
    double logY = b >= 1 ? Math.log(standardGammaAtLeastOne(rng, b))
        : logStandardGammaBelowOne(rng, b);
    double difference = logY - logX;
    return difference > 0
        ? Math.exp(-difference) / (1 + Math.exp(-difference))
        : 1 / (1 + Math.exp(difference));
  }

  /** Marsaglia and Tsang (2000), shape {@code >= 1}, rate 1. */
  private static double standardGammaAtLeastOne(RandomGenerator rng, double shape) {
    // Step 1: d = a - 1/3, c = 1 / sqrt(9 d).
    double d = shape - 1.0 / 3.0;
    double c = 1.0 / Math.sqrt(9.0 * d);
    for (int tries = 0; tries < GAMMA_TRIES; tries++) {
      // Step 2: x normal, v = (1 + c x)^3, retry when 1 + c x <= 0.
      double x = rng.nextGaussian();
      double v = 1.0 + c * x;
      if (v <= 0) {
        continue;
      }
      v = v * v * v;
      // Step 3: the squeeze u < 1 - 0.0331 x^4 accepts most tries without a logarithm.
      double u = rng.nextDouble();
      double x2 = x * x;
      if (u < 1.0 - 0.0331 * x2 * x2) {
        return d * v;
      }
      // Step 4: the exact test log u < x^2/2 + d (1 - v + log v).
      if (Math.log(u) < 0.5 * x2 + d * (1.0 - v + Math.log(v))) {
        return d * v;
      }
    }
    throw new RejectionLimitException("gamma draw of shape " + shape, GAMMA_TRIES);
  }

  /**
   * Tries one Marsaglia-Tsang gamma draw may make: each is accepted with probability above 0.95
   * for shape &gt;= 1 (Marsaglia and Tsang 2000, recalled from memory), so a correct draw needs
   * more with probability below 0.05^1000; only a shape that is not a number could reach it.
   */
  private static final int GAMMA_TRIES = 1000;

  /** log of a {@code Gamma(shape)} draw for shape {@code < 1}: Gamma(a + 1) U^(1/a). */
  private static double logStandardGammaBelowOne(RandomGenerator rng, double shape) {
    double boosted = standardGammaAtLeastOne(rng, shape + 1.0);
    // 1 - u lies in (0, 1]: the logarithm is finite.
    double u = 1.0 - rng.nextDouble();
    return Math.log(boosted) + Math.log(u) / shape;
  }
}

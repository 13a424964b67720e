package org.hullbound.sampling;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGeneratorFactory;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;

/**
 * Range properties of the conjugate draws over extreme parameters (no NaN, never out of range).
 * Parameters are drawn as powers of ten, {@code 10^e}, so that tiny and huge scales both occur;
 * the jqwik seed is fixed so that every run checks the same cases.
 */
class ConjugateDrawsProperties {
  @Property(tries = 300, seed = "20240601")
  void gammaIsNonNegativeAndItsLogIsFinite(
      @ForAll @DoubleRange(min = -4, max = 8) double shapeExponent,
      @ForAll @DoubleRange(min = -8, max = 8) double rateExponent,
      @ForAll long seed) {
    var rng = RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
    double shape = Math.pow(10, shapeExponent);
    double rate = Math.pow(10, rateExponent);
    double x = ConjugateDraws.gamma(rng, shape, rate);
    assertTrue(x >= 0 && Double.isFinite(x), "gamma draw " + x);
    double log = ConjugateDraws.logGamma(rng, shape, rate);
    assertTrue(Double.isFinite(log), "log gamma draw " + log);
  }

  @Property(tries = 300, seed = "20240601")
  void betaStaysInTheUnitInterval(
      @ForAll @DoubleRange(min = -4, max = 8) double aExponent,
      @ForAll @DoubleRange(min = -4, max = 8) double bExponent,
      @ForAll long seed) {
    var rng = RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
    double x = ConjugateDraws.beta(rng, Math.pow(10, aExponent), Math.pow(10, bExponent));
    assertTrue(x >= 0 && x <= 1, "beta draw " + x);
  }
}

package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The cheaper arithmetic of the per-observation kernels (issue 12) gives the very bits of the
 * arithmetic it replaced, so that seeded fits draw the same.
 *
 * <p>{@link LogSpace#log1p} against the JDK's {@link StrictMath#log1p}, which its specification
 * ties to fdlibm's {@code s_log1p.c} (Sun Microsystems 1993): equal bits on edges (the switch
 * points of fdlibm's argument reduction, the tiny and huge ranges, -1, the zeros, infinities) and
 * on two million seeded values spread over every exponent, NaN for NaN. The logit Bernoulli and
 * binomial at the ends of their support, now from one {@code exp(-|eta|)}, against the formulas
 * they had before, written out here with two exponentials ({@code x log expit(eta) + (n - x) log
 * expit(-eta)}, slope {@code x - n expit(eta)}, as {@code Binomial} computed them): equal bits.
 */
class SharedExponentialTest {

  private static void sameBits(double x) {
    double expected = StrictMath.log1p(x);
    double actual = LogSpace.log1p(x);
    if (Double.isNaN(expected)) {
      assertEquals(Double.NaN, actual, () -> "log1p(" + x + ")");
      return;
    }
    assertEquals(Double.doubleToRawLongBits(expected), Double.doubleToRawLongBits(actual),
        () -> "log1p(" + x + "): fdlibm " + expected + ", ours " + actual);
  }

  @Test
  void log1pEqualsFdlibmAtTheEdges() {
    double[] edges = {
      0.0, -0.0, -1.0, Double.NaN, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY,
      Double.MIN_VALUE, -Double.MIN_VALUE, Double.MIN_NORMAL, Double.MAX_VALUE, -Double.MAX_VALUE,
      Math.scalb(1.0, -29), Math.nextDown(Math.scalb(1.0, -29)), -Math.scalb(1.0, -29),
      Math.scalb(1.0, -54), Math.nextDown(Math.scalb(1.0, -54)), -Math.scalb(1.0, -54),
      0.41421356237309503, 0.41422, 0.4142, -0.2929, -0.29289321881345254, -0.2928,
      Math.nextUp(-1.0), -1.5, 1.0, 2.0, Math.sqrt(2) - 1, Math.scalb(1.0, 53), Math.scalb(1.0, 54),
      Math.nextDown(Math.scalb(1.0, 53)), 1e300, 1e-300, Math.E - 1
    };
    for (double x : edges) {
      sameBits(x);
      sameBits(Math.nextUp(x));
      sameBits(Math.nextDown(x));
    }
  }

  @Test
  void log1pEqualsFdlibmOnSeededValues() {
    SplittableRandom random = new SplittableRandom(20261203L);
    for (int i = 0; i < 2_000_000; i++) {
      double x = switch (i % 4) {
        case 0 -> Double.longBitsToDouble(random.nextLong());
        case 1 -> Math.exp(-800 * random.nextDouble()); // exp(-|eta|), as the kernels pass it
        case 2 -> 4 * random.nextDouble() - 1;
        default -> Math.scalb(random.nextDouble(), random.nextInt(-1100, 1030))
            * (random.nextBoolean() ? 1 : -1);
      };
      sameBits(x);
    }
  }

  /** {@code log(1 + exp(x))} as {@code LogSpace} computed it before: two branches, one exp each. */
  private static double oldLog1pExp(double x) {
    return x > 0 ? x + StrictMath.log1p(Math.exp(-x)) : StrictMath.log1p(Math.exp(x));
  }

  private static double oldInvLogit(double x) {
    if (x >= 0) {
      return 1.0 / (1.0 + Math.exp(-x));
    }
    double e = Math.exp(x);
    return e / (1.0 + e);
  }

  @Test
  void logitBernoulliAndBinomialEndsEqualTheTwoExponentialForm() {
    Parametrisation bernoulli = FamilyCases.parametrisation("bernoulli", "logit_p");
    Parametrisation binomial = FamilyCases.parametrisation("binomial", "trials", "logit_p");
    SplittableRandom random = new SplittableRandom(7);
    double[] gradient = new double[3];
    for (int i = 0; i < 200_000; i++) {
      double eta = switch (i % 3) {
        case 0 -> 10 * random.nextGaussian();
        case 1 -> 800 * (2 * random.nextDouble() - 1);
        default -> Math.scalb(random.nextGaussian(), -random.nextInt(60));
      };
      double x = random.nextInt(2);
      double value = bernoulli.logDensity(x, new double[] {eta}, gradient);
      double expected = x == 0 ? -oldLog1pExp(eta) + 0.0 : -oldLog1pExp(-eta);
      assertEquals(Double.doubleToRawLongBits(expected), Double.doubleToRawLongBits(value),
          "bernoulli value at eta " + eta + ", x " + x);
      assertEquals(Double.doubleToRawLongBits(Math.fma(-1.0, oldInvLogit(eta), x)),
          Double.doubleToRawLongBits(gradient[1]), "bernoulli slope at eta " + eta);
      double trials = 1 + random.nextInt(40);
      double end = x * trials;
      value = binomial.logDensity(end, new double[] {trials, eta}, gradient);
      expected = end == 0 ? trials * -oldLog1pExp(eta) + 0.0 : trials * -oldLog1pExp(-eta);
      assertEquals(Double.doubleToRawLongBits(expected), Double.doubleToRawLongBits(value),
          "binomial value at eta " + eta + ", x " + end + " of " + trials);
      assertEquals(Double.doubleToRawLongBits(Math.fma(-trials, oldInvLogit(eta), end)),
          Double.doubleToRawLongBits(gradient[2]), "binomial slope at eta " + eta);
    }
  }
}

package org.hullbound.validation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.ParetoDistribution;
import org.junit.jupiter.api.Test;

/**
 * A location normal given its scale, the scale integrated over its whole range: moments against
 * closed forms from commons-math3 distributions (as a reference library), a light and a power-law
 * scale tail.
 */
final class ScaleMixtureTest {
  /**
   * Scale ~ gamma(shape 3, rate 2), mu given s ~ normal(s, s): E mu = E s = 1.5, Var mu = E s^2 +
   * Var s (law of total variance) = 2 Var s + (E s)^2 = 3.75.
   */
  @Test
  void reproducesTheMomentsOfAGammaScale() {
    GammaDistribution gamma = new GammaDistribution(3, 0.5);
    ScaleMixture mixture =
        ScaleMixture.of(s -> new ScaleMixture.GivenScale(s, gamma.logDensity(s), s, s * s), 1);
    double mean = gamma.getNumericalMean();
    double variance = gamma.getNumericalVariance();
    assertEquals(mean, mixture.meanScale(), 1e-12);
    assertEquals(Math.sqrt(variance), mixture.sdScale(), 1e-12);
    assertEquals(mean, mixture.meanMu(), 1e-12);
    assertEquals(Math.sqrt(2 * variance + mean * mean), mixture.sdMu(), 1e-12);
  }

  /**
   * Scale ~ Lomax (Pareto of the second kind, shape 5), density proportional to (1 + s)^-6: the
   * scale plus one is commons-math3's Pareto(1, 5), whose moments are the reference. Its tail is a
   * power law, like that of a half-Cauchy scale given data; cut at the mean + 14 sd, as a grid
   * placed by a coarse pass would cut it, the sd comes out more than 1e-3 too small.
   */
  @Test
  void reproducesAPowerLawTailThatACutOffLoses() {
    ParetoDistribution shifted = new ParetoDistribution(1, 5);
    double mean = shifted.getNumericalMean() - 1;
    double sd = Math.sqrt(shifted.getNumericalVariance());
    java.util.function.DoubleFunction<ScaleMixture.GivenScale> lomax =
        s -> new ScaleMixture.GivenScale(s, shifted.logDensity(1 + s), 0, 1);
    ScaleMixture whole = ScaleMixture.of(lomax, 1);
    assertEquals(mean, whole.meanScale(), 1e-12);
    assertEquals(sd, whole.sdScale(), 1e-12);
    assertEquals(1, whole.sdMu(), 1e-12);
    ScaleMixture cut = ScaleMixture.over(lomax, 1, mean + 14 * sd);
    assertTrue(sd - cut.sdScale() > 1e-3, "sd of the cut scale " + cut.sdScale() + ", whole " + sd);
  }

  @Test
  void rejectsBadArgumentsAndAWeightWithoutMaximum() {
    java.util.function.DoubleFunction<ScaleMixture.GivenScale> flat = s -> new ScaleMixture.GivenScale(s, -s, 0, 1);
    assertThrows(IllegalArgumentException.class, () -> ScaleMixture.of(flat, 0));
    assertThrows(IllegalArgumentException.class, () -> ScaleMixture.of(flat, Double.NaN));
    assertThrows(IllegalArgumentException.class, () -> ScaleMixture.of(flat, Double.POSITIVE_INFINITY));
    assertThrows(IllegalArgumentException.class, () -> ScaleMixture.over(flat, 1, 0));
    assertThrows(IllegalArgumentException.class, () -> ScaleMixture.over(flat, 1, Double.NaN));
    assertThrows(
        IllegalArgumentException.class,
        () -> ScaleMixture.of(s -> new ScaleMixture.GivenScale(s, Double.NEGATIVE_INFINITY, 0, 1), 1));
    assertThrows(
        IllegalArgumentException.class,
        () -> ScaleMixture.of(s -> new ScaleMixture.GivenScale(s, Double.NaN, 0, 1), 1));
  }
}

package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;

/**
 * Properties of the piecewise-geometric envelope over generated log-concave masses and generated
 * chord anchors, as for the continuous hull ({@link UpperHullProperties}): u(k) &gt;= h(k) &gt;=
 * l(k) at every integer of a window around the mode, with equality at each chord's two integers
 * (Gilks and Wild 1992, section 2.2, on the integers), and the envelope's total mass at least the
 * mass it bounds. Then the same with the chords the sampler itself adds while it draws.
 */
class GeometricHullProperties {

  /** Rounding allowance in log-mass units relative to the magnitudes compared. */
  private static final double ROUNDING = 1e-9;

  @Provide
  Arbitrary<GeneratedLogConcaveMass> masses() {
    return Arbitraries.oneOf(
        Arbitraries.doubles().between(0.05, 500).ofScale(4).map(GeneratedLogConcaveMass::poisson),
        Combinators.combine(
                Arbitraries.integers().between(1, 400), Arbitraries.doubles().between(0.01, 0.99))
            .as(GeneratedLogConcaveMass::binomial),
        Combinators.combine(
                Arbitraries.doubles().between(1, 30), Arbitraries.doubles().between(0.05, 0.97))
            .as(GeneratedLogConcaveMass::negativeBinomial),
        Combinators.combine(
                Arbitraries.doubles().between(-1e6, 1e6), Arbitraries.doubles().between(0.2, 400))
            .as(GeneratedLogConcaveMass::normal));
  }

  @Provide
  Arbitrary<List<Integer>> offsets() {
    return Arbitraries.integers().between(-60, 60).list().ofMinSize(1).ofMaxSize(10);
  }

  private static GeometricHull hull(GeneratedLogConcaveMass h, List<Integer> offsets) {
    long[] anchors = offsets.stream().mapToLong(o -> anchorInside(h, h.centre() + o))
        .distinct().toArray();
    double[] values = new double[anchors.length];
    double[] next = new double[anchors.length];
    for (int i = 0; i < anchors.length; i++) {
      values[i] = h.value(anchors[i]);
      next[i] = h.value(anchors[i] + 1);
    }
    return GeometricHull.of(h.lower(), h.upper(), anchors, values, next);
  }

  /**
   * The hull of chords at the offsets, or {@code null} when there is none to check: a one-point
   * range, or an outermost chord that rises on an unbounded side.
   */
  private static GeometricHull hullOrNull(GeneratedLogConcaveMass h, List<Integer> offsets) {
    if (h.upper() - h.lower() < 1) {
      return null;
    }
    try {
      return hull(h, offsets);
    } catch (NonIntegrableHullException e) {
      return null;
    }
  }

  private static long anchorInside(GeneratedLogConcaveMass h, long a) {
    return (long) Math.max(h.lower(), Math.min(h.upper() - 1, a));
  }

  private static double allowance(double a, double b) {
    return ROUNDING * Math.max(1, Math.max(Math.abs(a), Math.abs(b)));
  }

  /** u(k) >= h(k) >= l(k) at every integer within 300 of the mode, inside the range. */
  private static void assertBoundsAroundTheMode(GeneratedLogConcaveMass h, GeometricHull hull) {
    long from = (long) Math.max(h.lower(), h.centre() - 300);
    long to = (long) Math.min(h.upper(), h.centre() + 300);
    for (long k = from; k <= to; k++) {
      double value = h.value(k);
      double upper = hull.upper(k);
      double squeeze = hull.squeeze(k);
      assertTrue(upper >= value - allowance(upper, value),
          "u(" + k + ") = " + upper + " < h = " + value + " for " + h);
      assertTrue(squeeze <= value + allowance(squeeze, value),
          "l(" + k + ") = " + squeeze + " > h = " + value + " for " + h);
    }
  }

  @Property(tries = 400, seed = "20261202")
  void envelopeBoundsAndSqueezeLiesBelowAtEveryInteger(
      @ForAll("masses") GeneratedLogConcaveMass h, @ForAll("offsets") List<Integer> offsets) {
    GeometricHull hull = hullOrNull(h, offsets);
    if (hull == null) {
      return;
    }
    assertBoundsAroundTheMode(h, hull);
    for (long a : hull.anchors()) {
      for (long k : new long[] {a, a + 1}) {
        assertEquals(h.value(k), hull.upper(k), allowance(h.value(k), 1), "u at " + k);
        assertEquals(h.value(k), hull.squeeze(k), allowance(h.value(k), 1), "l at " + k);
      }
    }
  }

  @Property(tries = 200, seed = "4401117")
  void envelopeMassIsAtLeastTheMassItBounds(
      @ForAll("masses") GeneratedLogConcaveMass h, @ForAll("offsets") List<Integer> offsets) {
    GeometricHull hull = hullOrNull(h, offsets);
    if (hull == null) {
      return;
    }
    long from = (long) Math.max(h.lower(), h.centre() - 2000);
    long to = (long) Math.min(h.upper(), h.centre() + 2000);
    double top = Double.NEGATIVE_INFINITY;
    for (long k = from; k <= to; k++) {
      top = Math.max(top, h.value(k));
    }
    double sum = 0;
    for (long k = from; k <= to; k++) {
      sum += Math.exp(h.value(k) - top);
    }
    double logTarget = top + Math.log(sum);
    assertTrue(hull.logMass() >= logTarget - allowance(logTarget, 1),
        "envelope mass " + hull.logMass() + " < target " + logTarget + " for " + h);
  }

  /** The chords the sampler adds from its own rejections keep the envelope above h. */
  @Property(tries = 150, seed = "777")
  void chordsAddedWhileDrawingKeepTheBounds(
      @ForAll("masses") GeneratedLogConcaveMass h, @ForAll long seed) {
    RandomGenerator rng = RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
    DiscreteAdaptiveRejection sampler = DiscreteAdaptiveRejection.of(
        h, h.lower(), h.upper(),
        HullOptions.defaults().withAutomaticStart(h.centre() + 7, 3));
    for (int i = 0; i < 50; i++) {
      long k = sampler.next(rng);
      assertTrue(k >= h.lower() && k <= h.upper(), "draw " + k + " outside for " + h);
    }
    GeometricHull hull = sampler.hull();
    if (hull != null) {
      assertBoundsAroundTheMode(h, hull);
    }
  }
}

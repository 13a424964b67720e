package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertDoesNotThrow;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The check of an evaluated h(x) against the hull and the squeeze at the edge of its tolerance,
 * driven with chosen values (deterministic): h above the hull, or below the squeeze, by 0.98 of the
 * allowance passes and by 1.02 of it is refused with {@link NotLogConcaveException}, for a
 * difference set by each of the quantities the rule names; and the rounding judged is that of the
 * values compared, not of the hull's reference value.
 *
 * <p>Reference: the tolerance rule of docs/hull.md (Options, {@code logConcavityTolerance}): the
 * allowance τ · max(1, d) + 2 ulp(m), d the largest of h(x) minus the anchor's value, the hull's
 * rise from its anchor and the gap from the hull to the squeeze, m the largest |h| among the values
 * compared; values rounded more coarsely than τ · max(1, d) are refused with {@link
 * ImpreciseDensityException}. The hull and the squeeze are passed as the samplers hold them, less
 * the reference value R (the largest h at the abscissae).
 */
class EnvelopeCheckTest {

  private static final double TAU = 1e-3;

  /** h(x) = 5 - x^2 / 2 from -1, 0, 1: the reference is h(0) = 5, not 0. */
  private static TangentSampler sampler(double tau) {
    return (TangentSampler)
        AdaptiveRejectionSampler.withDerivatives(
            x -> new Evaluation(5 - 0.5 * x * x, -x),
            Support.real(),
            HullOptions.defaults().withStartingAbscissae(-1, 0, 1).withLogConcavityTolerance(tau));
  }

  private static double allowance(double d, double m) {
    return TAU * Math.max(1, d) + 2 * Math.ulp(m);
  }

  @ParameterizedTest(name = "excess {0} of the allowance")
  @ValueSource(doubles = {0.98, 1.02})
  void hMayLieAboveTheHullByTheAllowanceAndNoMore(double fraction) {
    // the hull at x is U = 10 (less R), reached from its anchor by the rise T = 3: h(x) - anchor is
    // T + ε, which sets d; no squeeze here
    TangentSampler sampler = sampler(TAU);
    double r = sampler.pieces.reference;
    assertEquals(5, r, 0);
    double upper = 10;
    double rise = 3;
    double excess = 0;
    for (int i = 0; i < 8; i++) {
      excess = fraction * allowance(rise + excess, r + upper + excess);
    }
    double h = r + upper + excess;
    if (fraction < 1) {
      assertEquals(
          upper + excess,
          sampler.checkAgainstEnvelope(0.5, h, upper, Double.NEGATIVE_INFINITY, rise),
          1e-12);
    } else {
      NotLogConcaveException e =
          assertThrows(
              NotLogConcaveException.class,
              () -> sampler.checkAgainstEnvelope(0.5, h, upper, Double.NEGATIVE_INFINITY, rise));
      assertTrue(e.getMessage().contains("above the upper hull value " + (r + upper)), e.getMessage());
      assertEquals(0.5, e.x());
    }
  }

  @ParameterizedTest(name = "excess {0} of the allowance")
  @ValueSource(doubles = {0.98, 1.02})
  void hMayLieBelowTheSqueezeByTheAllowanceAndNoMore(double fraction) {
    // hull U = 10 with rise T = 0.5 from its anchor (9.5), squeeze S = 6: the gap U - S = 4 sets d
    // (h(x) - anchor is about -3.5)
    TangentSampler sampler = sampler(TAU);
    double r = sampler.pieces.reference;
    double upper = 10;
    double rise = 0.5;
    double squeeze = 6;
    double excess = fraction * allowance(upper - squeeze, r + upper);
    double h = r + squeeze - excess;
    if (fraction < 1) {
      assertDoesNotThrow(() -> sampler.checkAgainstEnvelope(0.5, h, upper, squeeze, rise));
    } else {
      NotLogConcaveException e =
          assertThrows(
              NotLogConcaveException.class,
              () -> sampler.checkAgainstEnvelope(0.5, h, upper, squeeze, rise));
      assertTrue(
          e.getMessage().contains("below the chord (squeeze) value " + (r + squeeze)),
          e.getMessage());
    }
  }

  @Test
  void theRoundingJudgedIsThatOfTheValuesComparedNotOfTheReference() {
    // h of size 1e6 at the abscissae (R = 1e6 + 5), τ = 3e-10 just above their rounding 2 ulp(1e6)
    // = 2.3e-10; an evaluation 1e6 below them, near 0, is rounded to 2 ulp(1), far finer: it is
    // judged on its own values and passes, while values of size 2e6 would not
    double tau = 3e-10;
    TangentSampler sampler =
        (TangentSampler)
            AdaptiveRejectionSampler.withDerivatives(
                x -> new Evaluation(1e6 + 5 - 0.5 * x * x, -x),
                Support.real(),
                HullOptions.defaults()
                    .withStartingAbscissae(-1, 0, 1)
                    .withLogConcavityTolerance(tau));
    double r = sampler.pieces.reference;
    assertTrue(2 * Math.ulp(2 * r) > tau && 2 * Math.ulp(r) < tau, "the sizes the test needs");
    double upper = -r + 1; // the hull at 1 in absolute terms
    assertDoesNotThrow(() -> sampler.checkAgainstEnvelope(0.5, 0.5, upper, Double.NEGATIVE_INFINITY, 0.5));
  }

  @ParameterizedTest(name = "tolerance {0}")
  @ValueSource(doubles = {1e-11, 1e-9})
  void valuesRoundedMoreCoarselyThanTheToleranceAreRefusedWhenEvaluated(double tau) {
    // the starting values (size 5) are fine at either τ; an evaluation of size 1e6 is rounded to
    // 2 ulp(1e6) = 2.3e-10, coarser than τ max(1, d) = 1e-11 but not than 1e-9
    TangentSampler sampler = sampler(tau);
    double r = sampler.pieces.reference;
    double upper = 1e6;
    double h = r + upper - 1;
    if (tau < 2 * Math.ulp(1e6)) {
      ImpreciseDensityException e =
          assertThrows(
              ImpreciseDensityException.class,
              () -> sampler.checkAgainstEnvelope(0.5, h, upper, Double.NEGATIVE_INFINITY, 0.5));
      // the tolerance that would admit these values: the rounding over max(1, d), d = 1
      double rounding = 2 * Math.ulp(r + upper - 0.5);
      assertTrue(e.getMessage().endsWith("raise logConcavityTolerance above " + rounding), e.getMessage());
    } else {
      assertDoesNotThrow(
          () -> sampler.checkAgainstEnvelope(0.5, h, upper, Double.NEGATIVE_INFINITY, 0.5));
    }
  }
}

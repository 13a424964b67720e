package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertDoesNotThrow;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.DoubleUnaryOperator;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The log-concavity checks of the starting points at the edge of their tolerance, for each
 * comparison the two forms make: two tangents (their slopes, and each value against the other's
 * tangent) and three secant points (their chord slopes). Values that break concavity by 0.98 of the
 * tolerance are accepted, by 1.02 of it refused with {@link NotLogConcaveException}; values rounded
 * more coarsely than the tolerance are refused with {@link ImpreciseDensityException} before any
 * draw, and values rounded exactly as finely as it are admitted.
 *
 * <p>Reference: the tolerance rule of docs/hull.md (Options, {@code logConcavityTolerance}). An
 * excess of one value over another is tolerated up to the allowance τ · max(1, d) + 2 ulp(m), d the
 * largest difference between the values compared, m the largest |h| among them; an excess of one
 * slope over the one before up to τ times the sum of their sizes plus the allowance spread over each
 * interval of the comparison (a value off by a over a width w moves a slope by a / w). The
 * rounding of the values, 2 ulp(m), must not exceed τ · max(1, d). Deterministic: only the
 * starting points are evaluated, on a bounded support, so no outward search and no draw enters.
 */
class ConcavityToleranceTest {

  /** Large enough that the ulp term is 1e-12 of the allowance: the tests see τ's terms alone. */
  private static final double TAU = 1e-3;

  /** Two fractions of the tolerance, one on each side of it. */
  private static final double INSIDE = 0.98;
  private static final double BEYOND = 1.02;

  private static final Support SUPPORT = Support.between(0, 4);

  /** The allowance of docs/hull.md for values that differ by up to d, the largest of size m. */
  private static double allowance(double tau, double d, double m) {
    return tau * Math.max(1, d) + 2 * Math.ulp(m);
  }

  // ---- two tangents, a = 1 and b = 1.25

  private static final double XA = 1;
  private static final double XB = 1.25;
  private static final double WIDTH = XB - XA;

  /** Exact values and slopes at the two starting points (nothing else is evaluated). */
  private static AdaptiveRejectionSampler tangents(
      double tau, double ha, double da, double hb, double db) {
    DifferentiableLogDensity density =
        x -> x <= 0.5 * (XA + XB) ? new Evaluation(ha, da) : new Evaluation(hb, db);
    return AdaptiveRejectionSampler.withDerivatives(
        density,
        SUPPORT,
        HullOptions.defaults().withStartingAbscissae(XA, XB).withLogConcavityTolerance(tau));
  }

  /** The slope tolerance for two tangents (docs/hull.md): τ (|da| + |db|) + allowance / width. */
  private static double tangentSlopeTolerance(double ha, double da, double hb, double db) {
    double d = Math.max(Math.abs(hb - ha), Math.max(Math.abs(da * WIDTH), Math.abs(db * WIDTH)));
    return TAU * (Math.abs(da) + Math.abs(db))
        + allowance(TAU, d, Math.max(Math.abs(ha), Math.abs(hb))) / WIDTH;
  }

  @ParameterizedTest(name = "excess {0} of the tolerance")
  @ValueSource(doubles = {INSIDE, BEYOND})
  void tangentSlopesMayRiseByTheirToleranceAndNoMore(double fraction) {
    // h'(b) = h'(a) + δ; h(b) on the chord of slope (h'(a) + h'(b)) / 2, which lies above both
    // tangents by w δ / 2, within the value allowance, so that only the slopes' check can refuse
    double ha = 11;
    double da = -1;
    double delta = 0.006;
    for (int i = 0; i < 8; i++) {
      delta = fraction * tangentSlopeTolerance(ha, da, ha + WIDTH * (da + 0.5 * delta), da + delta);
    }
    double db = da + delta;
    double hb = ha + WIDTH * (da + 0.5 * delta);
    double tolerance = tangentSlopeTolerance(ha, da, hb, db);
    assertTrue(Math.abs(delta / tolerance - fraction) < 1e-9, "fixed point " + delta / tolerance);
    assertTrue(WIDTH * delta / 2 < allowance(TAU, 1, ha), "values within their own allowance");
    if (fraction < 1) {
      assertDoesNotThrow(() -> tangents(TAU, ha, da, hb, db));
    } else {
      NotLogConcaveException e =
          assertThrows(NotLogConcaveException.class, () -> tangents(TAU, ha, da, hb, db));
      assertTrue(e.getMessage().contains("slopes increase"), e.getMessage());
    }
  }

  @ParameterizedTest(name = "excess {0} of the allowance")
  @ValueSource(doubles = {INSIDE, BEYOND})
  void aValueMayLieAboveTheTangentAtItsLeftByTheAllowanceAndNoMore(double fraction) {
    // slopes -1 and -1.5 fall; h(b) lies above a's tangent by ε, and far below b's tangent at a
    double ha = 11;
    double da = -1;
    double db = -1.5;
    double d = Math.abs(db * WIDTH);
    double excess = fraction * allowance(TAU, d, ha);
    double hb = ha + da * WIDTH + excess;
    if (fraction < 1) {
      assertDoesNotThrow(() -> tangents(TAU, ha, da, hb, db));
    } else {
      NotLogConcaveException e =
          assertThrows(NotLogConcaveException.class, () -> tangents(TAU, ha, da, hb, db));
      assertTrue(e.getMessage().contains("lies above the tangent at x = " + XA), e.getMessage());
    }
  }

  @ParameterizedTest(name = "excess {0} of the allowance")
  @ValueSource(doubles = {INSIDE, BEYOND})
  void aValueMayLieAboveTheTangentAtItsRightByTheAllowanceAndNoMore(double fraction) {
    // h(a) lies above b's tangent by ε: h(b) = h(a) + h'(b) w - ε, below a's tangent
    double ha = 11;
    double da = -1;
    double db = -1.5;
    double d = Math.abs(db * WIDTH);
    double excess = fraction * allowance(TAU, d, ha);
    double hb = ha + db * WIDTH - excess;
    if (fraction < 1) {
      assertDoesNotThrow(() -> tangents(TAU, ha, da, hb, db));
    } else {
      NotLogConcaveException e =
          assertThrows(NotLogConcaveException.class, () -> tangents(TAU, ha, da, hb, db));
      assertTrue(e.getMessage().contains("lies above the tangent at x = " + XB), e.getMessage());
    }
  }

  @ParameterizedTest(name = "rounding equal to the tolerance: {0}")
  @ValueSource(booleans = {true, false})
  void tangentValuesRoundedAsFinelyAsTheToleranceAreAdmittedAndCoarserOnesRefused(boolean equal) {
    // concave: slopes -7.5 and -8, h(b) - h(a) = -1.9375 between their rises; d = |h'(b) w| = 2,
    // m = 11: the rounding 2 ulp(11) equals τ max(1, d) at τ = ulp(11) and exceeds it below
    double tau = equal ? Math.ulp(11.0) : Math.nextDown(Math.ulp(11.0));
    if (equal) {
      assertDoesNotThrow(() -> tangents(tau, 11, -7.5, 11 - 1.9375, -8));
    } else {
      assertThrows(ImpreciseDensityException.class, () -> tangents(tau, 11, -7.5, 11 - 1.9375, -8));
    }
  }

  // ---- three secant points, a = 1, b = 1.25, c = 1.75 (widths 1/4 and 1/2)

  private static final double[] SECANT_XS = {1, 1.25, 1.75};

  private static AdaptiveRejectionSampler secants(double tau, double ha, double hb, double hc) {
    double[] hs = {ha, hb, hc};
    LogDensity density = x -> hs[nearest(x)];
    return AdaptiveRejectionSampler.derivativeFree(
        density,
        SUPPORT,
        HullOptions.defaults().withStartingAbscissae(SECANT_XS).withLogConcavityTolerance(tau));
  }

  private static int nearest(double x) {
    return x < 1.125 ? 0 : x < 1.5 ? 1 : 2;
  }

  /**
   * The chord-slope tolerance for three points (docs/hull.md): τ (|s1| + |s2|) + allowance (1 / w1
   * + 1 / w2), d the larger of the two differences.
   */
  private static double chordSlopeTolerance(double ha, double hb, double hc) {
    double w1 = SECANT_XS[1] - SECANT_XS[0];
    double w2 = SECANT_XS[2] - SECANT_XS[1];
    double d = Math.max(Math.abs(hb - ha), Math.abs(hc - hb));
    double m = Math.max(Math.abs(ha), Math.max(Math.abs(hb), Math.abs(hc)));
    return TAU * (Math.abs((hb - ha) / w1) + Math.abs((hc - hb) / w2))
        + allowance(TAU, d, m) * (1 / w1 + 1 / w2);
  }

  @ParameterizedTest(name = "excess {0} of the tolerance")
  @ValueSource(doubles = {INSIDE, BEYOND})
  void chordSlopesMayRiseByTheirToleranceAndNoMore(double fraction) {
    // s1 = -4 on [a, b]; s2 = -4 + δ on [b, c]; the second difference (about 2) sets d, and h(a)
    // and h(b) have the same sign, so that each term of the rule moves the edge
    double ha = 11;
    double hb = 10;
    DoubleUnaryOperator hc = delta -> hb + 0.5 * (-4 + delta);
    double delta = 0.02;
    for (int i = 0; i < 8; i++) {
      delta = fraction * chordSlopeTolerance(ha, hb, hc.applyAsDouble(delta));
    }
    double c = hc.applyAsDouble(delta);
    double rise = (c - hb) / 0.5 - (hb - ha) / 0.25;
    assertTrue(
        Math.abs(rise / chordSlopeTolerance(ha, hb, c) - fraction) < 1e-9, "fixed point " + rise);
    if (fraction < 1) {
      assertDoesNotThrow(() -> secants(TAU, ha, hb, c));
    } else {
      NotLogConcaveException e =
          assertThrows(NotLogConcaveException.class, () -> secants(TAU, ha, hb, c));
      assertTrue(e.getMessage().contains("chord slopes increase"), e.getMessage());
    }
  }

  @ParameterizedTest(name = "rounding equal to the tolerance: {0}")
  @ValueSource(booleans = {true, false})
  void secantValuesRoundedAsFinelyAsTheToleranceAreAdmittedAndCoarserOnesRefused(boolean equal) {
    // concave: slopes -2 and -4; d = |h(c) - h(b)| = 2, m = 11
    double tau = equal ? Math.ulp(11.0) : Math.nextDown(Math.ulp(11.0));
    if (equal) {
      assertDoesNotThrow(() -> secants(tau, 11, 10.5, 8.5));
    } else {
      assertThrows(ImpreciseDensityException.class, () -> secants(tau, 11, 10.5, 8.5));
    }
  }
}

package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;

import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import org.apache.commons.math3.special.Beta;
import org.apache.commons.math3.special.Erf;
import org.apache.commons.math3.special.Gamma;
import org.junit.jupiter.api.Test;

/**
 * The log-space special functions against commons-math3 3.6.1 where its values do not underflow,
 * and the log-space helpers at their edges.
 */
class NumericsProperties {

  @Property(tries = 500, seed = "20261221", edgeCases = EdgeCasesMode.NONE)
  void normalTailEqualsErfcOverTheSwitchToTheContinuedFraction(@ForAll @DoubleRange(min = -8, max = 26) double z) {
    // Q(z) = erfc(z / sqrt 2) / 2 (A&S 26.2.29), commons-math3 erfc.
    double expected = Math.log(0.5 * Erf.erfc(z / Math.sqrt(2)));
    assertEquals(expected, NormalTail.logUpper(z), 1e-12 * Math.max(1, Math.abs(expected)));
  }

  @Property(tries = 500, seed = "20261222", edgeCases = EdgeCasesMode.NONE)
  void incompleteGammaEqualsCommonsMath(
      @ForAll @DoubleRange(min = -2.3, max = 4.6) double logShape, @ForAll @DoubleRange(min = -3, max = 3) double spread) {
    double a = Math.exp(logShape);
    double x = a * Math.exp(spread);
    double p = Gamma.regularizedGammaP(a, x, 1e-16, 100_000);
    double q = Gamma.regularizedGammaQ(a, x, 1e-16, 100_000);
    assertEquals(p, Math.exp(IncompleteGamma.logLower(a, x)), 1e-14 + 1e-11 * p);
    assertEquals(q, Math.exp(IncompleteGamma.logUpper(a, x)), 1e-14 + 1e-11 * q);
  }

  @Property(tries = 500, seed = "20261223", edgeCases = EdgeCasesMode.NONE)
  void incompleteBetaEqualsCommonsMath(
      @ForAll @DoubleRange(min = -2.3, max = 4.6) double logA, @ForAll @DoubleRange(min = -2.3, max = 4.6) double logB,
      @ForAll @net.jqwik.api.constraints.Scale(6) @DoubleRange(min = 0.0001, max = 0.9999) double x) {
    double a = Math.exp(logA);
    double b = Math.exp(logB);
    double expected = Beta.regularizedBeta(x, a, b, 1e-16, 100_000);
    assertEquals(expected, Math.exp(IncompleteBeta.logRegularized(x, 1 - x, a, b)), 1e-14 + 1e-11 * expected);
  }

  @Test
  void logSpaceHelpersAtTheirEdges() {
    // log(1 - e^a) ~ log(-a) for tiny a, ~ -e^a for very negative a (Maechler 2012).
    assertEquals(Math.log(1e-20), LogSpace.log1mExp(-1e-20), 1e-15 * 46);
    assertEquals(-Math.exp(-50), LogSpace.log1mExp(-50), 1e-15 * Math.exp(-50));
    assertEquals(Double.NEGATIVE_INFINITY, LogSpace.log1mExp(0));
    // log expit(x) = -log(1 + e^-x): -1000 at x = -1000, -e^-1000 (= -0 in double) at x = 1000.
    assertEquals(-1000.0, LogSpace.logInvLogit(-1000), 1e-12);
    assertEquals(0.0, LogSpace.logInvLogit(1000), 1e-300);
    assertEquals(1000.0, LogSpace.log1pExp(1000), 1e-12);
    assertEquals(0.0, LogSpace.invLogit(-1000), 1e-300);
    assertEquals(1.0, LogSpace.invLogit(1000), 0.0);
    assertEquals(Math.log(3), LogSpace.logSumExp(Math.log(1), Math.log(2)), 1e-15);
    assertEquals(1000 + Math.log(2), LogSpace.logSumExp(1000, 1000), 1e-12);
  }

  @Test
  void binomialAndBernoulliOnTheLogitScaleStayFiniteAtLogitsOfAThousand() {
    Parametrisation binomial = FamilyCases.parametrisation("binomial", "trials", "logit_p");
    double[] gradient = new double[3];
    // log C(10, 3) + 3 log expit(-1000) + 7 log expit(1000) = log 120 - 3000 (to 1e-300).
    assertEquals(Math.log(120) - 3000, binomial.logDensity(3, new double[] {10, -1000}, gradient), 1e-12 * 3000);
    assertEquals(3.0, gradient[2], 1e-12);
    assertEquals(-10000.0, binomial.logDensity(10, new double[] {10, -1000}), 1e-12 * 10000);
    assertEquals(0.0, binomial.logDensity(10, new double[] {10, 1000}), 1e-300);
    Parametrisation bernoulli = FamilyCases.parametrisation("bernoulli", "logit_p");
    double[] g = new double[2];
    assertEquals(-1000.0, bernoulli.logDensity(0, new double[] {1000}, g), 1e-12);
    assertEquals(-1.0, g[1], 1e-15);
    assertEquals(0.0, bernoulli.logDensity(1, new double[] {1000}), 1e-300);
  }
}

package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.function.DoubleUnaryOperator;
import org.junit.jupiter.api.Test;

/**
 * The curvature facts that the log-concavity analysis relies on, as a table, and for facts that do
 * not claim concavity a point where the second derivative is positive (computed by second
 * differences and compared with the second derivative the reason states).
 */
class CurvatureTest {
  private static final double U = Double.NaN;

  private static double[] unknown(int n) {
    double[] a = new double[n];
    Arrays.fill(a, U);
    return a;
  }

  private static Curvature value(String family, String[] names, Scale scale, double... known) {
    return FamilyCases.parametrisation(family, names).curvatureInValue(scale, known);
  }

  private static Curvature argument(String family, String[] names, String argument, Scale scale, double... known) {
    Parametrisation p = FamilyCases.parametrisation(family, names);
    return p.curvatureInArgument(p.argumentNames().indexOf(argument), scale, known);
  }

  private static String[] names(String... names) {
    return names;
  }

  @Test
  void normalFacts() {
    String[] sd = names("mean", "sd");
    assertTrue(value("normal", sd, Scale.NATURAL, unknown(2)).concave());
    assertTrue(argument("normal", sd, "mean", Scale.NATURAL, unknown(2)).concave());
    assertTrue(argument("normal", sd, "sd", Scale.LOG, unknown(2)).concave());
    assertFalse(argument("normal", sd, "sd", Scale.NATURAL, unknown(2)).concave());
    String[] precision = names("mean", "precision");
    assertTrue(argument("normal", precision, "precision", Scale.NATURAL, unknown(2)).concave());
    assertTrue(argument("normal", precision, "precision", Scale.LOG, unknown(2)).concave());
    String[] variance = names("mean", "var");
    assertTrue(argument("normal", variance, "var", Scale.LOG, unknown(2)).concave());
    assertFalse(argument("normal", variance, "var", Scale.NATURAL, unknown(2)).concave());
    // On log(value) only when the mean is known to be <= 0.
    assertTrue(value("normal", sd, Scale.LOG, -1, U).concave());
    assertFalse(value("normal", sd, Scale.LOG, 1, U).concave());
    assertFalse(value("normal", sd, Scale.LOG, unknown(2)).concave());
  }

  @Test
  void gammaFacts() {
    String[] rate = names("shape", "rate");
    assertTrue(value("gamma", rate, Scale.NATURAL, 2, U).concave());
    assertTrue(value("gamma", rate, Scale.NATURAL, 1, U).concave());
    assertFalse(value("gamma", rate, Scale.NATURAL, 0.5, U).concave());
    assertFalse(value("gamma", rate, Scale.NATURAL, unknown(2)).concave());
    assertTrue(value("gamma", rate, Scale.LOG, unknown(2)).concave());
    assertTrue(argument("gamma", rate, "rate", Scale.NATURAL, unknown(2)).concave());
    assertTrue(argument("gamma", rate, "rate", Scale.LOG, unknown(2)).concave());
    assertTrue(argument("gamma", rate, "shape", Scale.NATURAL, unknown(2)).concave());
    assertEquals("gamma log-density is concave in u = log(value): shape*u - rate*exp(u), second derivative -rate exp(u) < 0",
        value("gamma", rate, Scale.LOG, unknown(2)).reason());
  }

  @Test
  void countFacts() {
    assertTrue(argument("poisson", names("log_rate"), "log_rate", Scale.NATURAL, U).concave());
    assertTrue(argument("poisson", names("rate"), "rate", Scale.NATURAL, U).concave());
    assertTrue(argument("poisson", names("rate"), "rate", Scale.LOG, U).concave());
    for (String family : new String[] {"binomial", "bernoulli"}) {
      String[] logit = family.equals("binomial") ? names("trials", "logit_p") : names("logit_p");
      String[] p = family.equals("binomial") ? names("trials", "p") : names("p");
      assertTrue(argument(family, logit, "logit_p", Scale.NATURAL, unknown(logit.length)).concave());
      assertTrue(argument(family, p, "p", Scale.NATURAL, unknown(p.length)).concave());
      assertTrue(argument(family, p, "p", Scale.LOGIT, unknown(p.length)).concave());
    }
    assertFalse(value("poisson", names("rate"), Scale.NATURAL, U).concave());
    assertTrue(argument("negative-binomial", names("mean", "size"), "mean", Scale.LOG, U, U).concave());
  }

  @Test
  void betaFacts() {
    String[] ab = names("a", "b");
    assertTrue(value("beta", ab, Scale.NATURAL, 1, 2).concave());
    assertFalse(value("beta", ab, Scale.NATURAL, 0.5, 2).concave());
    assertFalse(value("beta", ab, Scale.NATURAL, U, 2).concave());
    assertTrue(value("beta", ab, Scale.LOGIT, U, U).concave());
    assertTrue(argument("beta", ab, "a", Scale.NATURAL, U, U).concave());
  }

  @Test
  void heavyTailedFamiliesAreNotConcaveInValueOrLocation() {
    String[] t = names("df", "location", "scale");
    assertFalse(value("student-t", t, Scale.NATURAL, unknown(3)).concave());
    assertFalse(argument("student-t", t, "location", Scale.NATURAL, unknown(3)).concave());
    assertTrue(argument("student-t", t, "scale", Scale.LOG, unknown(3)).concave());
    String[] c = names("location", "scale");
    assertFalse(value("cauchy", c, Scale.NATURAL, unknown(2)).concave());
    assertFalse(argument("cauchy", c, "location", Scale.NATURAL, unknown(2)).concave());
  }

  @Test
  void laplaceIsConcaveButSaysItIsNotDifferentiableAtTheKink() {
    String[] ls = names("location", "scale");
    Curvature inValue = value("laplace", ls, Scale.NATURAL, unknown(2));
    assertTrue(inValue.concave());
    assertTrue(inValue.reason().contains("not differentiable"), inValue.reason());
    Curvature inLocation = argument("laplace", ls, "location", Scale.NATURAL, unknown(2));
    assertTrue(inLocation.concave());
    assertTrue(inLocation.reason().contains("derivative-free"), inLocation.reason());
  }

  @Test
  void discreteValuesHaveNoContinuousCurvature() {
    Curvature fact = value("negative-binomial", names("mean", "size"), Scale.NATURAL, unknown(2));
    assertFalse(fact.concave());
    assertTrue(fact.reason().contains("whole number"), fact.reason());
  }

  // Counterexamples: where a fact does not claim concavity, the second derivative it states is
  // positive somewhere, and second differences agree with it.

  private static void assertPositiveSecondDerivative(double stated, DoubleUnaryOperator g, double at, double h) {
    assertTrue(stated > 0, "stated second derivative " + stated);
    assertEquals(stated, Differences.secondDifference(g, at, h), 1e-4 * stated);
  }

  @Test
  void gammaWithShapeBelowOneIsConvexInTheValue() {
    Parametrisation gamma = FamilyCases.parametrisation("gamma", "shape", "rate");
    assertFalse(gamma.curvatureInValue(Scale.NATURAL, new double[] {0.5, 1}).concave());
    // -(shape - 1)/x^2 at shape 0.5, x = 1.
    assertPositiveSecondDerivative(0.5, x -> gamma.logDensity(x, new double[] {0.5, 1}), 1, 1e-4);
  }

  @Test
  void studentTIsConvexInTheValueInItsTails() {
    Parametrisation t = FamilyCases.parametrisation("student-t", "df", "location", "scale");
    double df = 3;
    double z = 3;
    // -(df+1)(df - z^2)/(scale^2 (df + z^2)^2) at df 3, z 3, scale 1: 4 * 6/144.
    double stated = -(df + 1) * (df - z * z) / ((df + z * z) * (df + z * z));
    assertPositiveSecondDerivative(stated, x -> t.logDensity(x, new double[] {df, 0, 1}), z, 1e-4);
    assertFalse(t.curvatureInValue(Scale.NATURAL, new double[] {df, 0, 1}).concave());
  }

  @Test
  void cauchyIsConvexInLocationAwayFromTheValue() {
    Parametrisation cauchy = FamilyCases.parametrisation("cauchy", "location", "scale");
    double z = 3;
    // -2(1 - z^2)/(scale^2 (1 + z^2)^2), the same in location as in the value.
    double stated = -2 * (1 - z * z) / ((1 + z * z) * (1 + z * z));
    assertPositiveSecondDerivative(stated, m -> cauchy.logDensity(0, new double[] {m, 1}), -z, 1e-4);
  }

  @Test
  void normalIsConvexInSdNearTheMean() {
    Parametrisation normal = FamilyCases.parametrisation("normal", "mean", "sd");
    // 1/sd^2 - 3(x - mean)^2/sd^4 at x = mean, sd = 2.
    assertPositiveSecondDerivative(0.25, s -> normal.logDensity(1, new double[] {1, s}), 2, 1e-4);
  }

  @Test
  void negativeBinomialIsConvexInSizeAtZero() {
    Parametrisation nb = FamilyCases.parametrisation("negative-binomial", "mean", "size");
    double mean = 3;
    double size = 2;
    // mean^2/(size (size + mean)^2) at x = 0.
    double stated = mean * mean / (size * (size + mean) * (size + mean));
    assertPositiveSecondDerivative(stated, r -> nb.logDensity(0, new double[] {mean, r}), size, 1e-4);
    assertFalse(nb.curvatureInArgument(1, Scale.NATURAL, unknown(2)).concave());
  }

  @Test
  void betaIsNotConcaveInLogOfItsFirstArgumentNearOne() {
    Parametrisation beta = FamilyCases.parametrisation("beta", "a", "b");
    // At a = 1, b = 2, x -> 1: -(trigamma(1) - trigamma(3)) + (digamma(3) - digamma(1)) = -1.25 + 1.5.
    double x = 1 - 1e-12;
    DoubleUnaryOperator g = u -> beta.logDensity(x, new double[] {Math.exp(u), 2});
    assertEquals(0.25, Differences.secondDifference(g, 0, 1e-4), 1e-4);
    assertFalse(beta.curvatureInArgument(0, Scale.LOG, unknown(2)).concave());
  }

  @Test
  void uniformIsConvexInItsLowerBound() {
    Parametrisation uniform = FamilyCases.parametrisation("uniform", "lower", "upper");
    // 1/(upper - lower)^2 at lower 0, upper 2.
    assertPositiveSecondDerivative(0.25, a -> uniform.logDensity(1.5, new double[] {a, 2}), 0, 1e-4);
    assertFalse(uniform.curvatureInArgument(0, Scale.NATURAL, unknown(2)).concave());
    assertTrue(uniform.curvatureInArgument(1, Scale.LOG, new double[] {0, U}).concave());
  }

  @Test
  void lognormalAndHalfCauchyAreConvexInTheValueFarOut() {
    Parametrisation lognormal = FamilyCases.parametrisation("lognormal", "meanlog", "sdlog");
    double x = Math.exp(3);
    // (1 - 1/sdlog^2 + (log x - meanlog)/sdlog^2)/x^2 at meanlog 0, sdlog 1, log x = 3.
    assertPositiveSecondDerivative(3 / (x * x), v -> lognormal.logDensity(v, new double[] {0, 1}), x, 1e-3);
    Parametrisation halfCauchy = FamilyCases.parametrisation("half-cauchy", "scale");
    // -2(scale^2 - x^2)/(scale^2 + x^2)^2 at scale 1, x = 3: 16/100.
    assertPositiveSecondDerivative(0.16, v -> halfCauchy.logDensity(v, new double[] {1}), 3, 1e-4);
    assertFalse(halfCauchy.curvatureInValue(Scale.NATURAL, new double[] {1}).concave());
    assertTrue(halfCauchy.curvatureInValue(Scale.LOG, new double[] {U}).concave());
  }
}

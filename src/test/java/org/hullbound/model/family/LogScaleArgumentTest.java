package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.math.BigDecimal;
import java.math.MathContext;
import org.apache.commons.math3.special.Gamma;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Every family argument on a log or logit scale ({@code poisson(log_rate)}, {@code
 * binomial(trials, logit_p)}, {@code bernoulli(logit_p)}; no other family has one) is evaluated in
 * log space: at arguments of +-800 and +-1e4, where {@code exp} of the argument overflows or
 * underflows, the log mass and its slope are the closed form's, finite wherever that is.
 */
class LogScaleArgumentTest {

  private static final MathContext DIGITS = MathContext.DECIMAL128;

  /**
   * Poisson log mass x eta - e^eta - lgamma(x + 1) (Johnson, Kemp and Kotz 2005, 4.2), with e^eta
   * from BigDecimal (eta whole): exact to 16 digits where the sum is representable. lgamma from commons-math3.
   */
  private static double poissonReference(double x, double eta) {
    // e to 40 digits (recalled from memory; checked: its double is Math.E), raised to the whole
    // power eta in 34-digit arithmetic; below e^-1000 the rate is below every double's ulp here.
    BigDecimal e = new BigDecimal("2.718281828459045235360287471352662497757");
    BigDecimal rate = eta < -1000 ? BigDecimal.ZERO : e.pow((int) eta, DIGITS);
    return new BigDecimal(x * eta, DIGITS).subtract(rate, DIGITS)
        .subtract(new BigDecimal(Gamma.logGamma(x + 1)), DIGITS).doubleValue();
  }

  @ParameterizedTest(name = "x = {0}, log_rate = {1}")
  @CsvSource({"0, -800", "1, -800", "7, -800", "3, -1e4", "1000, -1e4", "5, -746",
      "0, 700", "12, 700", "0, -3", "4, 2"})
  void poissonLogRateFarBelowAndNearTheOverflowOfExp(double x, double eta) {
    Parametrisation poisson = FamilyCases.parametrisation("poisson", "log_rate");
    double[] gradient = new double[2];
    assertEquals(Math.E, new BigDecimal("2.718281828459045235360287471352662497757").doubleValue());
    double value = poisson.logDensity(x, new double[] {eta}, gradient);
    double expected = poissonReference(x, eta);
    assertEquals(expected, value, 1e-14 * Math.abs(expected) + 1e-300);
    // d/deta = x - e^eta (closed form); e^eta underflows to 0 below -745.
    assertEquals(x - Math.exp(eta), gradient[1], 1e-12 * Math.max(1, Math.abs(gradient[1])));
  }

  @ParameterizedTest(name = "x = {0}, log_rate = {1}")
  @CsvSource({"0, 800", "20, 1e4"})
  void poissonLogRateWhoseMassIsBelowTheSmallestLogIsMinusInfinity(double x, double eta) {
    // -e^800 < -1.8e308: the log mass itself is beyond the range of a double (closed form), so
    // -inf is its correctly rounded value (IEEE 754 overflow rounds to infinity).
    Parametrisation poisson = FamilyCases.parametrisation("poisson", "log_rate");
    assertEquals(Double.NEGATIVE_INFINITY, poisson.logDensity(x, new double[] {eta}));
  }

  @ParameterizedTest(name = "{0}: x = {1} of {2}, logit_p = {3}")
  @CsvSource({
    "binomial, 0, 10, 800", "binomial, 10, 10, -800", "binomial, 3, 10, 1e4",
    "binomial, 3, 10, -1e4", "binomial, 10, 10, 1e4", "binomial, 0, 10, -1e4",
    "bernoulli, 0, 1, 800", "bernoulli, 1, 1, -800", "bernoulli, 1, 1, 1e4",
    "bernoulli, 0, 1, -1e4"
  })
  void logitPAtExtremes(String family, double x, double trials, double eta) {
    // log C(n, x) + x log p + (n - x) log(1 - p) with log p = -log(1 + e^-eta) = -eta^- - ...:
    // for |eta| >= 800, log(1 + e^-|eta|) is below 1e-347 (0 in double), so log p = min(eta, 0)
    // and log(1 - p) = min(-eta, 0) to the last bit (closed form).
    Parametrisation p = family.equals("binomial")
        ? FamilyCases.parametrisation("binomial", "trials", "logit_p")
        : FamilyCases.parametrisation("bernoulli", "logit_p");
    double[] args = family.equals("binomial") ? new double[] {trials, eta} : new double[] {eta};
    double logChoose = Gamma.logGamma(trials + 1) - Gamma.logGamma(x + 1)
        - Gamma.logGamma(trials - x + 1);
    double expected = logChoose + x * Math.min(eta, 0) + (trials - x) * Math.min(-eta, 0);
    double[] gradient = new double[1 + args.length];
    double value = p.logDensity(x, args, gradient);
    assertEquals(expected, value, 1e-12 * Math.max(1, Math.abs(expected)));
    // d/d logit_p = x - trials p, p = 1 or 0 to the last bit here (closed form).
    assertEquals(x - trials * (eta > 0 ? 1 : 0), gradient[args.length], 1e-12);
  }
}

package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.apache.commons.math3.dfp.Dfp;
import org.apache.commons.math3.dfp.DfpField;
import org.apache.commons.math3.dfp.DfpMath;
import org.junit.jupiter.api.Test;

/**
 * Counts near 1e15 (issue 14): the log mass of the binomial, negative binomial and Poisson keeps
 * its differences in the unknown precise, so that the hull's log-concavity check does not read
 * rounding as curvature.
 *
 * <p>Reference: the same differences evaluated in 40-digit decimal arithmetic (commons-math3 {@link
 * Dfp}), from the defining formulas, in which every term constant in the unknown cancels exactly:
 * binomial {@code x log(p1/p0) + (n - x) log(q1/q0)}; negative binomial {@code size log(q1/q0) + x
 * log(r1/r0)} with {@code q = size/(size + mean)}, {@code r = mean/(size + mean)}; Poisson {@code x
 * log(rate1/rate0) - (rate1 - rate0)}. The unknown moves by a posterior standard deviation or so,
 * where the differences are of order 1; the tolerance 1e-6 is a millionth of that. Before the
 * saddle-point form the binomial and negative-binomial differences were off by about 0.06 to 0.13
 * (the ulp of 1e15 terms); the Poisson log mass was already in that form, and its check keeps it.
 */
class HugeCountPrecisionTest {
  private static final DfpField FIELD = new DfpField(40);
  private static final double TOLERANCE = 1e-6;

  private static Dfp big(double value) {
    return FIELD.newDfp(value);
  }

  private static Dfp log(Dfp value) {
    return DfpMath.log(value);
  }

  /** expit(u) = 1 / (1 + exp(-u)) in 40 digits. */
  private static Dfp expit(double u) {
    return FIELD.getOne().divide(FIELD.getOne().add(DfpMath.exp(big(-u))));
  }

  private static Dfp binomialDifference(double x, double n, Dfp p0, Dfp p1) {
    Dfp one = FIELD.getOne();
    return big(x).multiply(log(p1.divide(p0)))
        .add(big(n - x).multiply(log(one.subtract(p1).divide(one.subtract(p0)))));
  }

  @Test
  void binomialInPAt1e15Trials() {
    Parametrisation binomial = FamilyCases.parametrisation("binomial", "trials", "p");
    double n = 1e15;
    double x = 3e14 + 12345;
    double sd = Math.sqrt(0.3 * 0.7 / n);
    double p0 = x / n;
    for (double step : new double[] {-2.5, -1, -0.3, 0.3, 1, 2.5}) {
      double p1 = p0 + step * sd;
      double reference = binomialDifference(x, n, big(p0), big(p1)).toDouble();
      double difference =
          binomial.logDensity(x, new double[] {n, p1}) - binomial.logDensity(x, new double[] {n, p0});
      assertEquals(reference, difference, TOLERANCE, () -> "p moved by " + step + " sd");
    }
  }

  @Test
  void binomialInLogitAt1e15Trials() {
    Parametrisation binomial = FamilyCases.parametrisation("binomial", "trials", "logit_p");
    double n = 1e15;
    // the seedlings tray of issue 14 (16 of 1e15) and a tray near a half
    for (double x : new double[] {16, 5e14 - 777}) {
      double u0 = Math.log(x / (n - x));
      double sd = 1 / Math.sqrt(n * (x / n) * (1 - x / n));
      for (double step : new double[] {-2, -0.5, 0.5, 2}) {
        double u1 = u0 + step * sd;
        double reference = binomialDifference(x, n, expit(u0), expit(u1)).toDouble();
        double difference =
            binomial.logDensity(x, new double[] {n, u1}) - binomial.logDensity(x, new double[] {n, u0});
        assertEquals(reference, difference, TOLERANCE, () -> "x = " + x + ", logit moved by " + step + " sd");
      }
    }
  }

  @Test
  void negativeBinomialInMeanAt1e15() {
    Parametrisation nb = FamilyCases.parametrisation("negative-binomial", "mean", "size");
    double size = 1e15;
    double x = 2e15 + 4321;
    // variance mean + mean^2/size = 6e15 at mean 2e15
    double sd = Math.sqrt(x + x * x / size);
    for (double step : new double[] {-2, -0.5, 0.5, 2}) {
      double mean1 = x + step * sd;
      Dfp s = big(size);
      Dfp m0 = big(x);
      Dfp m1 = big(mean1);
      Dfp reference =
          s.multiply(log(s.add(m0).divide(s.add(m1))))
              .add(big(x).multiply(log(m1.divide(s.add(m1)).divide(m0.divide(s.add(m0))))));
      double difference =
          nb.logDensity(x, new double[] {mean1, size}) - nb.logDensity(x, new double[] {x, size});
      assertEquals(reference.toDouble(), difference, TOLERANCE, () -> "mean moved by " + step + " sd");
    }
  }

  @Test
  void poissonInRateAt1e15() {
    Parametrisation poisson = FamilyCases.parametrisation("poisson", "rate");
    double x = 1e15 + 99;
    double sd = Math.sqrt(x);
    for (double step : new double[] {-2, -0.5, 0.5, 2}) {
      double rate1 = x + step * sd;
      Dfp reference =
          big(x).multiply(log(big(rate1).divide(big(x)))).subtract(big(rate1).subtract(big(x)));
      double difference =
          poisson.logDensity(x, new double[] {rate1}) - poisson.logDensity(x, new double[] {x});
      assertEquals(reference.toDouble(), difference, TOLERANCE, () -> "rate moved by " + step + " sd");
    }
  }
}

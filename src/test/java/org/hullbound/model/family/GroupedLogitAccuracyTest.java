package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The logit binomial's group kernel ({@link AffineRows#accumulateGroups} and its factored form
 * {@link AffineRows#accumulateFactoredGroups}) takes {@code log(1 + e)} by {@code Math.log} and,
 * factored, {@code e = exp(-|eta|)} as a product of exponentials: absolute, not relative, accuracy
 * where {@code log1p(e)} is tiny. Its comment bounds the error of a group by {@code sum(trials)
 * 2^-50} beyond the rounding of {@code sum(y) |eta|}; these checks hold it to that bound against
 * the group's log mass written out with the JDK's {@link StrictMath} ({@code log1p} and {@code
 * exp}, fdlibm: within one ulp), {@code -(sum(y) softplus(-eta) + sum(trials - y)
 * softplus(eta))} with {@code softplus(t) = max(t, 0) + log1p(exp(-|t|))} (common practice: the
 * log-sum-exp form of {@code log(1 + e^t)}), and its slope {@code sum(y) - sum(trials)
 * expit(eta)}, at ordinary and extreme {@code eta} (up to 1e4, where {@code e} underflows), for
 * groups that are all successes, all failures and mixed.
 */
class GroupedLogitAccuracyTest {
  private static final double BOUND = Math.scalb(1.0, -50);
  private static final AffineRows BERNOULLI =
      FamilyCases.parametrisation("bernoulli", "logit_p").affineRows(0);
  private static final AffineRows BINOMIAL =
      FamilyCases.parametrisation("binomial", "trials", "logit_p").affineRows(1);

  /** Group log mass by the reference formula. */
  private static double reference(double eta, double sumY, double sumTrials) {
    return -(sumY * softplus(-eta) + (sumTrials - sumY) * softplus(eta));
  }

  private static double softplus(double t) {
    return Math.max(t, 0) + StrictMath.log1p(StrictMath.exp(-Math.abs(t)));
  }

  private static double referenceSlope(double eta, double sumY, double sumTrials) {
    double expit = eta >= 0 ? 1 / (1 + StrictMath.exp(-eta))
        : StrictMath.exp(eta) / (1 + StrictMath.exp(eta));
    return sumY - sumTrials * expit;
  }

  /**
   * One group, intercept {@code a} and slope {@code b} at {@code x}, evaluated by the kernel
   * (factored when {@code factored}, its factors worked out as the compiled conditional does);
   * returns value and slope.
   */
  private static double[] kernel(AffineRows rows, double a, double b, double x, double sumY,
      double sumTrials, boolean factored) {
    // parts: 0 the value, then the arguments (a binomial's trials first); logit_p is the last
    int parts = rows == BERNOULLI ? 2 : 3;
    double[][] intercepts = new double[parts][];
    double[][] slopes = new double[parts][];
    int[] strides = new int[parts];
    for (int p = 0; p < parts; p++) {
      intercepts[p] = new double[] {p == parts - 1 ? a : 1};
      slopes[p] = new double[] {p == parts - 1 ? b : 0};
    }
    double[] statistics = {sumY, sumTrials, 0};
    double[] sums = new double[2];
    if (factored) {
      double up = Math.exp(a);
      double[] groupExponentials = {up, 1 / up};
      double bx = b * x;
      double upClass = Math.exp(bx);
      double[] classExponentials = {upClass, 1 / upClass, b};
      rows.accumulateFactoredGroups(x, intercepts, strides, slopes, strides, new int[] {0}, 1,
          statistics, groupExponentials, new int[] {0}, classExponentials, sums);
    } else {
      rows.accumulateGroups(x, intercepts, strides, slopes, strides, new int[] {0}, 1,
          statistics, sums);
    }
    return sums;
  }

  private static void withinBound(AffineRows rows, double a, double b, double x, double sumY,
      double sumTrials) {
    double eta = a + b * x;
    double expected = reference(eta, sumY, sumTrials);
    double expectedSlope = referenceSlope(eta, sumY, sumTrials) * b;
    // the group's own rounding: of sum(y) |eta| (and of the reference's sum), a few ulps of it
    double rounding = 4 * Math.ulp(Math.abs(sumY * eta) + Math.abs((sumTrials - sumY) * eta)
        + sumTrials);
    for (boolean factored : new boolean[] {false, true}) {
      if (factored && !(Math.abs(a) <= 700 && Math.abs(b * x) <= 700)) {
        continue; // the conditional never factors there
      }
      double[] got = kernel(rows, a, b, x, sumY, sumTrials, factored);
      String at = (factored ? "factored " : "") + "eta " + eta + ", sum(y) " + sumY + " of "
          + sumTrials;
      assertEquals(expected, got[0], sumTrials * BOUND + rounding, () -> "value at " + at);
      assertEquals(expectedSlope, got[1], (sumTrials * BOUND + 4 * Math.ulp(sumTrials))
          * Math.abs(b), () -> "slope at " + at);
    }
  }

  @Test
  void bernoulliGroupsWithinTheBoundAtOrdinaryAndExtremeEta() {
    AffineRows rows = BERNOULLI;
    assertTrue(rows.factorsGroups());
    int checked = 0;
    for (double eta : new double[] {0, 1e-300, -1e-12, 0.5, -2, 20, -36, 37, 40, -40, 100, -300,
        700, -745, 1e4, -1e4}) {
      for (double[] counts : new double[][] {{0, 1}, {1, 1}, {0, 3}, {3, 3}, {2, 4}, {0, 100},
          {100, 100}, {37, 100}}) {
        // eta as a + b x three ways: all intercept, all slope, split between them
        withinBound(rows, eta, 1.0, 0.0, counts[0], counts[1]);
        withinBound(rows, 0.0, 2.0, eta / 2, counts[0], counts[1]);
        withinBound(rows, eta / 3, 0.5, 4 * eta / 3, counts[0], counts[1]);
        checked++;
      }
    }
    assertEquals(16 * 8, checked);
  }

  @Test
  void binomialGroupsWithinTheBoundOnSeededPredictors() {
    AffineRows rows = BINOMIAL;
    assertTrue(rows.factorsGroups());
    SplittableRandom random = new SplittableRandom(20261203L);
    for (int i = 0; i < 20_000; i++) {
      double scale = i % 3 == 0 ? 1 : i % 3 == 1 ? 10 : 300;
      double a = scale * (2 * random.nextDouble() - 1);
      double b = 2 * random.nextDouble() - 1;
      double x = scale * (2 * random.nextDouble() - 1);
      double trials = 1 + random.nextInt(100);
      double successes = random.nextInt((int) trials + 1);
      withinBound(rows, a, b, x, successes, trials);
    }
  }

  /** log1p's relative accuracy is not kept, only the absolute: tiny softplus values may vanish. */
  @Test
  void aGroupOfCertainSuccessesIsWithinTheBoundNotRelatively() {
    double[] got = kernel(BERNOULLI, 40, 1, 0, 3, 3, false);
    double expected = reference(40, 3, 3); // -3 log1p(e^-40), about -1.3e-17
    assertTrue(Math.abs(got[0] - expected) <= 3 * BOUND, "within the absolute bound");
    assertTrue(expected < 0 && expected > -1e-16, "the case is one of a tiny log mass");
  }
}

package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The central goodness-of-fit suite, in the style of Commons RNG's sampler tests: every target, in
 * both forms, against a reference distribution function from outside the project (commons-math3
 * 3.6.1 distributions; error-function CDFs for truncated normals).
 *
 * <p>Each case makes one sampler and runs {@value #REPLICATES} Kolmogorov-Smirnov tests (commons-math3
 * {@code KolmogorovSmirnovTest}) on consecutive samples of {@value #SAMPLE_SIZE} draws at level
 * alpha = {@value #ALPHA}, and fails only when more than {@value #ALLOWED_FAILURES} of them reject.
 *
 * <p>False-alarm rate of one case for an exact sampler: the count of rejections is Binomial(10,
 * 0.01), so P(count &gt;= 4) = sum over k &gt;= 4 of C(10, k) 0.01^k 0.99^(10 - k) = 1.98e-6 (the
 * k = 4 term, 210 * 1e-8 * 0.99^6 = 1.977e-6, is nearly all of it); over the {@code 2 * 11} cases
 * 4.4e-5. Seeds are fixed, so the outcome is reproducible.
 *
 * <p>Power: at n = 5000 the KS critical distance for alpha = 0.01 is 1.628 / sqrt(n) = 0.023
 * (asymptotic Kolmogorov quantile, common practice). A sampler whose CDF is off by 0.04 somewhere
 * has, at that point, an empirical CDF with standard deviation at most 0.5 / sqrt(n) = 0.0071, so
 * each test rejects with probability above P(Z &gt; -2.4) = 0.99 and 4 or more of 10 reject with
 * probability above 0.99999. (Checked by hand once: a reference normal with a 25% wider sd, a CDF
 * error of about 0.05, made both normal cases fail with 10 of 10 rejections.)
 */
class GoodnessOfFitSuiteTest {

  static final int REPLICATES = 10;
  static final int SAMPLE_SIZE = 5000;
  static final double ALPHA = 0.01;
  static final int ALLOWED_FAILURES = 3;

  static Stream<Arguments> cases() {
    List<Target> targets =
        List.of(
            Target.normal(1.5, 2.0),
            Target.gamma(1.0, 2.0),
            Target.gamma(2.5, 1.5),
            Target.gamma(30.0, 0.1),
            Target.beta(1.0, 1.0),
            Target.beta(2.0, 5.0),
            Target.beta(1.0, 3.0),
            Target.logistic(0.5, 1.2),
            Target.gumbel(1.0, 2.0),
            Target.truncatedNormal(0.0, 1.0, Support.between(-1.0, 2.0)),
            Target.truncatedNormal(2.0, 1.5, Support.above(1.0)));
    List<Arguments> cases = new ArrayList<>();
    long seed = 20240611L;
    for (Target target : targets) {
      cases.add(Arguments.of(target, false, seed++));
      cases.add(Arguments.of(target, true, seed++));
    }
    return cases.stream();
  }

  @ParameterizedTest(name = "{0}, derivative-free {1}")
  @MethodSource("cases")
  void samplesFollowTheReferenceDistribution(Target target, boolean derivativeFree, long seed) {
    RandomGenerator rng = RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
    AdaptiveRejectionSampler sampler = target.sampler(derivativeFree, HullOptions.defaults());
    CdfReference reference = target.reference();
    int failures = 0;
    StringBuilder pValues = new StringBuilder();
    for (int r = 0; r < REPLICATES; r++) {
      double[] draws = new double[SAMPLE_SIZE];
      sampler.sample(rng, draws);
      double p = reference.ksPValue(draws);
      pValues.append(String.format(" %.3g", p));
      if (p < ALPHA) {
        failures++;
      }
    }
    assertTrue(
        failures <= ALLOWED_FAILURES,
        target + ": " + failures + " of " + REPLICATES + " KS tests rejected at " + ALPHA
            + "; p-values" + pValues + "; " + sampler.statistics());
  }
}

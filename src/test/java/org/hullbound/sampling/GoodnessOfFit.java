package org.hullbound.sampling;

import java.util.Arrays;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.distribution.RealDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;

/**
 * Goodness-of-fit helpers for the statistical tests; the reference null distribution of the
 * Kolmogorov-Smirnov statistic is commons-math3's {@link KolmogorovSmirnovTest}.
 *
 * <p>Power of a one-sample KS test of n draws at level 1e-5 (critical distance about
 * sqrt(-ln(1e-5 / 2) / 2) / sqrt(n) = 2.47 / sqrt(n), Smirnov's limit law as tabulated in
 * commons-math3): if the true CDF differs from the reference by delta at some point, the empirical
 * CDF there has standard deviation at most 0.5 / sqrt(n), so the test rejects with probability at
 * least 0.99 once delta >= (2.47 + 2.33 * 0.5) / sqrt(n) = 3.64 / sqrt(n) (normal approximation to
 * the binomial count). The level is 1e-5 so that the package's checks add little to the
 * false-alarm rate of the whole build (DEVELOPERS.md, Tests); sample sizes are 1.6 times what
 * level 0.001 needed, which keeps each test's power.
 */
final class GoodnessOfFit {
  /** The level used by every KS check in this package. */
  static final double LEVEL = 1e-5;

  private GoodnessOfFit() {}

  /** The KS statistic sup |F_n - F| of {@code sample} against {@code cdf}. */
  static double ksStatistic(double[] sample, DoubleUnaryOperator cdf) {
    double[] sorted = sample.clone();
    Arrays.sort(sorted);
    int n = sorted.length;
    double d = 0;
    for (int i = 0; i < n; i++) {
      double f = cdf.applyAsDouble(sorted[i]);
      d = Math.max(d, Math.max((i + 1.0) / n - f, f - (double) i / n));
    }
    return d;
  }

  /** The KS p-value of {@code sample} against {@code cdf} (continuous). */
  static double ksPValue(double[] sample, DoubleUnaryOperator cdf) {
    double d = ksStatistic(sample, cdf);
    return 1.0 - new KolmogorovSmirnovTest().cdf(d, sample.length);
  }

  /** The KS p-value of {@code sample} against a commons-math3 distribution. */
  static double ksPValue(double[] sample, RealDistribution reference) {
    return ksPValue(sample, reference::cumulativeProbability);
  }

  /** The critical KS distance near the test level, for failure messages: 2.47 / sqrt(n). */
  static double criticalDistance(int n) {
    return 2.468 / Math.sqrt(n);
  }
}

package org.hullbound.hull;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.distribution.AbstractRealDistribution;
import org.apache.commons.math3.special.Erf;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;

/**
 * A distribution known only by its distribution function, for commons-math3's {@link
 * KolmogorovSmirnovTest}, which reads nothing but {@code cumulativeProbability}.
 */
final class CdfReference extends AbstractRealDistribution {

  private static final long serialVersionUID = 1L;
  private static final KolmogorovSmirnovTest KS = new KolmogorovSmirnovTest();

  private final transient DoubleUnaryOperator cdf;

  private CdfReference(DoubleUnaryOperator cdf) {
    super(null);
    this.cdf = cdf;
  }

  static CdfReference of(DoubleUnaryOperator cdf) {
    return new CdfReference(cdf);
  }

  /**
   * The normal(mean, sd) truncated to [a, b], its CDF from complementary error functions
   * (commons-math3 {@link Erf#erfc}) on the side that avoids cancellation: for a window above the
   * mean, (Q(a) - Q(x)) / (Q(a) - Q(b)) with Q the upper tail.
   */
  static CdfReference truncatedNormal(double mean, double sd, double a, double b) {
    double za = (a - mean) / sd;
    double zb = (b - mean) / sd;
    if (za >= 0) {
      double qa = upperTail(za);
      double qb = upperTail(zb);
      return of(x -> x <= a ? 0 : x >= b ? 1 : (qa - upperTail((x - mean) / sd)) / (qa - qb));
    }
    double pa = lowerTail(za);
    double pb = lowerTail(zb);
    return of(x -> x <= a ? 0 : x >= b ? 1 : (lowerTail((x - mean) / sd) - pa) / (pb - pa));
  }

  /** Q(z) = P(Z &gt; z) = erfc(z / sqrt 2) / 2. */
  static double upperTail(double z) {
    return z == Double.POSITIVE_INFINITY ? 0 : 0.5 * Erf.erfc(z / Math.sqrt(2));
  }

  /** Phi(z) = P(Z &lt;= z) = erfc(-z / sqrt 2) / 2. */
  static double lowerTail(double z) {
    return z == Double.POSITIVE_INFINITY ? 1 : 0.5 * Erf.erfc(-z / Math.sqrt(2));
  }

  /** The KS p-value of {@code data} against this distribution (commons-math3). */
  double ksPValue(double[] data) {
    return KS.kolmogorovSmirnovTest(this, data);
  }

  @Override
  public double cumulativeProbability(double x) {
    return cdf.applyAsDouble(x);
  }

  @Override
  public double density(double x) {
    throw new UnsupportedOperationException("only the CDF is known");
  }

  @Override
  public double getNumericalMean() {
    return Double.NaN;
  }

  @Override
  public double getNumericalVariance() {
    return Double.NaN;
  }

  @Override
  public double getSupportLowerBound() {
    return Double.NEGATIVE_INFINITY;
  }

  @Override
  public double getSupportUpperBound() {
    return Double.POSITIVE_INFINITY;
  }

  @Override
  @SuppressWarnings("deprecation")
  public boolean isSupportLowerBoundInclusive() {
    return false;
  }

  @Override
  @SuppressWarnings("deprecation")
  public boolean isSupportUpperBoundInclusive() {
    return false;
  }

  @Override
  public boolean isSupportConnected() {
    return true;
  }
}

package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.junit.jupiter.api.Test;

/**
 * The block draw against the closed form N(Q^-1 b, Q^-1), with the inverse, the mean and the
 * whitening factor computed independently by commons-math3 (LU and Cholesky decompositions).
 */
class CanonicalNormalTest {
  private static final double[][] PRECISION = {
    {4.0, 1.2, -0.6},
    {1.2, 2.5, 0.4},
    {-0.6, 0.4, 1.1},
  };
  private static final double[] LINEAR = {1.0, -2.0, 0.5};

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  @Test
  void meanAndCovarianceMatchTheInverseOfThePrecision() {
    RealMatrix inverse =
        new LUDecomposition(new Array2DRowRealMatrix(PRECISION)).getSolver().getInverse();
    RealVector mean = inverse.operate(new ArrayRealVector(LINEAR));
    CanonicalNormal normal = CanonicalNormal.of(PRECISION, LINEAR);
    assertArrayEquals(mean.toArray(), normal.mean(), 1e-12);
    double[][] covariance = normal.covariance();
    for (int i = 0; i < 3; i++) {
      assertArrayEquals(inverse.getRow(i), covariance[i], 1e-12, "row " + i);
    }
  }

  /**
   * n = 32000 draws (seed 11), whitened with commons-math3's Cholesky factor C of the true
   * covariance: y = C^-1 (x - mean) must be N(0, I). Checks at level 1e-5 each:
   * (a) n |ybar|^2 ~ chi-square(3) (Hotelling with known covariance);
   * (b) KS of each whitened coordinate against N(0, 1);
   * (c) KS of (y_i + y_j) / sqrt(2) against N(0, 1), which fails when coordinates correlate.
   * Seven tests at 1e-5 give a false-alarm rate below 7e-5; a covariance off by 5% in one entry
   * shifts (b) or (c) by ~2.5% in sd, which KS with n = 32000 detects with power above 0.9 (its
   * critical distance 2.47 / sqrt(n) equals that of 20000 draws at 0.001).
   */
  @Test
  void manyDrawsWhitenToIndependentStandardNormals() {
    RealMatrix covariance =
        new LUDecomposition(new Array2DRowRealMatrix(PRECISION)).getSolver().getInverse();
    RealVector mean = covariance.operate(new ArrayRealVector(LINEAR));
    RealMatrix lowerInverse =
        new LUDecomposition(new CholeskyDecomposition(covariance, 1e-12, 1e-12).getL())
            .getSolver()
            .getInverse();
    CanonicalNormal normal = CanonicalNormal.of(PRECISION, LINEAR);
    int n = 32_000;
    double[][] whitened = new double[3][n];
    double[] draw = new double[3];
    RandomGenerator rng = rng(11);
    double[] sum = new double[3];
    for (int k = 0; k < n; k++) {
      normal.draw(rng, draw);
      RealVector y = lowerInverse.operate(new ArrayRealVector(draw).subtract(mean));
      for (int i = 0; i < 3; i++) {
        whitened[i][k] = y.getEntry(i);
        sum[i] += y.getEntry(i);
      }
    }
    double hotelling = 0;
    for (int i = 0; i < 3; i++) {
      hotelling += sum[i] * sum[i] / n;
    }
    double pHotelling = 1 - new ChiSquaredDistribution(3).cumulativeProbability(hotelling);
    assertTrue(pHotelling > 1e-5, "Hotelling p = " + pHotelling);
    KolmogorovSmirnovTest ks = new KolmogorovSmirnovTest();
    NormalDistribution standard = new NormalDistribution(null, 0, 1);
    for (int i = 0; i < 3; i++) {
      double p = ks.kolmogorovSmirnovTest(standard, whitened[i]);
      assertTrue(p > 1e-5, "coordinate " + i + " KS p = " + p);
      for (int j = i + 1; j < 3; j++) {
        double[] mixed = new double[n];
        for (int k = 0; k < n; k++) {
          mixed[k] = (whitened[i][k] + whitened[j][k]) / Math.sqrt(2);
        }
        double pMixed = ks.kolmogorovSmirnovTest(standard, mixed);
        assertTrue(pMixed > 1e-5, "pair " + i + "," + j + " KS p = " + pMixed);
      }
    }
  }

  @Test
  void oneDimensionIsTheScalarNormalCompletingTheSquare() {
    // Q = 4, b = 2: N(b / Q, 1 / Q) = N(0.5, 0.25) (completing the square, common practice).
    CanonicalNormal normal = CanonicalNormal.of(new double[][] {{4}}, new double[] {2});
    assertEquals(0.5, normal.mean()[0], 1e-15);
    assertEquals(0.25, normal.covariance()[0][0], 1e-15);
  }

  @Test
  void theSameSeedGivesTheSameDraws() {
    CanonicalNormal normal = CanonicalNormal.of(PRECISION, LINEAR);
    assertArrayEquals(normal.draw(rng(3)), normal.draw(rng(3)));
  }

  @Test
  void hugeAndTinyScalesStayAccurate() {
    // Diagonal precision: the mean is b_i / q_i and the variance 1 / q_i exactly.
    double[][] q = {{1e12, 0}, {0, 1e-12}};
    CanonicalNormal normal = CanonicalNormal.of(q, new double[] {3e12, 5e-12});
    assertArrayEquals(new double[] {3, 5}, normal.mean(), 1e-9);
    assertEquals(1e-12, normal.covariance()[0][0], 1e-24);
    assertEquals(1e12, normal.covariance()[1][1], 1e3);
  }

  @Test
  void aMatrixThatIsNotPositiveDefiniteFailsWithATypedError() {
    double[][] indefinite = {{1, 2}, {2, 1}};
    NotPositiveDefiniteException e =
        assertThrows(
            NotPositiveDefiniteException.class,
            () -> CanonicalNormal.of(indefinite, new double[] {0, 0}));
    assertTrue(e.getMessage().contains("positive definite"));
    assertThrows(
        NotPositiveDefiniteException.class,
        () -> CanonicalNormal.of(new double[][] {{1, 1}, {1, 1}}, new double[] {0, 0}));
    assertThrows(
        NotPositiveDefiniteException.class,
        () -> CanonicalNormal.of(new double[][] {{0}}, new double[] {1}));
  }

  @Test
  void badShapesAndValuesAreRejectedNamingTheArgument() {
    assertTrue(
        assertThrows(
                IllegalArgumentException.class,
                () -> CanonicalNormal.of(new double[][] {{1, 0}, {0.5, 1}}, new double[] {0, 0}))
            .getMessage()
            .contains("symmetric"));
    assertTrue(
        assertThrows(
                IllegalArgumentException.class,
                () -> CanonicalNormal.of(new double[][] {{1}}, new double[] {0, 0}))
            .getMessage()
            .contains("precision"));
    assertTrue(
        assertThrows(
                IllegalArgumentException.class,
                () -> CanonicalNormal.of(new double[][] {{Double.NaN}}, new double[] {0}))
            .getMessage()
            .contains("finite"));
    assertTrue(
        assertThrows(
                IllegalArgumentException.class,
                () -> CanonicalNormal.of(new double[][] {{1}}, new double[] {Double.POSITIVE_INFINITY}))
            .getMessage()
            .contains("linear"));
  }
}

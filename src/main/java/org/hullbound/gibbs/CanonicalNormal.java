package org.hullbound.gibbs;

import java.util.random.RandomGenerator;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.ejml.dense.row.decomposition.TriangularSolver_DDRM;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;

/**
 * The multivariate normal N(Q^-1 b, Q^-1) given in canonical form by a precision matrix Q and a
 * linear term b: the full conditional of a coefficient block with a normal prior and a normal
 * likelihood.
 *
 * <p>Drawn through the Cholesky factor Q = L L^T without ever forming Q^-1 (Rue 2001, "Fast sampling
 * of Gaussian Markov random fields", JRSS B 63, algorithm 2): (1) factor Q; (2) solve L w = b and
 * L^T m = w for the mean m; (3) draw z ~ N(0, I) and solve L^T v = z; (4) return m + v. Uses one
 * standard normal ({@link RandomGenerator#nextGaussian()}) per coordinate.
 */
public final class CanonicalNormal {
  private final int dimension;
  private final DMatrixRMaj lower;
  private final double[] mean;

  private CanonicalNormal(DMatrixRMaj lower, double[] mean) {
    this.dimension = mean.length;
    this.lower = lower;
    this.mean = mean;
  }

  /**
   * Factors {@code precision} (square, symmetric, positive definite; copied) with linear term
   * {@code linear}.
   *
   * @throws NotPositiveDefiniteException when the Cholesky factorisation fails
   * @throws IllegalArgumentException on mismatched sizes, asymmetry or non-finite entries
   */
  public static CanonicalNormal of(double[][] precision, double[] linear) {
    if (precision == null || linear == null) {
      throw new IllegalArgumentException("precision and linear must not be null");
    }
    int n = linear.length;
    if (n == 0) {
      throw new IllegalArgumentException("linear must have at least one entry");
    }
    if (precision.length != n) {
      throw new IllegalArgumentException(
          "precision must be " + n + " x " + n + " to match linear, got " + precision.length + " rows");
    }
    DMatrixRMaj q = new DMatrixRMaj(n, n);
    for (int i = 0; i < n; i++) {
      if (precision[i].length != n) {
        throw new IllegalArgumentException(
            "precision row " + i + " must have " + n + " entries, got " + precision[i].length);
      }
      if (!Double.isFinite(linear[i])) {
        throw new IllegalArgumentException("linear[" + i + "] must be finite, got " + linear[i]);
      }
      for (int j = 0; j < n; j++) {
        double entry = precision[i][j];
        if (!Double.isFinite(entry)) {
          throw new IllegalArgumentException(
              "precision[" + i + "][" + j + "] must be finite, got " + entry);
        }
        q.set(i, j, entry);
      }
    }
    for (int i = 0; i < n; i++) {
      for (int j = 0; j < i; j++) {
        double a = precision[i][j];
        double b = precision[j][i];
        if (Math.abs(a - b) > 1e-10 * Math.max(1.0, Math.max(Math.abs(a), Math.abs(b)))) {
          throw new IllegalArgumentException(
              "precision must be symmetric, got [" + i + "][" + j + "] = " + a + " but ["
                  + j + "][" + i + "] = " + b);
        }
      }
    }
    // Step 1: Q = L L^T.
    CholeskyDecomposition_F64<DMatrixRMaj> cholesky = DecompositionFactory_DDRM.chol(n, true);
    if (!cholesky.decompose(q)) {
      throw new NotPositiveDefiniteException(
          "precision matrix of size " + n + " is not positive definite (Cholesky factorisation failed)");
    }
    DMatrixRMaj lower = cholesky.getT(null);
    for (int i = 0; i < n; i++) {
      double pivot = lower.get(i, i);
      if (!(pivot > 0) || !Double.isFinite(pivot)) {
        throw new NotPositiveDefiniteException(
            "precision matrix is not positive definite: Cholesky pivot " + i + " is " + pivot);
      }
    }
    // Step 2: L w = b, then L^T m = w.
    double[] mean = linear.clone();
    TriangularSolver_DDRM.solveL(lower.data, mean, n);
    TriangularSolver_DDRM.solveTranL(lower.data, mean, n);
    for (int i = 0; i < n; i++) {
      if (!Double.isFinite(mean[i])) {
        throw new NotPositiveDefiniteException(
            "precision matrix is numerically singular: mean[" + i + "] = " + mean[i]);
      }
    }
    return new CanonicalNormal(lower, mean);
  }

  public int dimension() {
    return dimension;
  }

  /** The mean Q^-1 b. */
  public double[] mean() {
    return mean.clone();
  }

  /** The covariance Q^-1, formed explicitly (for tests and reports, not for drawing). */
  public double[][] covariance() {
    DMatrixRMaj inverse = new DMatrixRMaj(dimension, dimension);
    DMatrixRMaj lowerInverse = lower.copy();
    TriangularSolver_DDRM.invertLower(lowerInverse.data, dimension);
    CommonOps_DDRM.multTransA(lowerInverse, lowerInverse, inverse);
    double[][] out = new double[dimension][dimension];
    for (int i = 0; i < dimension; i++) {
      for (int j = 0; j < dimension; j++) {
        out[i][j] = inverse.get(i, j);
      }
    }
    return out;
  }

  /** One draw, written into {@code out} (length {@link #dimension()}). */
  public void draw(RandomGenerator rng, double[] out) {
    if (out.length != dimension) {
      throw new IllegalArgumentException("out must have " + dimension + " entries, got " + out.length);
    }
    // Step 3: z ~ N(0, I), L^T v = z, so that Cov(v) = L^-T L^-1 = Q^-1.
    for (int i = 0; i < dimension; i++) {
      out[i] = rng.nextGaussian();
    }
    TriangularSolver_DDRM.solveTranL(lower.data, out, dimension);
    // Step 4: shift by the mean.
    for (int i = 0; i < dimension; i++) {
      out[i] += mean[i];
    }
  }

  /** One draw as a new array. */
  public double[] draw(RandomGenerator rng) {
    double[] out = new double[dimension];
    draw(rng, out);
    return out;
  }
}

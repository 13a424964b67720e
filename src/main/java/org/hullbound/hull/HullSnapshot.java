package org.hullbound.hull;

/**
 * A read-only copy of a sampler's hull and squeeze at one moment: evaluate them at any x, read the
 * segment masses.
 *
 * <p>Lets property tests check hull &gt;= h &gt;= squeeze and plots show the envelope without
 * reaching into the sampler (Gilks and Wild 1992, figure 1 shows such a picture).
 */
public final class HullSnapshot {

  private final double[] abscissae;
  private final double[] values;
  /** Package-private so that tests in this package can draw from the envelope alone. */
  final PiecewiseExponential pieces;

  private HullSnapshot(double[] abscissae, double[] values, PiecewiseExponential pieces) {
    this.abscissae = abscissae;
    this.values = values;
    this.pieces = pieces;
  }

  static HullSnapshot of(double[] xs, double[] hs, int k, PiecewiseExponential pieces) {
    double[] x = new double[k];
    double[] h = new double[k];
    System.arraycopy(xs, 0, x, 0, k);
    System.arraycopy(hs, 0, h, 0, k);
    return new HullSnapshot(x, h, pieces.copy());
  }

  /** The abscissae, sorted. */
  public double[] abscissae() {
    return abscissae.clone();
  }

  /** h at the abscissae. */
  public double[] logDensityValues() {
    return values.clone();
  }

  /** Number of exponential segments of the hull. */
  public int segmentCount() {
    return pieces.size;
  }

  /** Lower end of segment {@code i}. */
  public double segmentLower(int i) {
    return pieces.left[checkIndex(i)];
  }

  /** Upper end of segment {@code i}. */
  public double segmentUpper(int i) {
    return pieces.right[checkIndex(i)];
  }

  /** Slope of the hull on segment {@code i}. */
  public double segmentSlope(int i) {
    return pieces.slope[checkIndex(i)];
  }

  /** log of each segment's mass, the integral of exp(envelope) over it. */
  public double[] logSegmentMasses() {
    double[] masses = new double[pieces.size];
    for (int j = 0; j < pieces.size; j++) {
      masses[j] = pieces.reference + pieces.logMass[j];
    }
    return masses;
  }

  /** log of the envelope's total mass. */
  public double logTotalMass() {
    return pieces.reference + pieces.logScale + Math.log(pieces.total);
  }

  /**
   * The upper envelope the sampler draws from at x: the hull u(x), raised to the top of its segment
   * on segments drawn from uniformly (see {@link #isUniformSegment(int)}); -inf outside the support.
   */
  public double logHull(double x) {
    int j = pieces.pieceOf(x);
    return j < 0 ? Double.NEGATIVE_INFINITY : pieces.reference + pieces.envelope(j, x);
  }

  /** The piecewise-linear hull u(x) of tangents (or secants) itself; -inf outside the support. */
  public double logLinearHull(double x) {
    int j = pieces.pieceOf(x);
    return j < 0
        ? Double.NEGATIVE_INFINITY
        : pieces.reference + pieces.value[j] + pieces.slope[j] * (x - pieces.anchor[j]);
  }

  /** True when segment {@code i} is drawn from uniformly under the top of the hull there. */
  public boolean isUniformSegment(int i) {
    return pieces.uniform[checkIndex(i)];
  }

  /** The squeeze l(x) as the sampler uses it; -inf outside the outermost abscissae. */
  public double logSqueeze(double x) {
    int j = pieces.pieceOf(x);
    if (j < 0 || pieces.gapValue[j] == Double.POSITIVE_INFINITY) {
      return Double.NEGATIVE_INFINITY;
    }
    double offset = x - pieces.anchor[j];
    return pieces.reference
        + pieces.value[j]
        + pieces.slope[j] * offset
        - (pieces.gapValue[j] + pieces.gapSlope[j] * offset);
  }

  /** The squeeze computed directly from the abscissae by linear interpolation (cross-check). */
  public double logSqueezeFromChords(double x) {
    return Squeeze.logSqueeze(abscissae, values, abscissae.length, x);
  }

  private int checkIndex(int i) {
    if (i < 0 || i >= pieces.size) {
      throw new IndexOutOfBoundsException(
          "segment index must be in [0, " + pieces.size + "), got " + i);
    }
    return i;
  }
}

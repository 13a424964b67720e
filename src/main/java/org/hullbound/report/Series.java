package org.hullbound.report;

/**
 * One named line of a plot panel: x and y values of equal length; a non-finite value is a gap.
 *
 * <p>The arrays are copied in and out, so a series is immutable; gaps let a trace with NaN draws
 * still be drawn honestly, broken where the draws are missing.
 *
 * @param name the legend label
 * @param x the horizontal coordinates
 * @param y the vertical coordinates
 */
public record Series(String name, double[] x, double[] y) {

  /** Checks the arguments and copies the arrays. */
  public Series {
    if (name == null) {
      throw new IllegalArgumentException("name must not be null");
    }
    if (x == null || y == null) {
      throw new IllegalArgumentException("x and y must not be null");
    }
    if (x.length != y.length) {
      throw new IllegalArgumentException(
          "x and y must have equal lengths, got " + x.length + " and " + y.length);
    }
    x = x.clone();
    y = y.clone();
  }

  /** A series at x = 1, 2, ..., n. */
  public static Series ofValues(String name, double[] y) {
    double[] x = new double[y.length];
    for (int i = 0; i < x.length; i++) {
      x[i] = i + 1;
    }
    return new Series(name, x, y);
  }

  @Override
  public double[] x() {
    return x.clone();
  }

  @Override
  public double[] y() {
    return y.clone();
  }

  /** The number of points. */
  public int size() {
    return x.length;
  }

  double xAt(int i) {
    return x[i];
  }

  double yAt(int i) {
    return y[i];
  }
}

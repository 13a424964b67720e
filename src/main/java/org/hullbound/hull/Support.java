package org.hullbound.hull;

/**
 * The interval on which a density is positive: the whole line, a half-line or a closed interval.
 *
 * <p>The hull needs to know which sides are unbounded, since only there must its outermost
 * tangent fall away for the hull to be integrable (Gilks and Wild 1992, section 2.2).
 *
 * <table>
 *   <caption>Factories</caption>
 *   <tr><td>{@link #real()}</td><td>(-inf, +inf)</td></tr>
 *   <tr><td>{@link #above(double) above(a)}</td><td>[a, +inf)</td></tr>
 *   <tr><td>{@link #below(double) below(b)}</td><td>(-inf, b]</td></tr>
 *   <tr><td>{@link #between(double, double) between(a, b)}</td><td>[a, b]</td></tr>
 * </table>
 *
 * @param lower the lower bound, {@code -inf} when unbounded below
 * @param upper the upper bound, {@code +inf} when unbounded above
 */
public record Support(double lower, double upper) {

  private static final Support REAL = new Support(Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY);

  /** Validates the bounds: neither NaN, lower below upper, infinite only on its own side. */
  public Support {
    if (Double.isNaN(lower) || Double.isNaN(upper)) {
      throw new IllegalArgumentException(
          "support bounds must not be NaN, got lower = " + lower + ", upper = " + upper);
    }
    if (lower == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException("support lower bound must be < +inf, got " + lower);
    }
    if (upper == Double.NEGATIVE_INFINITY) {
      throw new IllegalArgumentException("support upper bound must be > -inf, got " + upper);
    }
    if (!(lower < upper)) {
      throw new IllegalArgumentException(
          "support lower bound must be < upper bound, got lower = " + lower + ", upper = " + upper);
    }
  }

  /** The whole real line. */
  public static Support real() {
    return REAL;
  }

  /** The half-line [a, +inf); {@code a} must be finite. */
  public static Support above(double a) {
    requireFinite("lower bound", a);
    return new Support(a, Double.POSITIVE_INFINITY);
  }

  /** The half-line (-inf, b]; {@code b} must be finite. */
  public static Support below(double b) {
    requireFinite("upper bound", b);
    return new Support(Double.NEGATIVE_INFINITY, b);
  }

  /** The closed interval [a, b]; both finite, a &lt; b. */
  public static Support between(double a, double b) {
    requireFinite("lower bound", a);
    requireFinite("upper bound", b);
    return new Support(a, b);
  }

  /** True when the support has a finite lower bound. */
  public boolean isBoundedBelow() {
    return lower != Double.NEGATIVE_INFINITY;
  }

  /** True when the support has a finite upper bound. */
  public boolean isBoundedAbove() {
    return upper != Double.POSITIVE_INFINITY;
  }

  /** True when {@code lower <= x <= upper}. */
  public boolean contains(double x) {
    return lower <= x && x <= upper;
  }

  /** True when {@code lower < x < upper}. */
  public boolean containsInInterior(double x) {
    return lower < x && x < upper;
  }

  private static void requireFinite(String name, double value) {
    if (!Double.isFinite(value)) {
      throw new IllegalArgumentException("support " + name + " must be finite, got " + value);
    }
  }

  @Override
  public String toString() {
    return (isBoundedBelow() ? "[" + lower : "(-inf") + ", " + (isBoundedAbove() ? upper + "]" : "+inf)");
  }
}

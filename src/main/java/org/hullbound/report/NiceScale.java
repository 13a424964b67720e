package org.hullbound.report;

import java.util.Locale;

/**
 * An axis range with round tick marks, by Heckbert's "loose labelling" (Heckbert 1990, "Nice
 * numbers for graph labels", Graphics Gems, pp. 61-63).
 *
 * <p>Round ticks (1, 2 or 5 times a power of ten) make the plots readable at a glance. The range
 * {@code [low, high]} always encloses the data range asked for, and both ends are ticks.
 *
 * @param low the first tick, at or below the data minimum
 * @param high the last tick, at or above the data maximum
 * @param step the distance between ticks, 1, 2 or 5 times a power of ten
 */
public record NiceScale(double low, double high, double step) {

  /** Checks that the scale has a positive finite step and {@code low < high}. */
  public NiceScale {
    if (!(step > 0) || Double.isInfinite(step)) {
      throw new IllegalArgumentException("step must be finite and > 0, got " + step);
    }
    if (!(low < high) || Double.isInfinite(low) || Double.isInfinite(high)) {
      throw new IllegalArgumentException(
          "low must be below high, both finite, got low " + low + ", high " + high);
    }
  }

  /**
   * The loose labelling of {@code [min, max]} with about {@code targetTicks} ticks. A degenerate
   * range ({@code min == max}) is widened around the value so a constant series still gets an axis.
   *
   * @throws IllegalArgumentException if an end is not finite, {@code min > max}, {@code targetTicks
   *     < 2}, or the range is too wide to represent in a double
   */
  public static NiceScale of(double min, double max, int targetTicks) {
    if (!Double.isFinite(min) || !Double.isFinite(max)) {
      throw new IllegalArgumentException(
          "min and max must be finite, got min " + min + ", max " + max);
    }
    if (min > max) {
      throw new IllegalArgumentException("min must be <= max, got min " + min + ", max " + max);
    }
    if (targetTicks < 2) {
      throw new IllegalArgumentException("targetTicks must be >= 2, got " + targetTicks);
    }
    if (min == max) {
      double half = min == 0 ? 1.0 : Math.abs(min) * 0.05;
      min -= half;
      max += half;
    }
    double range = max - min;
    if (!Double.isFinite(range) || !(range > Double.MIN_NORMAL * 1e3)) {
      throw new IllegalArgumentException(
          "range from " + min + " to " + max + " cannot be labelled in double precision");
    }
    // Heckbert 1990, loose labelling: (1) a nice range, (2) a nice step from it, rounded,
    // (3) the graph ends as multiples of the step enclosing the data.
    double niceRange = niceNumber(range, false);
    double step = niceNumber(niceRange / (targetTicks - 1), true);
    double first = Math.floor(min / step);
    double last = Math.ceil(max / step);
    // Rounding in k * step can land just inside the data (300 * 1e-4 > 0.03); step outwards.
    if (first * step > min) {
      first--;
    }
    if (last * step < max) {
      last++;
    }
    double low = first * step;
    double high = last * step;
    if (!(low < high)) {
      // The step is below the resolution of the values (e.g. 1e17 + [0, 1]); widen by one step.
      high = low + step;
    }
    return new NiceScale(low, high, step);
  }

  /**
   * Heckbert's {@code nicenum}: a number of the form 1, 2, 5 or 10 times a power of ten near {@code
   * x}; rounded to the nearest when {@code round}, else the smallest not below {@code x}.
   */
  static double niceNumber(double x, boolean round) {
    int exponent = (int) Math.floor(Math.log10(x));
    double power = Math.pow(10, exponent);
    double fraction = x / power;
    double nice;
    if (round) {
      nice = fraction < 1.5 ? 1 : fraction < 3 ? 2 : fraction < 7 ? 5 : 10;
    } else {
      nice = fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10;
    }
    return nice * power;
  }

  /** The ticks from {@code low} to {@code high} inclusive, each a whole multiple of the step. */
  public double[] ticks() {
    int count = (int) Math.round((high - low) / step) + 1;
    double[] ticks = new double[count];
    double first = Math.round(low / step);
    for (int i = 0; i < count; i++) {
      ticks[i] = (first + i) * step;
    }
    return ticks;
  }

  /** Digits after the point that show every tick exactly (Heckbert's {@code nfrac}). */
  public int fractionDigits() {
    return Math.max(0, (int) -Math.floor(Math.log10(step) + 1e-9));
  }

  /** The label of tick {@code value}: fixed point with {@link #fractionDigits()}, or e-notation. */
  public String label(double value) {
    if (Math.abs(value) < step * 1e-6) {
      return "0";
    }
    double largest = Math.max(Math.abs(low), Math.abs(high));
    int exponent = (int) Math.floor(Math.log10(largest));
    if (exponent >= 6 || fractionDigits() > 4) {
      int stepExponent = (int) Math.floor(Math.log10(step) + 1e-9);
      int valueExponent = (int) Math.floor(Math.log10(Math.abs(value)) + 1e-9);
      int digits = Math.max(0, Math.min(6, valueExponent - stepExponent));
      return Markup.tidyExponent(String.format(Locale.ROOT, "%." + digits + "e", value));
    }
    return String.format(Locale.ROOT, "%." + fractionDigits() + "f", value);
  }
}

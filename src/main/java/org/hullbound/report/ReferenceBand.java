package org.hullbound.report;

/**
 * A horizontal reference drawn behind a panel's data: a shaded band from {@code low} to {@code
 * high} and a dashed line at {@code centre}.
 *
 * <p>Used for the range a rank histogram's bars should keep to when the chains mix, and for the
 * white-noise band of an autocorrelation plot.
 *
 * @param low the bottom of the band
 * @param centre the reference line
 * @param high the top of the band
 */
public record ReferenceBand(double low, double centre, double high) {

  /** Checks that the values are finite and ordered. */
  public ReferenceBand {
    if (!Double.isFinite(low) || !Double.isFinite(centre) || !Double.isFinite(high)) {
      throw new IllegalArgumentException(
          "band values must be finite, got " + low + ", " + centre + ", " + high);
    }
    if (!(low <= centre && centre <= high)) {
      throw new IllegalArgumentException(
          "band must satisfy low <= centre <= high, got " + low + ", " + centre + ", " + high);
    }
  }
}

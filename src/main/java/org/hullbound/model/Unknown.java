package org.hullbound.model;

import org.hullbound.lang.NumberSyntax;
import org.hullbound.model.family.Scale;

/**
 * One scalar unknown of a bound model: an element of a {@code param} (such as {@code effect[3]})
 * or a missing observation of modelled {@code data} (such as {@code y[17]}).
 *
 * <p>{@code index} is its slot in the state vector; {@code scale} is the scale it is sampled on;
 * {@code lower} and {@code upper} bound its own term's support on the natural scale (infinite when
 * open, NaN when a bound depends on other unknowns, as for {@code uniform(lower = a, upper = b)}
 * with unknown {@code a}), which dependent arguments with a bounded range may cut further (see
 * {@link ConditionalDensity#lowerBound}); {@code imputed} marks a missing observation; {@code discrete} one that
 * takes whole values only (a missing count).
 */
public record Unknown(
    int index,
    String label,
    String node,
    Scale scale,
    double lower,
    double upper,
    boolean imputed,
    boolean discrete) {

  /** The support on the natural scale, as {@code (lo, hi)} in the model language's notation. */
  public String support() {
    if (discrete) {
      return "{" + bound(lower) + ", ..., " + bound(upper) + "}";
    }
    return "(" + bound(lower) + ", " + bound(upper) + ")";
  }

  private static String bound(double b) {
    return Double.isNaN(b) ? "?" : shown(b);
  }

  /**
   * A value of an unknown as messages show it, in the model language's spelling ({@link
   * NumberSyntax#written}), for the packages that report values but do not read the language.
   */
  public static String shown(double value) {
    return NumberSyntax.written(value);
  }
}

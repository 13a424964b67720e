package org.hullbound.model.family;

/** Curvature facts shared by several families, so that their wording stays the same. */
final class Reasons {
  private Reasons() {}

  static Curvature notAnalysed(Parametrisation p, String quantity, Scale scale) {
    return Curvature.notEstablished(
        p.family().name() + ": concavity in " + quantity + " on the " + scale.name().toLowerCase()
            + " scale is not analysed");
  }

  /**
   * Value on the log scale for a location family whose log-density is concave and decreasing
   * beyond the location: {@code g''(u) = x^2 l''(x) + x l'(x)} with {@code x = e^u}; both terms are
   * {@code <= 0} when every positive {@code x} lies above the location.
   */
  static Curvature logValueOfLocationFamily(
      Parametrisation p, double[] knownArgs, int locationIndex, String secondDerivative) {
    String location = p.argumentNames().get(locationIndex);
    if (BaseParametrisation.known(knownArgs, locationIndex) && knownArgs[locationIndex] <= 0) {
      return Curvature.concave(p.family().name() + " log-density is concave in u = log(value) since "
          + location + " <= 0: " + secondDerivative + " <= 0 for every value > 0");
    }
    return Curvature.notEstablished(p.family().name() + " log-density in u = log(value) has "
        + secondDerivative + ", positive for small values when " + location
        + " > 0; concave when " + location + " <= 0 is known");
  }
}

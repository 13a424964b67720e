package org.hullbound.gibbs;

import java.util.List;
import java.util.Optional;
import java.util.Set;
import java.util.random.RandomGenerator;
import org.hullbound.model.family.Families;
import org.hullbound.model.family.FamilyDraws;
import org.hullbound.model.family.Parametrisation;

/**
 * An exact draw from a family of the model language given its named arguments, optionally
 * truncated to {@code [lower, upper]}: the draw of a missing observation that nothing depends on.
 *
 * <p>The draws themselves are {@link FamilyDraws}' (standard algorithms, cited there, with far
 * tails of a truncation drawn by log-space inversion); this class only finds the parametrisation
 * from the argument names a posterior carries and puts the arguments in its order.
 */
final class PredictiveDraw {
  private PredictiveDraw() {}

  /** Whether {@link #draw} knows this family and parametrisation. */
  static boolean supports(String family, List<String> names) {
    return parametrisation(family, names).isPresent();
  }

  /** A draw, natural scale; infinite bounds leave a side open. */
  static double draw(
      String family, List<String> names, double[] args, double lower, double upper,
      RandomGenerator rng) {
    Parametrisation parametrisation =
        parametrisation(family, names)
            .orElseThrow(
                () -> new IllegalArgumentException("no family " + family + " with " + names));
    List<String> order = parametrisation.argumentNames();
    double[] ordered = new double[order.size()];
    for (int k = 0; k < ordered.length; k++) {
      ordered[k] = args[names.indexOf(order.get(k))];
    }
    return FamilyDraws.drawBetween(parametrisation, ordered, lower, upper, rng);
  }

  private static Optional<Parametrisation> parametrisation(String family, List<String> names) {
    return Families.lookup(family).flatMap(f -> f.match(Set.copyOf(names)));
  }
}

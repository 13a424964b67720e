package org.hullbound.model.family;

import java.util.List;
import java.util.Optional;
import java.util.Set;

/**
 * A family of the model language, such as {@code normal}, with its parametrisations.
 *
 * <p>Every argument of a distribution is named in a model, so the set of names written picks the
 * parametrisation ({@code normal(mean = 0, sd = 2)} against {@code normal(mean = 0, precision = 4)}).
 */
public interface Family {
  /** The name used in model files, e.g. {@code "half-normal"}. */
  String name();

  /** The parametrisations, in the order of the model-language table. */
  List<Parametrisation> parametrisations();

  /** The parametrisation whose argument names are exactly {@code argumentNames}, in any order. */
  default Optional<Parametrisation> match(Set<String> argumentNames) {
    for (Parametrisation candidate : parametrisations()) {
      if (candidate.argumentNames().size() == argumentNames.size()
          && argumentNames.containsAll(candidate.argumentNames())) {
        return Optional.of(candidate);
      }
    }
    return Optional.empty();
  }
}

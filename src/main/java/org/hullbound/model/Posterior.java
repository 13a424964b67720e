package org.hullbound.model;

import java.util.List;

/**
 * The exact full conditional of an unknown with a conjugate prior: a family name and its
 * arguments, such as {@code gamma(shape = 12.5, rate = 4.1)}.
 *
 * <p>Returned by {@link Update.Conjugate#posterior(double[])} so that the Gibbs driver can draw
 * from it directly, without evaluating any density. Families used: {@code normal(mean, sd)},
 * {@code gamma(shape, rate)}, {@code inverse-gamma(shape, scale)}, {@code beta(a, b)}, and for a
 * missing observation with no dependants its own family with its own argument names.
 */
public record Posterior(String family, List<String> argumentNames, double[] arguments) {
  public Posterior {
    argumentNames = List.copyOf(argumentNames);
    arguments = arguments.clone();
    if (argumentNames.size() != arguments.length) {
      throw new IllegalArgumentException(
          "arguments must have one value per name " + argumentNames + ", got " + arguments.length);
    }
  }

  /** The argument called {@code name}. */
  public double argument(String name) {
    int k = argumentNames.indexOf(name);
    if (k < 0) {
      throw new IllegalArgumentException(
          "name must be one of " + argumentNames + ", got " + name);
    }
    return arguments[k];
  }

  @Override
  public double[] arguments() {
    return arguments.clone();
  }

  @Override
  public String toString() {
    StringBuilder text = new StringBuilder(family).append('(');
    for (int k = 0; k < arguments.length; k++) {
      text.append(k == 0 ? "" : ", ").append(argumentNames.get(k)).append(" = ").append(arguments[k]);
    }
    return text.append(')').toString();
  }
}

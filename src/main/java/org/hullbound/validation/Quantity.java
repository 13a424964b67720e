package org.hullbound.validation;

import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * One checked quantity of a validation case: a posterior statistic of one unknown, its reference
 * (a number from the case's file, or computed at run time) and the absolute floor added to the
 * tolerance for the reference's own error.
 *
 * @param name as written, e.g. {@code mean(theta[1])}
 * @param statistic what is estimated from the draws
 * @param unknown the unknown's label, e.g. {@code theta[1]}
 * @param reference the reference value, or NaN when {@code computed}
 * @param computed whether the case's {@link CaseReference} supplies the value at run time
 * @param floor absolute allowance for the reference's own error (quadrature, rounding), >= 0
 */
record Quantity(
    String name, Statistic statistic, String unknown, double reference, boolean computed,
    double floor) {

  private static final Pattern FORM = Pattern.compile("(mean|sd)\\((.+)\\)");

  /** The statistics a quantity may name. */
  enum Statistic {
    MEAN,
    SD
  }

  Quantity {
    if (!(floor >= 0) || Double.isInfinite(floor)) {
      throw new IllegalArgumentException("floor must be finite and >= 0, got " + floor);
    }
  }

  /**
   * Parses {@code mean(label)} or {@code sd(label)}.
   *
   * @throws IllegalArgumentException naming the text when it has neither form
   */
  static Quantity of(String name, double reference, boolean computed, double floor) {
    Matcher m = FORM.matcher(name.trim());
    if (!m.matches()) {
      throw new IllegalArgumentException(
          "quantity must be mean(<unknown>) or sd(<unknown>), got '" + name + "'");
    }
    Statistic statistic = m.group(1).equals("mean") ? Statistic.MEAN : Statistic.SD;
    return new Quantity(name.trim(), statistic, m.group(2).trim(), reference, computed, floor);
  }

  /** The same quantity with its reference filled in. */
  Quantity withReference(double value) {
    return new Quantity(name, statistic, unknown, value, false, floor);
  }
}

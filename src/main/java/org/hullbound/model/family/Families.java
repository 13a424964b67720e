package org.hullbound.model.family;

import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.hullbound.lang.NameSuggestion;

/**
 * The registry of the model language's families, looked up by the name written in a model file.
 *
 * <p>One place lists every family, so that error messages can say which names are valid and a new
 * family is added by one line here (see {@code docs/families.md}).
 *
 * <table>
 *   <caption>Families and their parametrisations</caption>
 *   <tr><th>family</th><th>arguments (one group per parametrisation)</th></tr>
 *   <tr><td>normal</td><td>mean, sd · mean, var · mean, precision</td></tr>
 *   <tr><td>lognormal</td><td>meanlog, sdlog</td></tr>
 *   <tr><td>half-normal</td><td>sd</td></tr>
 *   <tr><td>student-t</td><td>df, location, scale</td></tr>
 *   <tr><td>cauchy</td><td>location, scale</td></tr>
 *   <tr><td>half-cauchy</td><td>scale</td></tr>
 *   <tr><td>logistic</td><td>location, scale</td></tr>
 *   <tr><td>laplace</td><td>location, scale</td></tr>
 *   <tr><td>exponential</td><td>rate</td></tr>
 *   <tr><td>gamma</td><td>shape, rate · shape, scale</td></tr>
 *   <tr><td>inverse-gamma</td><td>shape, scale</td></tr>
 *   <tr><td>weibull</td><td>shape, scale</td></tr>
 *   <tr><td>beta</td><td>a, b</td></tr>
 *   <tr><td>uniform</td><td>lower, upper</td></tr>
 *   <tr><td>poisson</td><td>rate · log_rate</td></tr>
 *   <tr><td>binomial</td><td>trials, p · trials, logit_p</td></tr>
 *   <tr><td>bernoulli</td><td>p · logit_p</td></tr>
 *   <tr><td>negative-binomial</td><td>mean, size</td></tr>
 *   <tr><td>categorical</td><td>p (a vector of K weights)</td></tr>
 *   <tr><td>whole-uniform</td><td>lower, upper</td></tr>
 * </table>
 */
public final class Families {
  private static final Map<String, Family> BY_NAME = register(
      Normal.family(),
      LogNormal.family(),
      HalfNormal.family(),
      StudentT.family(),
      Cauchy.family(),
      HalfCauchy.family(),
      Logistic.family(),
      Laplace.family(),
      Exponential.family(),
      GammaFamily.family(),
      InverseGamma.family(),
      Weibull.family(),
      BetaFamily.family(),
      Uniform.family(),
      Poisson.family(),
      Binomial.binomial(),
      Binomial.bernoulli(),
      NegativeBinomial.family(),
      Categorical.family(),
      WholeUniform.family());

  private static final List<String> SORTED_NAMES = sortedNames();

  private Families() {}

  /** The family called {@code name}, if there is one. */
  public static Optional<Family> lookup(String name) {
    return Optional.ofNullable(BY_NAME.get(name));
  }

  /**
   * "did you mean ...?" for a family name that is misspelt or written in a form hullbound does not
   * use (FORMER_NAMES: underscores or abbreviations, as in {@code half_normal}; the renaming script
   * leaves this table alone), or {@code null} when no family is near.
   */
  public static String hint(String name) {
    String former = FORMER_NAMES.get(name);
    return former != null
        ? "did you mean '" + former + "'?"
        : NameSuggestion.hint(name, SORTED_NAMES);
  }

  private static final Map<String, String> FORMER_NAMES =
      Map.of(
          "half_normal", "half-normal",
          "half_cauchy", "half-cauchy",
          "student_t", "student-t",
          "inv_gamma", "inverse-gamma",
          "inverse_gamma", "inverse-gamma",
          "neg_binomial", "negative-binomial",
          "negative_binomial", "negative-binomial");

  /** Every family name, sorted, e.g. for "valid families are ..." messages. */
  public static List<String> names() {
    return SORTED_NAMES;
  }

  /** Every family, in the order of the model-language table. */
  public static List<Family> all() {
    return List.copyOf(BY_NAME.values());
  }

  private static Map<String, Family> register(Family... families) {
    Map<String, Family> byName = new LinkedHashMap<>();
    for (Family family : families) {
      if (byName.put(family.name(), family) != null) {
        throw new IllegalStateException("family registered twice: " + family.name());
      }
    }
    return Collections.unmodifiableMap(byName);
  }

  private static List<String> sortedNames() {
    List<String> names = new ArrayList<>(BY_NAME.keySet());
    Collections.sort(names);
    return List.copyOf(names);
  }
}

package org.hullbound.lang;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import java.util.Optional;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** Nearest-name suggestions and the distance behind them. */
class NameSuggestionTest {

  private static final List<String> FAMILIES =
      List.of(
          "normal", "lognormal", "half-normal", "student-t", "cauchy", "half-cauchy", "logistic",
          "laplace", "exponential", "gamma", "inverse-gamma", "weibull", "beta", "uniform", "poisson",
          "binomial", "bernoulli", "negative-binomial");

  @ParameterizedTest(name = "d({0}, {1}) = {2}")
  @CsvSource({
    // The classic worked example of edit distance: kitten -> sitting takes three edits
    // (common textbook example, recalled from memory).
    "kitten, sitting, 3",
    "'', abc, 3",
    "abc, '', 3",
    "same, same, 0",
    "Normal, normal, 0",
    // A swap of neighbours is one edit (Damerau 1964).
    "ca, ac, 1",
    "nromal, normal, 1",
    // Optimal string alignment edits no substring twice, so 'ca' -> 'abc' costs 3, where the
    // unrestricted Damerau-Levenshtein distance is 2 (a known difference, recalled from memory).
    "ca, abc, 3",
    "exipt, expit, 1",
  })
  void distance(String a, String b, int expected) {
    assertEquals(expected, NameSuggestion.distance(a, b));
  }

  @ParameterizedTest(name = "{0} -> {1}")
  @CsvSource({
    "nromal, normal",
    "Normal, normal",
    "halfnormal, half-normal",
    "half_norml, half-normal",
    "possion, poisson",
    "gama, gamma",
    "binomal, binomial",
    "negativebinomial, negative-binomial",
    "expnential, exponential",
    "weibul, weibull",
  })
  void suggestsTheNearestFamily(String wrong, String expected) {
    assertEquals(Optional.of(expected), NameSuggestion.nearest(wrong, FAMILIES));
  }

  @Test
  void makesNoSuggestionWhenNothingIsClose() {
    assertEquals(Optional.empty(), NameSuggestion.nearest("dirichlet", FAMILIES));
    assertEquals(Optional.empty(), NameSuggestion.nearest("xyz", FAMILIES));
    assertEquals(Optional.empty(), NameSuggestion.nearest("a", List.of("b")));
    assertEquals(Optional.empty(), NameSuggestion.nearest("", List.of("b")));
    assertEquals(Optional.empty(), NameSuggestion.nearest("x", List.of()));
  }

  @Test
  void shortNamesAllowOneEditLongNamesMore() {
    assertEquals(Optional.of("sd"), NameSuggestion.nearest("sdd", List.of("sd", "mean")));
    assertEquals(Optional.empty(), NameSuggestion.nearest("sxx", List.of("sd")));
    assertEquals(Optional.of("precision"), NameSuggestion.nearest("presicion", List.of("precision", "mean")));
  }

  @Test
  void tiesGoToTheAlphabeticallyFirstWhateverTheOrder() {
    assertEquals(Optional.of("bar"), NameSuggestion.nearest("baz", List.of("bat", "bar")));
    assertEquals(Optional.of("bar"), NameSuggestion.nearest("baz", List.of("bar", "bat")));
    assertEquals(Optional.of("bar"), NameSuggestion.nearest("baz", Set.of("bat", "bar")));
  }

  @Test
  void hintPhrasesTheSuggestion() {
    assertEquals("did you mean 'spread'?", NameSuggestion.hint("sprd", List.of("spread", "centre")));
    assertNull(NameSuggestion.hint("qqqq", List.of("spread")));
  }

  @Test
  void nullArgumentsAreRejectedByName() {
    assertEquals(
        "wrong must not be null",
        assertThrows(IllegalArgumentException.class, () -> NameSuggestion.nearest(null, FAMILIES))
            .getMessage());
    assertEquals(
        "valid must not be null",
        assertThrows(IllegalArgumentException.class, () -> NameSuggestion.nearest("x", null))
            .getMessage());
  }
}

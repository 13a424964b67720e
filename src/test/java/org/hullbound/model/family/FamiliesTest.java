package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.Test;

/**
 * The registry holds exactly the families of the model-language table
 * ({@code /work/shared/design/model-language.md}, "Families and their argument names"), and
 * arguments and values are checked with messages that name what is wrong.
 */
class FamiliesTest {

  /** The design table, one entry per parametrisation, in its order. */
  private static final Map<String, List<List<String>>> TABLE = new LinkedHashMap<>();

  static {
    TABLE.put("normal", List.of(List.of("mean", "sd"), List.of("mean", "var"), List.of("mean", "precision")));
    TABLE.put("lognormal", List.of(List.of("meanlog", "sdlog")));
    TABLE.put("half-normal", List.of(List.of("sd")));
    TABLE.put("student-t", List.of(List.of("df", "location", "scale")));
    TABLE.put("cauchy", List.of(List.of("location", "scale")));
    TABLE.put("half-cauchy", List.of(List.of("scale")));
    TABLE.put("logistic", List.of(List.of("location", "scale")));
    TABLE.put("laplace", List.of(List.of("location", "scale")));
    TABLE.put("exponential", List.of(List.of("rate")));
    TABLE.put("gamma", List.of(List.of("shape", "rate"), List.of("shape", "scale")));
    TABLE.put("inverse-gamma", List.of(List.of("shape", "scale")));
    TABLE.put("weibull", List.of(List.of("shape", "scale")));
    TABLE.put("beta", List.of(List.of("a", "b")));
    TABLE.put("uniform", List.of(List.of("lower", "upper")));
    TABLE.put("poisson", List.of(List.of("rate"), List.of("log_rate")));
    TABLE.put("binomial", List.of(List.of("trials", "p"), List.of("trials", "logit_p")));
    TABLE.put("bernoulli", List.of(List.of("p"), List.of("logit_p")));
    TABLE.put("negative-binomial", List.of(List.of("mean", "size")));
    TABLE.put("categorical", List.of(List.of("p")));
    TABLE.put("whole-uniform", List.of(List.of("lower", "upper")));
  }

  @Test
  void namesAreTheTablesFamiliesSorted() {
    List<String> expected = new ArrayList<>(TABLE.keySet());
    expected.sort(null);
    assertEquals(expected, Families.names());
  }

  @Test
  void everyFamilyHasTheTablesParametrisationsInOrder() {
    TABLE.forEach((name, parametrisations) -> {
      Family family = Families.lookup(name).orElseThrow();
      assertEquals(name, family.name());
      assertEquals(parametrisations, family.parametrisations().stream().map(Parametrisation::argumentNames).toList());
      family.parametrisations().forEach(p -> assertEquals(family, p.family()));
    });
  }

  @Test
  void parametrisationIsMatchedByTheExactSetOfNamesInAnyOrder() {
    Family normal = Families.lookup("normal").orElseThrow();
    assertEquals(List.of("mean", "precision"), normal.match(Set.of("precision", "mean")).orElseThrow().argumentNames());
    assertTrue(normal.match(Set.of("mean")).isEmpty());
    assertTrue(normal.match(Set.of("mean", "sd", "var")).isEmpty());
    assertTrue(normal.match(Set.of("mean", "scale")).isEmpty());
    assertTrue(Families.lookup("gaussian").isEmpty());
    assertEquals("binomial(trials, logit_p)",
        Families.lookup("binomial").orElseThrow().match(Set.of("logit_p", "trials")).orElseThrow().signature());
  }

  @Test
  void supportsFollowTheTable() {
    assertEquals(SupportKind.REAL, FamilyCases.parametrisation("student-t", "df", "location", "scale").support());
    assertEquals(SupportKind.POSITIVE, FamilyCases.parametrisation("inverse-gamma", "shape", "scale").support());
    assertEquals(SupportKind.UNIT_INTERVAL, FamilyCases.parametrisation("beta", "a", "b").support());
    assertEquals(SupportKind.BETWEEN_FIRST_TWO_ARGUMENTS, FamilyCases.parametrisation("uniform", "lower", "upper").support());
    assertEquals(SupportKind.COUNT, FamilyCases.parametrisation("negative-binomial", "mean", "size").support());
    assertEquals(SupportKind.COUNT_UP_TO_FIRST_ARGUMENT, FamilyCases.parametrisation("binomial", "trials", "p").support());
    assertEquals(SupportKind.BINARY, FamilyCases.parametrisation("bernoulli", "logit_p").support());
    assertTrue(FamilyCases.parametrisation("poisson", "log_rate").discrete());
    assertTrue(!FamilyCases.parametrisation("weibull", "shape", "scale").discrete());
  }

  @Test
  void badArgumentsAreNamedWithTheirValueAndTheRequirement() {
    assertEquals("sd must be > 0, got -1", FamilyCases.parametrisation("normal", "mean", "sd").checkArguments(new double[] {0, -1}));
    assertEquals("sd must be > 0, got NaN", FamilyCases.parametrisation("half-normal", "sd").checkArguments(new double[] {Double.NaN}));
    assertEquals("mean must be a finite number, got inf",
        FamilyCases.parametrisation("normal", "mean", "var").checkArguments(new double[] {Double.POSITIVE_INFINITY, 1}));
    assertEquals("p must be between 0 and 1, got 1.5",
        FamilyCases.parametrisation("binomial", "trials", "p").checkArguments(new double[] {10, 1.5}));
    assertEquals("trials must be a whole number >= 0, got 2.5",
        FamilyCases.parametrisation("binomial", "trials", "logit_p").checkArguments(new double[] {2.5, 0}));
    assertEquals("lower must be < upper, got lower = 2, upper = 1",
        FamilyCases.parametrisation("uniform", "lower", "upper").checkArguments(new double[] {2, 1}));
    assertEquals("gamma(shape, rate) takes 2 arguments, got 1",
        FamilyCases.parametrisation("gamma", "shape", "rate").checkArguments(new double[] {1}));
    assertNull(FamilyCases.parametrisation("bernoulli", "p").checkArguments(new double[] {1}));
    assertNull(FamilyCases.parametrisation("student-t", "df", "location", "scale").checkArguments(new double[] {3, -2, 0.5}));
  }

  @Test
  void badValuesAreNamedWithWhatTheSupportAllows() {
    assertEquals("a count must be a whole number >= 0, got 2.5",
        FamilyCases.parametrisation("poisson", "rate").checkValue(2.5, new double[] {1}));
    assertEquals("a count must be a whole number >= 0, got -1",
        FamilyCases.parametrisation("negative-binomial", "mean", "size").checkValue(-1, new double[] {1, 1}));
    assertEquals("a count must be a whole number between 0 and trials = 10, got 11",
        FamilyCases.parametrisation("binomial", "trials", "p").checkValue(11, new double[] {10, 0.5}));
    assertEquals("a bernoulli value must be 0 or 1, got 2",
        FamilyCases.parametrisation("bernoulli", "p").checkValue(2, new double[] {0.5}));
    assertEquals("a beta value must be strictly between 0 and 1, got 1",
        FamilyCases.parametrisation("beta", "a", "b").checkValue(1, new double[] {2, 2}));
    assertEquals("a half-normal value must be > 0 and finite, got -0.5",
        FamilyCases.parametrisation("half-normal", "sd").checkValue(-0.5, new double[] {1}));
    assertEquals("a uniform value must lie in [lower, upper] = [0, 2], got 3",
        FamilyCases.parametrisation("uniform", "lower", "upper").checkValue(3, new double[] {0, 2}));
    assertEquals("a normal value must be a finite number, got NaN",
        FamilyCases.parametrisation("normal", "mean", "sd").checkValue(Double.NaN, new double[] {0, 1}));
    assertNull(FamilyCases.parametrisation("binomial", "trials", "p").checkValue(10, new double[] {10, 0.5}));
  }

  @Test
  void outsideTheSupportTheLogDensityIsMinusInfinityWithZeroGradient() {
    double[] gradient = {9, 9, 9};
    assertEquals(Double.NEGATIVE_INFINITY,
        FamilyCases.parametrisation("gamma", "shape", "scale").logDensity(-1, new double[] {2, 1}, gradient));
    assertArrayEquals(new double[] {0, 0, 0}, gradient);
    assertEquals(Double.NEGATIVE_INFINITY, FamilyCases.parametrisation("poisson", "rate").logDensity(1.5, new double[] {2}));
    assertEquals(Double.NEGATIVE_INFINITY,
        FamilyCases.parametrisation("binomial", "trials", "p").logDensity(4, new double[] {3, 0.5}));
    assertEquals(Double.NEGATIVE_INFINITY, FamilyCases.parametrisation("beta", "a", "b").logDensity(0, new double[] {2, 2}));
  }

  @Test
  void probabilitiesOfZeroAndOneAreValidAndGiveCertainOutcomes() {
    Parametrisation bernoulli = FamilyCases.parametrisation("bernoulli", "p");
    assertEquals(0.0, bernoulli.logDensity(1, new double[] {1}));
    assertEquals(Double.NEGATIVE_INFINITY, bernoulli.logDensity(0, new double[] {1}));
    Parametrisation binomial = FamilyCases.parametrisation("binomial", "trials", "p");
    assertEquals(0.0, binomial.logDensity(0, new double[] {5, 0}));
    assertEquals(0.0, binomial.logDensity(0, new double[] {0, 0.3}));
  }
}

package org.hullbound.validation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The whole validation suite of {@code validation/}, run as part of the build with fewer draws
 * than {@code hullbound validate} uses by default.
 *
 * <p>The pass rule is the command's, {@code |estimate - reference| <= k MCSE + floor}, with k =
 * 4.5 rather than the command's 4 so that the build's family-wise false-alarm budget
 * (DEVELOPERS.md) holds: an exact sampler fails a quantity with probability about 6.8e-6 instead
 * of 6.3e-5 (two-sided normal tails). The draws grow with k squared (2560 rather than 2000 per
 * chain), so the bias caught stays the same share of the posterior sd: 4.5 / sqrt(2560) = 0.089
 * against 4 / sqrt(2000) = 0.089 sd for nearly independent draws, 4 chains.
 */
final class ValidationSuiteTest {
  private static final Path SUITE = Path.of("validation");

  @Test
  void everyCasePassesAtAFixedSeed() {
    ValidationSettings settings = new ValidationSettings(4, 500, 2560, ValidationSettings.DEFAULT_SEED, 4.5);
    Validator validator = Validator.of(SUITE, settings);
    assertTrue(validator.caseNames().size() >= 8, "at least 8 cases: " + validator.caseNames());
    List<CaseOutcome> outcomes = validator.run(List.of());
    String text = ValidationText.of(outcomes, settings);
    System.out.println(text);
    assertEquals(validator.caseNames().size(), outcomes.size());
    for (CaseOutcome outcome : outcomes) {
      assertTrue(outcome.pass(), outcome.name() + " failed:\n" + text);
    }
  }
}

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
 * <p>The pass rule is the same, {@code |estimate - reference| <= 4 MCSE + floor}: fewer draws
 * only widen the MCSE, so the check stays valid (an exact sampler fails a quantity with
 * probability about 6e-5; a biased one is caught once its bias exceeds about 4 MCSE). At 2000
 * draws per chain and 4 chains the MCSE of a mean is about sd / 90 for nearly independent draws.
 */
final class ValidationSuiteTest {
  private static final Path SUITE = Path.of("validation");

  @Test
  void everyCasePassesAtAFixedSeed() {
    ValidationSettings settings = new ValidationSettings(4, 500, 2000, ValidationSettings.DEFAULT_SEED, 4);
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

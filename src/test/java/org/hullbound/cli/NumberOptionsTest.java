package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Numeric options are read with the model language's number grammar (docs/model-language.md),
 * not Java's: each refused form is a usage error (exit 2) that quotes what was typed. picocli's
 * own converters take {@code 0x10} as 16 or {@code +2} as 2 (picocli 4.7 documentation, type
 * conversion), and {@code Double.valueOf} takes {@code 22d}.
 */
class NumberOptionsTest {

  @ParameterizedTest(name = "{0} {1}")
  @CsvSource({
    "--chains, 2.5, is not a whole number",
    "--chains, +2, is not a number",
    "--chains, 0x2, is not a number",
    "--chains, 3000000000, is out of range",
    "--seed, 22d, is not a number",
    "--draws, 1e999, is too large to represent"
  })
  void fitRefusesANumberOutsideTheGrammar(String option, String written, String reason) {
    CliRun run = CliRun.of("fit", "models/seedlings.hbm", "--data", "models/seedlings.csv",
        option, written);
    assertEquals(2, run.exit(), run.toString());
    assertTrue(run.err().contains("'" + written + "' " + reason), run.toString());
    assertTrue(run.errorIsPlain(), run.toString());
  }

  @ParameterizedTest(name = "{0} {1}")
  @CsvSource({"--max-rhat, 1.01d", "--max-rhat, 0x1p0", "--min-ess, 4e2f"})
  void summarizeRefusesJavaNumberForms(String option, String written) {
    CliRun run = CliRun.of("summarize", "no-such-draws.csv", option, written);
    assertEquals(2, run.exit(), run.toString());
    assertTrue(run.err().contains("'" + written + "' is not a number"), run.toString());
  }

  @ParameterizedTest(name = "{0}")
  @CsvSource({"2.2e1f", "0x1.6p4", "22d"})
  void drawRefusesJavaNumberFormsAsBounds(String written) {
    CliRun run = CliRun.of("draw", "--log-density", "-x^2", "--lower", written, "-n", "5");
    assertEquals(2, run.exit(), run.toString());
    assertTrue(run.err().contains("'" + written + "' is not a number"), run.toString());
  }
}

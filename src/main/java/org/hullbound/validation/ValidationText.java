package org.hullbound.validation;

import java.util.List;
import java.util.Locale;

/**
 * The plain-text account of a validation run: per case, one line per quantity with reference,
 * estimate, MCSE, the error in MCSEs and the verdict, then a closing count.
 *
 * <p>Kept here rather than in the command so that tests can read the same text the user sees.
 */
public final class ValidationText {
  private ValidationText() {}

  /** The report of {@code outcomes}, judged with {@code settings}. */
  public static String of(List<CaseOutcome> outcomes, ValidationSettings settings) {
    StringBuilder out = new StringBuilder();
    out.append(String.format(Locale.ROOT,
        "Validation: %d case%s, %d chains x %d draws after %d burn-in, seed %d%n",
        outcomes.size(), outcomes.size() == 1 ? "" : "s", settings.chains(), settings.draws(),
        settings.burnIn(), settings.seed()));
    out.append(String.format(Locale.ROOT,
        "A quantity passes when |estimate - reference| <= %s x MCSE + floor.%n%n", number(settings.k())));
    int passed = 0;
    int total = 0;
    for (CaseOutcome outcome : outcomes) {
      out.append(outcome.name()).append(outcome.pass() ? "  [passed]" : "  [FAILED]").append('\n');
      if (outcome.failure() != null) {
        out.append("    could not run: ").append(outcome.failure().replace("\n", "\n    ")).append('\n');
      }
      if (!outcome.checks().isEmpty()) {
        out.append(String.format(Locale.ROOT, "    %-16s %14s %14s %11s %8s  %-7s %s%n",
            "quantity", "reference", "estimate", "MCSE", "error/MCSE", "verdict", "update"));
      }
      for (QuantityCheck check : outcome.checks()) {
        total++;
        passed += check.pass() ? 1 : 0;
        out.append(String.format(Locale.ROOT, "    %-16s %14s %14s %11s %10s  %-7s %s%n",
            check.quantity(), number(check.reference()), number(check.estimate()),
            number(check.mcse()), Double.isFinite(check.standardisedError())
                ? String.format(Locale.ROOT, "%+.2f", check.standardisedError()) : "n/a",
            check.pass() ? "pass" : "FAIL", check.update()));
      }
      out.append('\n');
    }
    long casesPassed = outcomes.stream().filter(CaseOutcome::pass).count();
    out.append(String.format(Locale.ROOT, "%d of %d quantities and %d of %d cases passed.%n",
        passed, total, casesPassed, outcomes.size()));
    return out.toString();
  }

  private static String number(double v) {
    if (Double.isNaN(v)) {
      return "NaN";
    }
    if (v != 0 && (Math.abs(v) < 1e-3 || Math.abs(v) >= 1e6)) {
      return String.format(Locale.ROOT, "%.5e", v);
    }
    return String.format(Locale.ROOT, "%.6f", v);
  }
}

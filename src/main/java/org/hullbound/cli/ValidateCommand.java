package org.hullbound.cli;

import java.io.PrintWriter;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.hullbound.validation.CaseOutcome;
import org.hullbound.validation.ValidationSettings;
import org.hullbound.validation.ValidationText;
import org.hullbound.validation.Validator;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

/**
 * {@code hullbound validate}: fits every case of the validation suite and compares posterior means
 * and sds with published closed forms and quadrature; exit 0 when every quantity passes, 1 when
 * one fails, 2 for a usage error.
 *
 * <p>Thin: the cases, fits and verdicts live in {@code org.hullbound.validation}.
 */
@Command(
    name = "validate",
    mixinStandardHelpOptions = true,
    sortOptions = false,
    description = {
      "Check the sampler against known posteriors (the validation suite).",
      "Fits each case and compares means and sds with closed forms or quadrature;",
      "a quantity passes when |estimate - reference| <= 4 x MCSE + floor."
    })
public final class ValidateCommand implements Callable<Integer> {

  @Option(
      names = "--case",
      paramLabel = "NAME",
      description = "Run only this case; repeat for several (default: all).")
  List<String> cases = new ArrayList<>();

  @Option(
      names = "--draws",
      paramLabel = "N",
      description = "Kept draws per chain, at least 100 (default: ${DEFAULT-VALUE}).")
  int draws = ValidationSettings.DEFAULT_DRAWS;

  @Option(
      names = "--burn-in",
      paramLabel = "N",
      description = "Sweeps discarded per chain (default: ${DEFAULT-VALUE}).")
  int burnIn = ValidationSettings.DEFAULT_BURN_IN;

  @Mixin SeedOption seed;

  @Option(names = "--suite", paramLabel = "DIR", description = "The folder of cases (default:"
      + " validation in the working directory, else the one beside the hullbound jar).")
  Path suite;

  /** The folder of cases in a checkout, relative to the working directory or to the jar's. */
  static final String SUITE_FOLDER = "validation";

  @Option(names = "--list", description = "List the cases and exit.")
  boolean list;

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() {
    PrintWriter out = spec.commandLine().getOut();
    if (draws < 100) {
      return ErrorReporting.userError(
          spec.commandLine(), "--draws must be at least 100, got " + draws);
    }
    if (burnIn < 0) {
      return ErrorReporting.userError(
          spec.commandLine(), "--burn-in must be at least 0, got " + burnIn);
    }
    ValidationSettings settings =
        ValidationSettings.defaults().withDraws(draws).withBurnIn(burnIn)
            .withSeed(seed.orElse(() -> ValidationSettings.DEFAULT_SEED));
    Validator validator = Validator.of(suite != null ? suite : defaultSuite(), settings);
    if (list) {
      validator.caseNames().forEach(out::println);
      out.flush();
      return 0;
    }
    List<CaseOutcome> outcomes = validator.run(cases);
    out.print(ValidationText.of(outcomes, settings));
    out.flush();
    return outcomes.stream().allMatch(CaseOutcome::pass) ? 0 : ErrorReporting.FAILURE;
  }

  /**
   * {@code validation} in the working directory when there is one; else the one in the checkout
   * the program runs from (the jar is {@code target/hullbound-cli.jar}, the suite beside {@code
   * target}), so that {@code validate} works from any folder; else {@code validation}, which the
   * validator then reports as missing.
   */
  static Path defaultSuite() {
    Path code = null;
    try {
      code = Path.of(
          ValidateCommand.class.getProtectionDomain().getCodeSource().getLocation().toURI());
    } catch (URISyntaxException | SecurityException | NullPointerException unknownLocation) {
      // No code location (a custom class loader): only the working directory is searched.
    }
    return defaultSuite(Path.of(""), code);
  }

  /**
   * {@link #defaultSuite()} for a working directory and a code location (jar or classes folder).
   */
  static Path defaultSuite(Path workingDirectory, Path code) {
    Path here = workingDirectory.resolve(SUITE_FOLDER);
    if (Files.isDirectory(here) || code == null) {
      return here;
    }
    // target/hullbound-cli.jar or target/classes: the checkout is one or two folders up.
    Path dir = code.getParent();
    for (int up = 0; up < 2 && dir != null; up++, dir = dir.getParent()) {
      if (Files.isDirectory(dir.resolve(SUITE_FOLDER))) {
        return dir.resolve(SUITE_FOLDER);
      }
    }
    return here;
  }
}

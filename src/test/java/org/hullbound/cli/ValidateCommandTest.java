package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/** {@code hullbound validate} and {@code hullbound calibrate}: output, files and exit codes. */
class ValidateCommandTest {

  private record Run(int status, String out, String err) {}

  private static Run run(String... args) {
    StringWriter out = new StringWriter();
    StringWriter err = new StringWriter();
    CommandLine command = Main.commandLine();
    command.setOut(new PrintWriter(out));
    command.setErr(new PrintWriter(err));
    int status = command.execute(args);
    return new Run(status, out.toString(), err.toString());
  }

  @Test
  void oneCasePassesWithExitZero() {
    Run run = run("validate", "--case", "gamma_poisson", "--draws", "500", "--burn-in", "100");
    assertEquals(0, run.status(), run.out() + run.err());
    assertTrue(run.out().contains("gamma_poisson  [passed]"), run.out());
    assertTrue(run.out().matches("(?s).*mean\\(lambda\\) +3\\.523810 .*pass +conjugate gamma.*"),
        run.out());
    // The case's derived quantity (let wait = 1 / lambda) is computed and checked as fit keeps it.
    assertTrue(run.out().matches("(?s).*mean\\(wait\\) +0\\.291667 .*pass +derived.*"), run.out());
    assertTrue(run.out().contains("4 of 4 quantities and 1 of 1 cases passed."), run.out());
  }

  @Test
  void aFailingCaseExitsOne(@TempDir Path suite) throws IOException {
    Path folder = Files.createDirectories(suite.resolve("wrong"));
    Files.writeString(folder.resolve("model.hbm"), "param x ~ normal(mean = 0, sd = 1)\n");
    // The true mean is 0; 1 is about 45 MCSE away at 4 x 500 exact draws.
    Files.writeString(folder.resolve("reference.csv"), "quantity,reference,floor\nmean(x),1,0\n");
    Run run = run("validate", "--suite", suite.toString(), "--draws", "500");
    assertEquals(1, run.status(), run.out() + run.err());
    assertTrue(run.out().contains("wrong  [FAILED]") && run.out().contains("FAIL"), run.out());
  }

  @Test
  void listAndUsageErrors() {
    Run list = run("validate", "--list");
    assertEquals(0, list.status());
    assertTrue(list.out().contains("truncated_normal_37\n"), list.out());
    Run unknown = run("validate", "--case", "nonesuch");
    assertEquals(2, unknown.status());
    assertTrue(unknown.err().contains("no validation case 'nonesuch'"), unknown.err());
    Run mistyped = run("validate", "--case", "gamma_poison");
    assertEquals(2, mistyped.status());
    assertTrue(mistyped.err().contains("no validation case 'gamma_poison'; did you mean"
        + " 'gamma_poisson'? the cases are "), mistyped.err());
    Run few = run("validate", "--draws", "10");
    assertEquals(2, few.status());
    assertTrue(few.err().contains("--draws must be at least 100, got 10"), few.err());
    Run noSuite = run("validate", "--suite", "no/such/folder");
    assertEquals(2, noSuite.status());
    assertTrue(noSuite.err().contains("no/such/folder"), noSuite.err());
  }

  @Test
  void calibrateWritesRanksAndHistogramsAndPasses(@TempDir Path out) throws IOException {
    Run run = run("calibrate", "validation/gamma_poisson/model.hbm", "--data",
        "validation/gamma_poisson/calls.csv",
        "--replicates", "60", "--draws", "19", "--thin", "1", "--burn-in", "20", "--seed", "5",
        "--out", out.toString());
    assertEquals(0, run.status(), run.out() + run.err());
    assertTrue(run.out().contains("Simulation-based calibration of gamma_poisson: 60 replicates"),
        run.out());
    assertTrue(run.out().matches("(?s).*lambda +[0-9.]+ +9 .*yes.*"), run.out());
    assertTrue(run.out().contains("Bonferroni"), run.out());
    assertTrue(run.out().contains("so about 1% of them fall below 0.01 by chance"), run.out());
    java.util.List<String> ranks = Files.readAllLines(out.resolve("ranks.csv"));
    assertEquals("replicate,lambda,wait", ranks.get(0), "the derived wait is ranked too");
    assertEquals(61, ranks.size());
    String svg = Files.readString(out.resolve("ranks-lambda.svg"));
    assertTrue(svg.startsWith("<svg") && svg.contains("ranks of lambda"), svg);

    // As fit does: an earlier calibration is kept unless --overwrite is given.
    Run again = run("calibrate", "validation/gamma_poisson/model.hbm", "--data",
        "validation/gamma_poisson/calls.csv", "--replicates", "10", "--draws", "19", "--seed", "5",
        "--out", out.toString());
    assertEquals(2, again.status(), again.err());
    assertTrue(again.err().contains("holds an earlier calibration (ranks-lambda.svg and 2 more);"
        + " give --overwrite to replace it"), again.err());
    assertEquals(61, Files.readAllLines(out.resolve("ranks.csv")).size());
    Run replaced = run("calibrate", "validation/gamma_poisson/model.hbm", "--data",
        "validation/gamma_poisson/calls.csv", "--replicates", "10", "--draws", "19", "--thin", "1",
        "--burn-in", "20", "--seed", "5", "--out", out.toString(), "--overwrite");
    assertTrue(replaced.status() == 0 || replaced.status() == 1, replaced.err());
    assertEquals(11, Files.readAllLines(out.resolve("ranks.csv")).size());
  }

  @Test
  void calibrateRefusesWhatItCannotDo(@TempDir Path dir) throws IOException {
    Run bins = run("calibrate", "validation/gamma_poisson/model.hbm", "--data",
        "validation/gamma_poisson/calls.csv",
        "--replicates", "50", "--draws", "99", "--bins", "7");
    assertEquals(2, bins.status());
    assertTrue(bins.err().contains("--bins must divide draws + 1 = 100"), bins.err());
    // 2 bins of at least 5 expected ranks each: 10 replicates (rank test of Talts et al. 2018).
    Run few = run("calibrate", "validation/gamma_poisson/model.hbm", "--data",
        "validation/gamma_poisson/calls.csv", "--replicates", "5", "--draws", "99");
    assertEquals(2, few.status());
    assertTrue(few.err().contains("--replicates must be at least 10 for draws = 99, got 5"),
        few.err());
    Path model = dir.resolve("covariate.hbm");
    Files.writeString(model,
        "index obs = 1 .. 3\n"
            + "data x[obs] = [1, 2, 3] ~ normal(mean = 0, sd = 1)\n"
            + "data y[obs] = [1, 2, 3] ~ normal(mean = b * x[obs], sd = 1)\n"
            + "param b ~ normal(mean = 0, sd = 1)\n");
    Run covariate = run("calibrate", model.toString(), "--replicates", "20", "--draws", "19");
    assertEquals(2, covariate.status());
    assertTrue(covariate.err().contains("modelled data [x] also appear in other statements"),
        covariate.err());
    Run missing = run("calibrate", "validation/gamma_poisson/model.hbm", "--draws", "19");
    assertEquals(2, missing.status());
    assertTrue(missing.err().contains("--replicates"), missing.err());
  }

  @Test
  void theSuiteIsFoundBesideTheJarFromAnyWorkingDirectory(@TempDir Path dir) throws IOException {
    Path checkout = dir.resolve("checkout");
    Files.createDirectories(checkout.resolve("validation"));
    Files.createDirectories(checkout.resolve("target/classes"));
    Path elsewhere = Files.createDirectories(dir.resolve("elsewhere"));
    Path jar = checkout.resolve("target/hullbound-cli.jar");
    assertEquals(checkout.resolve("validation"), ValidateCommand.defaultSuite(elsewhere, jar));
    assertEquals(checkout.resolve("validation"),
        ValidateCommand.defaultSuite(elsewhere, checkout.resolve("target/classes")));
    // The working directory's own suite comes first.
    Files.createDirectories(elsewhere.resolve("validation"));
    assertEquals(elsewhere.resolve("validation"), ValidateCommand.defaultSuite(elsewhere, jar));
  }
}

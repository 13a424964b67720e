package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/** {@code hullbound check}: its output for the bundled demo models and its exit codes. */
class CheckCommandTest {

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
  void theSeedlingsDemoShowsItsDataGraphUnknownsUpdatesAndReasons() {
    Run run = run("check", "models/seedlings.hbm", "--data", "models/seedlings.csv");
    assertEquals(0, run.status(), run.err());
    String out = run.out();
    assertTrue(out.contains("model seedlings"), out);
    assertTrue(out.contains("models/seedlings.csv: 40 rows over tray; columns planted, bench_of,"
        + " survived"), out);
    assertTrue(out.contains("bench  1 .. 8"), out);
    assertTrue(out.contains("graph: 3 data, 3 param, 0 let; 10 scalar unknowns"), out);
    assertTrue(out.matches("(?s).*centre +natural +exact normal_mean.*"), out);
    assertTrue(out.matches("(?s).*spread +log +adaptive rejection.*"), out);
    assertTrue(out.matches("(?s).*effect\\[1\\] \\.\\. effect\\[8\\] +natural +adaptive"
        + " rejection.*8 unknowns.*"), out);
    assertTrue(out.contains("log-concave on the log scale: half-normal prior"), out);
    assertTrue(out.contains("binomial terms concave in logit_p, affine in the unknown"), out);
    assertEquals("", run.err());
  }

  @Test
  void theFallbackDemoSaysWhyItsConditionalsAreNotProvablyLogConcave() {
    Run run = run("check", "models/sensors.hbm", "--data", "models/sensors.csv");
    assertEquals(0, run.status(), run.err());
    assertTrue(run.out().matches("(?s).*level +natural +fallback.*"), run.out());
    assertTrue(run.out().contains("student-t is not concave in location"), run.out());
  }

  @Test
  void theConjugateDemoGetsExactDrawsAndImputesItsMissingWeights() {
    Run run = run("check", "models/fill_weights.hbm", "--data", "models/bottles.csv", "--data",
        "models/shifts.csv");
    assertEquals(0, run.status(), run.err());
    String out = run.out();
    assertTrue(out.matches("(?s).*tau +log +exact gamma_precision.*"), out);
    assertTrue(out.matches("(?s).*reject_rate +log +exact gamma_rate.*"), out);
    assertTrue(out.matches("(?s).*weight\\[17\\], weight\\[44\\] +natural +exact predictive.*"),
        out);
    assertTrue(out.contains("2 missing, imputed"), out);
  }

  @Test
  void theLogisticDemoHasThirtySixGroupsAndTwelveHundredObservations() {
    Run run = run("check", "models/clinics.hbm", "--data", "models/clinics.csv");
    assertEquals(0, run.status(), run.err());
    assertTrue(run.out().contains("models/clinics.csv: 1200 rows over patient"), run.out());
    assertTrue(run.out().contains("effect[1] .. effect[36]"), run.out());
  }

  @Test
  void theRegressionDemoDrawsItsInterceptAndCoefficientsAsOneBlock() {
    Run run = run("check", "models/orchard.hbm", "--data", "models/orchard.csv");
    assertEquals(0, run.status(), run.err());
    String out = run.out();
    assertTrue(out.matches("(?s).*alpha +natural +exact block normal \\(4 jointly\\).*"), out);
    assertTrue(out.matches("(?s).*beta\\[1\\], beta\\[2\\], beta\\[3\\] +natural +exact block"
        + " normal \\(4 jointly\\).*"), out);
    assertTrue(out.matches("(?s).*sigma +log +adaptive rejection.*"), out);
  }

  @Test
  void aRegressionShowsItsCoefficientsAsOneExactNormalBlock(@TempDir Path dir)
      throws IOException {
    // An invented scenario: a straight-line fit with known noise, inline data.
    Path model = dir.resolve("line.hbm");
    Files.writeString(model, String.join("\n",
        "index obs = 1 .. 4",
        "data x[obs] = [0.5, 1.0, 1.5, 2.0]",
        "data y[obs] = [1.1, 2.2, 2.8, 4.1] ~ normal(mean = a + b[1] * x[obs], sd = 0.3)",
        "index k = 1 .. 1",
        "param a ~ normal(mean = 0, sd = 5)",
        "param b[k] ~ normal(mean = 0, sd = 5)",
        ""));
    Run run = run("check", model.toString());
    assertEquals(0, run.status(), run.err());
    assertTrue(run.out().matches("(?s).*  a +natural +exact block normal \\(2 jointly\\).*"),
        run.out());
    assertTrue(run.out().matches("(?s).*b\\[1\\] +natural +exact block normal \\(2 jointly\\).*"),
        run.out());
    assertTrue(run.out().contains("exact joint draw of 2: every term reading them is normal"),
        run.out());
  }

  @Test
  void theMixtureDemoMarksItsDynamicBlanketsAndItsUnknownIndices() {
    Run run = run("check", "models/mussels.hbm", "--data", "models/mussels.csv");
    assertEquals(0, run.status(), run.err());
    String out = run.out();
    assertTrue(out.matches("(?s).*centre\\[1\\], centre\\[2\\] +natural +exact block normal"
        + " \\(2 jointly\\) +121 terms each, 2 unknowns, dynamic blanket\n.*"), out);
    assertTrue(out.contains("dynamic blanket: the terms that reach it through an unknown index are"
        + " candidates; in the exact draw a candidate whose index selects another element adds"
        + " nothing"), out);
    assertTrue(out.matches("(?s).*older\\[1\\] \\.\\. older\\[120\\] +natural +exact"
        + " enumeration +2 terms each, 120 unknowns\n.*"), out);
    assertTrue(out.contains("an unknown index (an allocation)"), out);
    String spread = out.lines().filter(l -> l.startsWith("  spread ")).findFirst().orElseThrow();
    assertFalse(spread.contains("dynamic blanket"), spread);
  }

  @Test
  void anIndexThatCanLeaveItsSetIsAModelErrorWithStatusTwo(@TempDir Path dir)
      throws IOException {
    Path model = dir.resolve("bad.hbm");
    Files.writeString(model, String.join("\n",
        "index row = 1 .. 3",
        "index level = 1 .. 2",
        "param mu[level] ~ normal(mean = 0, sd = 1)",
        "param g ~ whole-uniform(lower = 0, upper = 2)",
        "data  y[row] = [1, 2, 3] ~ normal(mean = mu[g], sd = 1)",
        ""));
    Run run = run("check", model.toString());
    assertEquals(2, run.status());
    assertTrue(run.err().startsWith(model + ":5:45: the index of 'mu' reads an unknown and can"
        + " take 0 .. 2, outside index set 'level' (1 .. 2)"), run.err());
    assertFalse(run.err().contains("at org."), run.err());
  }

  @Test
  void aModelErrorIsRenderedOnStderrWithStatusTwoAndNoStackTrace(@TempDir Path dir)
      throws IOException {
    Path model = dir.resolve("bad.hbm");
    Files.writeString(model, "param mu ~ normal(mean = 0, sdev = 1)\n");
    Run run = run("check", model.toString());
    assertEquals(2, run.status());
    assertEquals("", run.out());
    assertTrue(run.err().startsWith(model + ":1:29: normal has no argument 'sdev'"), run.err());
    assertTrue(run.err().contains("  | param mu ~ normal(mean = 0, sdev = 1)"), run.err());
    assertTrue(run.err().contains("did you mean 'sd'?"), run.err());
    assertFalse(run.err().contains("at org."), run.err());
  }

  @Test
  void aModelWithoutUnknownsIsCheckedAndSaidSoButNotFitted(@TempDir Path dir) throws IOException {
    Path model = dir.resolve("known.hbm");
    Files.writeString(model, "model known\ndata x = 3\n");
    Run check = run("check", model.toString());
    assertEquals(0, check.status(), check.err());
    assertTrue(check.out().contains("none: the model has no param and no missing data"),
        check.out());
    Run fit = run("fit", model.toString(), "--out", dir.resolve("out").toString(), "--seed", "1");
    assertEquals(2, fit.status(), fit.err());
    assertTrue(fit.err().startsWith(model + ":1:1: model known has no unknowns"), fit.err());
    assertFalse(fit.err().contains("internal error"), fit.err());
  }

  @Test
  void aDataErrorNamesTheFileRowAndColumn(@TempDir Path dir) throws IOException {
    Path data = dir.resolve("trays.csv");
    Files.writeString(data, "planted,bench_of,survived\n20,1,15\n22,9,11\n");
    Run run = run("check", "models/seedlings.hbm", "--data", data.toString());
    assertEquals(2, run.status());
    assertTrue(run.err().startsWith(data + ":3:2: index value 9 is outside index set 'bench'"),
        run.err());
  }

  @Test
  void aMissingFileIsAUserErrorWithoutTrace() {
    Run run = run("check", "no/such/model.hbm");
    assertEquals(2, run.status());
    assertEquals("hullbound: cannot read 'no/such/model.hbm': no such file\n", run.err());
  }

  @Test
  void debugAddsTheStackTrace() {
    Run run = run("check", "--debug", "no/such/model.hbm");
    assertEquals(2, run.status());
    assertTrue(run.err().contains("NoSuchFileException"), run.err());
    assertTrue(run.err().contains("at org.hullbound.cli.CheckCommand"), run.err());
  }

  @Test
  void aMissingModelArgumentIsAUsageError() {
    Run run = run("check");
    assertEquals(2, run.status());
    assertTrue(run.err().contains("MODEL"), run.err());
  }

  @Test
  void aModelThatReadsDataSaysThatNoDataFileWasGiven() {
    Run run = run("check", "models/orchard.hbm");
    assertEquals(2, run.status());
    assertEquals("hullbound check: no data file was given, but models/orchard.hbm reads the data"
        + " 'X' and 'yield' from one; give it with --data FILE.csv\n", run.err());
  }

  @Test
  void aDataFileGivenAfterTheModelIsToldToUseDataOption() {
    Run run = run("check", "models/orchard.hbm", "models/orchard.csv");
    assertEquals(2, run.status());
    assertEquals("hullbound check: 'models/orchard.csv' is given after the model file; a data"
        + " file is named with --data, as in --data models/orchard.csv\n", run.err());
    Run fit = run("fit", "models/orchard.hbm", "models/orchard.csv");
    assertTrue(fit.err().startsWith("hullbound fit: 'models/orchard.csv' is given after"),
        fit.err());
    // Other usage errors keep picocli's message.
    assertTrue(run("check", "models/orchard.hbm", "--bogus").err().contains("Unknown option"));
  }
}

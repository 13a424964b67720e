package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code check} and {@code fit} on derived quantities and on data as real files hold it: which
 * lets are kept, how many cells will be imputed, {@code --no-empty-cells}, and a scalar without a
 * value (exit 2 with a positioned message, never an internal error).
 */
class DerivedAndDataOptionsTest {
  @TempDir Path folder;

  private static final String MODEL =
      String.join(
          "\n",
          "index day",
          "data count[day] ~ poisson(rate = rate[day])",
          "data exposure[day]",
          "param lambda ~ gamma(shape = 2, rate = 1)",
          "keep let rate[day] = lambda * exposure[day]",
          "let log_rate[day] = log(rate[day])",
          "let wait = 1 / lambda",
          "hide let double = 2 * lambda",
          "");

  private Path write(String name, String text) throws Exception {
    Path file = folder.resolve(name);
    Files.writeString(file, text);
    return file;
  }

  @Test
  void checkListsEveryLetAsKeptOrNotAndTheCellsToImpute() throws Exception {
    Path model = write("m.hbm", MODEL);
    Path data = write("d.csv", "count,exposure\n3,1\n\"\",2\nNA,1\n4,1.5\n");
    CliRun run = CliRun.of("check", model.toString(), "--data", data.toString());
    assertEquals(0, run.exit(), run.toString());
    String out = run.out();
    assertTrue(out.contains("2 cells of 'count' in " + data + " are missing (empty or NA) and"
        + " will be imputed"), out);
    assertTrue(out.contains("lets: kept with the draws or not; why"), out);
    assertTrue(out.matches("(?s).*\n  rate\\[day\\] +kept \\(4 columns\\) +marked keep\n.*"), out);
    assertTrue(out.matches("(?s).*\n  log_rate\\[day\\] +not kept +a vector: write 'keep let' to"
        + " keep it\n.*"), out);
    assertTrue(out.matches("(?s).*\n  wait +kept +a scalar: kept by default\n.*"), out);
    assertTrue(out.matches("(?s).*\n  double +not kept +marked hide\n.*"), out);
  }

  @Test
  void fitSaysWhatItImputesAndNoEmptyCellsRefusesTheFirstEmptyCell() throws Exception {
    Path model = write("m.hbm", MODEL);
    Path data = write("d.csv", "count,exposure\n3,1\nNA,2\n\"\",1\n4,1.5\n");
    Path out = folder.resolve("out");
    CliRun refused =
        CliRun.of("fit", model.toString(), "--data", data.toString(), "--no-empty-cells",
            "--out", out.toString(), "--quiet");
    assertEquals(2, refused.exit(), refused.toString());
    assertTrue(refused.err().startsWith(data + ":4:1: empty cell in column 'count' for"
        + " 'count[3]'"), refused.err());
    assertTrue(refused.errorIsPlain(), refused.toString());
    assertFalse(Files.exists(out.resolve("draws.csv")), "nothing sampled");

    CliRun fitted =
        CliRun.of("fit", model.toString(), "--data", data.toString(), "--out", out.toString(),
            "--quiet", "--draws", "200", "--burn-in", "50", "--seed", "3");
    assertEquals(0, fitted.exit(), fitted.toString());
    assertTrue(fitted.err().contains("hullbound fit: note: 2 cells of 'count' in " + data
        + " are missing (empty or NA) and will be imputed"), fitted.err());
    String header = Files.readAllLines(out.resolve("draws.csv")).get(0);
    assertEquals("chain,draw,lambda,count[2],count[3],rate[1],rate[2],rate[3],rate[4],wait",
        header);
    assertTrue(fitted.out().matches("(?s).*\nwait +\\|.*\\| +derived +n/a\n.*"), fitted.out());

    // Read back: summarize summarises the derived columns, report DIR marks them from summary.csv.
    CliRun summarized = CliRun.of("summarize", out.resolve("draws.csv").toString());
    assertEquals(0, summarized.exit(), summarized.toString());
    assertTrue(summarized.out().matches("(?s).*\nwait +\\| .*"), summarized.out());
    Files.delete(out.resolve("report.html"));
    CliRun report = CliRun.of("report", out.toString());
    assertEquals(0, report.exit(), report.toString());
    String page = Files.readString(out.resolve("report.html"));
    assertTrue(page.contains("Not drawn: a let quantity, computed from the unknowns at each kept"
        + " draw."), "the cost answer of a derived quantity");
  }

  @Test
  void aScalarGivenNoValueIsAPlainErrorWithExitTwo() throws Exception {
    Path model = write("m.hbm",
        "index t\ndata n\ndata y[t] ~ normal(mean = mu, sd = n)\n"
            + "param mu ~ normal(mean = 0, sd = 1)\n");
    Path data = write("y.csv", "y\n1\n2\n");
    CliRun run = CliRun.of("check", model.toString(), "--data", data.toString());
    assertEquals(2, run.exit(), run.toString());
    assertTrue(run.err().startsWith(model + ":2:6: no value for the scalar data 'n'"), run.err());
    assertTrue(run.errorIsPlain(), run.toString());

    Path scalars = write("n.csv", "n\n0.5\n");
    CliRun bound =
        CliRun.of("check", model.toString(), "--data", data.toString(), "--data",
            scalars.toString());
    assertEquals(0, bound.exit(), bound.toString());
    assertTrue(bound.out().contains(scalars + ": one row of scalars; columns n"), bound.out());
  }
}

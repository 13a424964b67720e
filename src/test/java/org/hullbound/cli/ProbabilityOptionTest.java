package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code --probability}: statements as the language writes them, ranges expanded to each element,
 * the share and its MCSE printed by summarize and fit, and fit's {@code probabilities.csv}.
 */
class ProbabilityOptionTest {
  @TempDir Path folder;

  @Test
  void summarizePrintsTheShareOfEachElementOfARange() throws Exception {
    // 2 chains of 4 draws: effect[1] above 0 in 6 of 8 draws, effect[2] in 1 of 8 (counted by hand)
    Path draws = Files.writeString(folder.resolve("draws.csv"),
        "chain,draw,effect[1],effect[2]\n1,1,0.5,-1\n1,2,-0.1,-2\n1,3,0.7,0.3\n1,4,1.2,-0.5\n"
            + "2,1,0.2,-0.7\n2,2,-0.4,-0.1\n2,3,0.9,-1.5\n2,4,0.3,-0.2\n");
    CliRun run = CliRun.of("summarize", draws.toString(), "--probability", "effect[1..2] > 0",
        "--probability", "effect[2]<-1");
    assertEquals(0, run.exit(), run.toString());
    assertTrue(run.out().contains("  P(effect[1] > 0)  = 0.7500 +- "), run.out());
    assertTrue(run.out().contains("  P(effect[2] > 0)  = 0.1250 +- "), run.out());
    assertTrue(run.out().contains("  P(effect[2] < -1) = 0.2500 +- "), run.out());
  }

  @Test
  void aStatementThatIsMalformedOrNamesNoUnknownExitsTwo() throws Exception {
    Path draws = Files.writeString(folder.resolve("draws.csv"), "x\n1\n2\n3\n4\n5\n");
    for (List<String> bad : List.of(List.of("y > 0", "there is no unknown y"),
        List.of("x >= 0", "expected a statement"), List.of("x > 22d", "'22d' is not a number"))) {
      CliRun run = CliRun.of("summarize", draws.toString(), "--probability", bad.get(0));
      assertEquals(2, run.exit(), run.toString());
      assertTrue(run.err().contains(bad.get(1)), run.toString());
      assertTrue(run.errorIsPlain(), run.toString());
    }
  }

  @Test
  void fitWritesProbabilitiesCsvInItsFolder() throws Exception {
    Path out = folder.resolve("run");
    CliRun run = CliRun.of("fit", "models/seedlings.hbm", "--data", "models/seedlings.csv",
        "--quiet", "--seed", "2", "--draws", "200", "--burn-in", "200", "--out", out.toString(),
        "--probability", "spread < 0.5");
    assertEquals(0, run.exit(), run.toString());
    assertTrue(run.out().contains("  P(spread < 0.5) = "), run.out());
    List<String> lines = Files.readAllLines(out.resolve("probabilities.csv"));
    assertEquals("unknown,side,value,probability,mcse,indicator_ess", lines.get(0));
    assertTrue(lines.get(1).startsWith("\"spread\",below,0.5,"), lines.toString());
  }

  @Test
  void theReportShowsTheStatementsAfterFitAndAfterReportDir() throws Exception {
    Path out = folder.resolve("run");
    CliRun run = CliRun.of("fit", "models/seedlings.hbm", "--data", "models/seedlings.csv",
        "--quiet", "--seed", "2", "--draws", "200", "--burn-in", "200", "--out", out.toString(),
        "--probability", "effect[1..2] > 0");
    assertEquals(0, run.exit(), run.toString());
    // the share printed on the terminal is the one the page shows, to its four decimals
    String printed = run.out().substring(run.out().indexOf("P(effect[1] > 0) = ") + 19);
    String share = printed.substring(0, 6);
    for (String page : List.of(
        Files.readString(out.resolve("report.html")), rerendered(out))) {
      int section = page.indexOf("<section id=\"probabilities\">");
      assertTrue(section > page.indexOf("id=\"summary\""), "the statements follow the summary");
      assertTrue(page.contains("<a href=\"#probabilities\">"), "the contents link to them");
      String table = page.substring(section, page.indexOf("</section>", section));
      assertTrue(table.contains("<td class=\"statement\">effect[1] &gt; 0</td><td>" + share),
          table);
      assertTrue(table.contains("<td class=\"statement\">effect[2] &gt; 0</td>"), table);
    }
  }

  @Test
  void fitRefusesAStatementNamingNoColumnBeforeItSamples() throws Exception {
    Path out = folder.resolve("refused");
    CliRun run = CliRun.of("fit", "models/seedlings.hbm", "--data", "models/seedlings.csv",
        "--quiet", "--seed", "2", "--draws", "200", "--burn-in", "200", "--out", out.toString(),
        "--probability", "efect[1] > 0");
    assertEquals(2, run.exit(), run.toString());
    assertTrue(run.errorIsPlain(), run.toString());
    assertTrue(run.err().contains("efect[1]"), run.err());
    assertTrue(!Files.exists(out.resolve("draws.csv")), "nothing was sampled");
  }

  private static String rerendered(Path out) throws Exception {
    Files.delete(out.resolve("report.html"));
    CliRun report = CliRun.of("report", out.toString());
    assertEquals(0, report.exit(), report.toString());
    return Files.readString(out.resolve("report.html"));
  }
}

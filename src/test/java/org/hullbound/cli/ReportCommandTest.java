package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code hullbound report DIR} renders the page of a fit again from its folder, without
 * refitting: the same unknowns, update facts and model text, at the interval level asked.
 */
class ReportCommandTest {
  @TempDir static Path shared;
  private static Path run;

  @BeforeAll
  static void fitOnce() {
    run = shared.resolve("fill");
    CliRun fit =
        CliRun.of("fit", "models/fill_weights.hbm", "--data", "models/bottles.csv", "--data",
            "models/shifts.csv", "--chains", "2", "--burn-in", "50", "--draws", "100", "--seed",
            "5", "--out", run.toString(), "--quiet");
    assertEquals(0, fit.exit(), fit.err());
  }

  @Test
  void fitsPageCarriesTheModelTextAndRowsAndImputedCellsPerDataFile() throws Exception {
    String page = Files.readString(run.resolve("report.html"));
    assertTrue(page.contains("<section id=\"sources\">"));
    assertTrue(page.contains("bottles.csv"), "data file named");
    assertTrue(page.contains("missing cells imputed"), "the two missing weights");
    assertTrue(page.contains("<pre class=\"model\">"));
  }

  @Test
  void reRendersFromTheFolderWithTheSameUnknownsAndUpdateFacts() throws Exception {
    String before = Files.readString(run.resolve("report.html"));
    Path page = shared.resolve("again.html");
    CliRun again = CliRun.of("report", run.toString(), "--out", page.toString(), "--level", "0.9");
    assertEquals(0, again.exit(), again.err());
    assertTrue(again.out().contains("report: " + page), again.out());
    String after = Files.readString(page);
    assertEquals(rows(before), rows(after));
    assertTrue(rows(after) > 0);
    assertTrue(after.contains("adaptive rejection") || after.contains("conjugate"), "update facts");
    assertTrue(after.contains("<th>90% interval</th>"));
    assertFalse(after.contains("Re-rendered"), "run.txt holds every header fact");
    assertTrue(after.contains("<dd>5</dd>"), "the seed from run.txt");
    // Header, model text and data facts are those fit wrote.
    assertEquals(section(before, "<header"), section(after, "<header"));
    assertEquals(section(before, "<section id=\"sources\">"),
        section(after, "<section id=\"sources\">"));
  }

  private static String section(String page, String start) {
    int from = page.indexOf(start);
    return page.substring(from, page.indexOf("\n", from));
  }

  @Test
  void aFolderWithoutRunFactsStillRendersAndSaysWhatItLacks() throws Exception {
    Path old = shared.resolve("old");
    Files.createDirectories(old);
    Files.copy(run.resolve("draws.csv"), old.resolve("draws.csv"));
    CliRun again = CliRun.of("report", old.toString());
    assertEquals(0, again.exit(), again.err());
    assertTrue(again.err().contains("no summary.csv"), again.err());
    String page = Files.readString(old.resolve("report.html"));
    assertTrue(page.contains("without run.txt"));
    assertTrue(page.contains("no checkpoint.txt"));
    assertEquals(rows(Files.readString(run.resolve("report.html"))), rows(page));
  }

  @Test
  void anUnreadableRunFactsFileIsAUserErrorNamingTheLine() throws Exception {
    Path broken = shared.resolve("broken");
    Files.createDirectories(broken);
    Files.copy(run.resolve("draws.csv"), broken.resolve("draws.csv"));
    Files.writeString(broken.resolve("run.txt"), "# facts\nstarted: yesterday\n");
    CliRun again = CliRun.of("report", broken.toString());
    assertEquals(2, again.exit());
    assertTrue(again.err().contains("run.txt, line 2: 'started' has an unreadable value"),
        again.err());
    assertTrue(again.errorIsPlain(), again.err());
  }

  private static int rows(String page) {
    return page.split("<td class=\"name\">", -1).length - 1;
  }

  @Test
  void aFolderWithoutDrawsIsAUserErrorWithAClearMessage() {
    CliRun none = CliRun.of("report", shared.resolve("nothing").toString());
    assertEquals(2, none.exit());
    assertTrue(none.err().contains("is not a folder"), none.err());
    CliRun level = CliRun.of("report", run.toString(), "--level", "1.5");
    assertEquals(2, level.exit());
    assertTrue(level.err().contains("--level must lie strictly between 0 and 1"), level.err());
  }

  @Test
  void summarizeTakesTheIntervalLevelToo() {
    CliRun ninety = CliRun.of("summarize", run.resolve("draws.csv").toString(), "--level", "0.9");
    assertEquals(0, ninety.exit(), ninety.err());
    assertTrue(ninety.out().contains("90% interval"), ninety.out());
    CliRun bad = CliRun.of("summarize", run.resolve("draws.csv").toString(), "--level", "0");
    assertEquals(2, bad.exit());
    assertTrue(bad.err().contains("--level must lie strictly between 0 and 1"), bad.err());
  }

  @Test
  void aModelNameComesFromTheModelStatementElseTheFileName() {
    assertEquals("seedlings", ReportCommand.modelName("# x\nmodel seedlings\nindex a\n", "m.hbm"));
    assertEquals("fill_weights", ReportCommand.modelName("", "models/fill_weights.hbm"));
    assertEquals("", ReportCommand.modelName("", ""));
  }

  @Test
  void updateFactsAreReadInTheLanguagesNumberGrammarOnly() throws Exception {
    Path summary = shared.resolve("facts").resolve("summary.csv");
    Files.createDirectories(summary.getParent());
    String header = "unknown,update,evaluations_per_draw,fallback,fallback_sweep\n";
    java.io.StringWriter notes = new java.io.StringWriter();
    Files.writeString(summary,
        header + "a,adaptive rejection,2.5,no,\nb,ARMS fallback,7,switched,120\n"
        + "c,derived,NaN,no,\n");
    var facts = ReportCommand.updateFacts(summary, new java.io.PrintWriter(notes));
    assertEquals(3, facts.size(), notes.toString());
    assertEquals(120, facts.get("b").switchSweep());
    // Java's own forms (a type suffix here) are not numbers of the language: the file is not used
    Files.writeString(summary, header + "a,adaptive rejection,2.5d,no,\n");
    assertTrue(ReportCommand.updateFacts(summary, new java.io.PrintWriter(notes)).isEmpty());
    assertTrue(notes.toString().contains("could not be read"), notes.toString());
  }
}

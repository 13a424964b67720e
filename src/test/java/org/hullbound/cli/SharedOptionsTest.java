package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Options shared by commands are declared once (picocli mixins) and read the same everywhere;
 * every failure goes through {@link ErrorReporting}, so {@code --debug} shows its stack trace on
 * every path.
 */
class SharedOptionsTest {
  @TempDir Path folder;

  @Test
  void theOutputFolderOptionNamesEachCommandsOwnDefaultFolder() {
    CliRun fit = CliRun.of("fit", "--help");
    CliRun calibrate = CliRun.of("calibrate", "--help");
    assertTrue(fit.out().contains("fit-out/<model name>"), fit.out());
    assertTrue(calibrate.out().contains("calibrate-out/<model name>"), calibrate.out());
  }

  @Test
  void modelDataAndSeedAreTheSameOptionsInEveryCommandThatTakesThem() {
    for (String command : new String[] {"check", "fit", "calibrate", "fit-units"}) {
      CliRun help = CliRun.of(command, "--help");
      assertTrue(help.out().contains("MODEL"), command + help.out());
      assertTrue(help.out().contains("--data=FILE"), command + help.out());
    }
    for (String command : new String[] {"fit", "calibrate", "validate", "fit-units"}) {
      CliRun help = CliRun.of(command, "--help");
      assertTrue(help.out().contains("--seed=S"), command + help.out());
    }
  }

  @Test
  void underDebugTheStartValueErrorOfFitPrintsItsStackTraceAndStillExitsTwo() throws Exception {
    Path init = Files.writeString(folder.resolve("init.csv"), "spread,-1\n");
    String[] args = {"fit", "models/seedlings.hbm", "--data", "models/seedlings.csv", "--quiet",
        "--init", init.toString(), "--out", folder.resolve("out").toString()};
    CliRun plain = CliRun.of(args);
    assertEquals(2, plain.exit(), plain.toString());
    assertTrue(plain.errorIsPlain(), plain.toString());
    assertTrue(plain.err().startsWith("hullbound fit: " + init + ": "), plain.err());

    String[] debugArgs = new String[args.length + 1];
    debugArgs[0] = "--debug";
    System.arraycopy(args, 0, debugArgs, 1, args.length);
    CliRun debug = CliRun.of(debugArgs);
    assertEquals(2, debug.exit(), debug.toString());
    assertTrue(debug.err().contains("StartingValueException"), debug.err());
    assertTrue(debug.err().contains("\tat "), debug.err());
  }

  @Test
  void underDebugARefusedRunPrintsItsStackTraceAndStillExitsTwo() {
    CliRun debug = CliRun.of("--debug", "fit", "models/seedlings.hbm", "--data",
        "models/seedlings.csv", "--chains", "0", "--out", folder.resolve("out").toString());
    assertEquals(2, debug.exit(), debug.toString());
    assertTrue(debug.err().contains("--chains must be at least 1, got 0"), debug.err());
    assertTrue(debug.err().contains("RunRefusedException"), debug.err());
  }

  /** --level is one mixin (issue 10: it was declared three times, with two wordings). */
  @Test
  void theLevelIsOneMixinInFitSummarizeAndReport() {
    picocli.CommandLine main = Main.commandLine();
    String description = null;
    for (String command : new String[] {"fit", "summarize", "report"}) {
      picocli.CommandLine.Model.CommandSpec spec =
          main.getSubcommands().get(command).getCommandSpec();
      assertTrue(spec.mixins().values().stream()
              .anyMatch(mixin -> mixin.userObject() instanceof LevelOption), command);
      String text = String.join(" ", spec.findOption("--level").description());
      assertEquals(description == null ? text : description, text, command);
      description = text;
      CliRun bad = CliRun.of(command, "--level", "1.5", "x");
      assertEquals(2, bad.exit(), command + bad);
      assertTrue(bad.err().contains("--level must lie strictly between 0 and 1, e.g. 0.9; got 1.5"),
          command + bad);
    }
  }
}

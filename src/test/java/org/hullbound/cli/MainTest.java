package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class MainTest {

  @Test
  void versionNamesTheProgramAndExitsZero() {
    StringWriter out = new StringWriter();
    CommandLine command = Main.commandLine();
    command.setOut(new PrintWriter(out));
    assertEquals(0, command.execute("--version"));
    assertTrue(out.toString().startsWith("hullbound "), out.toString());
  }

  @Test
  void anUnknownOptionIsAUsageErrorWithStatusTwo() {
    StringWriter err = new StringWriter();
    CommandLine command = Main.commandLine();
    command.setErr(new PrintWriter(err));
    assertEquals(2, command.execute("--no-such-option"));
    assertTrue(err.toString().contains("--no-such-option"), err.toString());
  }

  /**
   * Out of memory, each command is told what it can change: more heap always, the options that
   * shrink what it holds only where it has them ({@code check} and {@code summarize} have no
   * {@code --draws}).
   */
  @Test
  void theOutOfMemoryAdviceFitsTheCommandThatRan() {
    for (String command : new String[] {"check", "summarize"}) {
      String message = Main.outOfMemory(command);
      assertTrue(message.startsWith("hullbound " + command + ": out of memory;"), message);
      assertTrue(message.contains("-Xmx8g"), message);
      assertFalse(message.contains("--"), message);
    }
    assertTrue(Main.outOfMemory("fit").contains("--draws, or --thin K"));
    assertTrue(Main.outOfMemory("calibrate").contains("--replicates"));
    assertTrue(Main.outOfMemory("fit-units").contains("--workers"));
    assertTrue(Main.outOfMemory("validate").contains("--case"));
    assertTrue(Main.outOfMemory("draw").contains("(--draws)"));
    assertEquals("hullbound: out of memory; give the JVM more, e.g. HULLBOUND_JAVA_OPTS=-Xmx8g",
        Main.outOfMemory(null));
  }

  /**
   * An {@link OutOfMemoryError} thrown while a command runs (injected as the command line's
   * execution, after its arguments are parsed) reaches the user as one line naming that command,
   * with advice it can follow, exit status 1 and no stack trace: {@code check} of a file too large
   * for the heap was told to keep fewer draws once (issue 14), an option it does not have.
   */
  @Test
  void anOutOfMemoryErrorWhileACommandRunsIsOneLineFittingThatCommand() {
    String check = runOutOfMemory("check", "models/clinics.hbm", "--data", "models/clinics.csv");
    assertEquals("hullbound check: out of memory; give the JVM more, e.g."
        + " HULLBOUND_JAVA_OPTS=-Xmx8g\n", check);
    String fit = runOutOfMemory("fit", "models/clinics.hbm", "--data", "models/clinics.csv");
    assertTrue(fit.startsWith("hullbound fit: out of memory;"), fit);
    assertTrue(fit.contains("--draws"), fit);
    assertFalse(fit.contains("at org.") || fit.contains("Exception"), fit);
  }

  /** What standard error shows when {@code args} run out of memory; the exit status must be 1. */
  private static String runOutOfMemory(String... args) {
    CommandLine line = Main.commandLine();
    line.setExecutionStrategy(parsed -> {
      throw new OutOfMemoryError("Java heap space");
    });
    java.io.PrintStream original = System.err;
    java.io.ByteArrayOutputStream err = new java.io.ByteArrayOutputStream();
    try {
      System.setErr(new java.io.PrintStream(err, true, java.nio.charset.StandardCharsets.UTF_8));
      assertEquals(1, Main.run(line, args));
    } finally {
      System.setErr(original);
    }
    return err.toString(java.nio.charset.StandardCharsets.UTF_8);
  }

  /** Every option an out-of-memory message names exists on its command. */
  @Test
  void theOutOfMemoryAdviceNamesOnlyOptionsOfItsCommand() {
    CommandLine line = Main.commandLine();
    for (String command : line.getSubcommands().keySet()) {
      String message = Main.outOfMemory(command);
      java.util.regex.Matcher option = java.util.regex.Pattern.compile("--[a-z-]+").matcher(message);
      while (option.find()) {
        assertTrue(line.getSubcommands().get(command).getCommandSpec().findOption(option.group()) != null,
            command + " has no " + option.group() + ": " + message);
      }
    }
  }
}

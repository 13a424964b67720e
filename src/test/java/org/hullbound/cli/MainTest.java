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

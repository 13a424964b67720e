package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
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
}

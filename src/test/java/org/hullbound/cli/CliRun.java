package org.hullbound.cli;

import java.io.PrintWriter;
import java.io.StringWriter;
import picocli.CommandLine;

/** Runs the {@code hullbound} command line in-process and captures its exit status and output. */
record CliRun(int exit, String out, String err) {

  static CliRun of(String... args) {
    StringWriter out = new StringWriter();
    StringWriter err = new StringWriter();
    CommandLine command = Main.commandLine();
    command.setOut(new PrintWriter(out, true));
    command.setErr(new PrintWriter(err, true));
    int exit = command.execute(args);
    return new CliRun(exit, out.toString(), err.toString());
  }

  /** True when the error output shows no stack trace and no internal error. */
  boolean errorIsPlain() {
    return !err.contains("\tat ")
        && !err.contains("internal error")
        && !err.contains("Exception")
        && !err.isBlank();
  }

  @Override
  public String toString() {
    return "exit " + exit + "\n--- stdout\n" + out + "--- stderr\n" + err;
  }
}

package org.hullbound.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.NoSuchFileException;
import org.hullbound.lang.ModelException;
import picocli.CommandLine;

/**
 * Turns every failure of every command into a message and an exit status, shared by all
 * subcommands: a model or data error prints its positioned rendering and exits 2, an unreadable
 * file exits 2, anything else exits 1; a stack trace is printed only under {@code --debug}.
 *
 * <p>Installed once on the top-level command line by {@link Main#commandLine()}, so a new command
 * (such as {@code fit}) gets the same behaviour by being registered as a subcommand.
 */
public final class ErrorReporting implements CommandLine.IExecutionExceptionHandler {

  /** Exit status for a usage, model or data error. */
  public static final int USER_ERROR = 2;

  /** Exit status for a failure of the program itself (including sampling failures). */
  public static final int FAILURE = 1;

  private ErrorReporting() {}

  /** Installs the handler on {@code commandLine} and its subcommands; returns it. */
  public static CommandLine install(CommandLine commandLine) {
    commandLine.setExecutionExceptionHandler(new ErrorReporting());
    return commandLine;
  }

  @Override
  public int handleExecutionException(
      Exception exception, CommandLine commandLine, CommandLine.ParseResult parseResult) {
    PrintWriter err = commandLine.getErr();
    int status;
    if (exception instanceof ModelException model) {
      err.print(model.render());
      status = USER_ERROR;
    } else if (exception instanceof UncheckedIOException io) {
      err.println("hullbound: " + describe(io.getCause(), io.getMessage()));
      status = USER_ERROR;
    } else if (exception instanceof IOException io) {
      err.println("hullbound: " + describe(io, io.getMessage()));
      status = USER_ERROR;
    } else {
      err.println(
          "hullbound: internal error: " + exception
              + (debug(parseResult) ? "" : " (run again with --debug for the stack trace)"));
      status = FAILURE;
    }
    if (debug(parseResult)) {
      exception.printStackTrace(err);
    }
    err.flush();
    return status;
  }

  private static String describe(IOException io, String message) {
    if (io instanceof NoSuchFileException missing) {
      return "cannot read '" + missing.getFile() + "': no such file";
    }
    return message;
  }

  /** True when {@code --debug} was given on the command or any of its parents. */
  static boolean debug(CommandLine.ParseResult parseResult) {
    for (CommandLine.ParseResult r = parseResult; r != null; r = r.subcommand()) {
      if (r.hasMatchedOption("--debug")) {
        return true;
      }
    }
    return false;
  }
}

package org.hullbound.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.NoSuchFileException;
import java.util.List;
import org.hullbound.app.BatchStoppedException;
import org.hullbound.app.HeapExhaustedException;
import org.hullbound.app.RunRefusedException;
import org.hullbound.app.SamplingFailedException;
import org.hullbound.app.StartupStoppedException;
import org.hullbound.gibbs.StartingValueException;
import org.hullbound.io.CheckpointException;
import org.hullbound.lang.ModelException;
import org.hullbound.model.SimulationException;
import org.hullbound.validation.InvalidCaseException;
import picocli.CommandLine;

/**
 * Turns every failure of every command into a message and an exit status, shared by all
 * subcommands: a model or data error prints its positioned rendering and exits 2; a refused run,
 * an unusable starting value, checkpoint, validation case or simulation, or an unreadable file
 * exits 2 with its message; a failed sampling run exits 1 and says where its draws are; a run
 * that ran out of heap exits 1 saying where it was and what helps there; anything else exits 1 as
 * an internal error. A stack trace is printed only under {@code --debug}, and then
 * on every path.
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
    String command = "hullbound " + commandLine.getCommandName() + ": ";
    if (exception instanceof StartupStoppedException) {
      // the signal's handler has said so; the JVM ends with the signal's status
      status = FAILURE;
    } else if (exception instanceof ModelException model) {
      err.print(model.render());
      status = USER_ERROR;
    } else if (isUserError(exception)) {
      err.println(command + exception.getMessage());
      status = USER_ERROR;
    } else if (exception instanceof BatchStoppedException stopped) {
      err.println(command + stopped.getMessage());
      status = FAILURE;
    } else if (exception instanceof HeapExhaustedException full) {
      err.println(Main.outOfMemory(commandLine.getCommandName(), full));
      if (full.drawsFile() != null) {
        err.println("  the draws made before it are in " + full.drawsFile());
      }
      status = FAILURE;
    } else if (exception instanceof SamplingFailedException failed) {
      err.println(command + failed.getMessage());
      err.println("  the draws made before the failure are in " + failed.drawsFile());
      status = FAILURE;
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

  /**
   * The typed failures that mean the input or the options must change: exit 2 with the message
   * alone. One list, so that every command maps them the same way.
   */
  private static final List<Class<? extends RuntimeException>> USER_ERRORS =
      List.of(
          RunRefusedException.class, StartingValueException.class, CheckpointException.class,
          InvalidCaseException.class, SimulationException.class);

  private static boolean isUserError(Exception exception) {
    return USER_ERRORS.stream().anyMatch(type -> type.isInstance(exception));
  }

  /** Prints a usage error found by a command itself (an option out of range) and returns 2. */
  static int userError(CommandLine commandLine, String message) {
    PrintWriter err = commandLine.getErr();
    err.println("hullbound " + commandLine.getCommandName() + ": " + message);
    err.flush();
    return USER_ERROR;
  }

  private static String describe(IOException io, String message) {
    if (io instanceof NoSuchFileException missing) {
      return "cannot read '" + missing.getFile() + "': no such file";
    }
    return message;
  }

  /**
   * Prints {@code failure}'s stack trace under {@code --debug}: for a command that turns a failure
   * it expects into a message of its own, so that {@code --debug} shows a trace on that path too.
   */
  static void traceUnderDebug(CommandLine commandLine, Throwable failure) {
    if (debug(commandLine.getParseResult())) {
      PrintWriter err = commandLine.getErr();
      failure.printStackTrace(err);
      err.flush();
    }
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

package org.hullbound.cli;

import java.io.PrintWriter;
import java.util.List;
import picocli.CommandLine;

/**
 * Turns a command-line usage error that has a likelier meaning than picocli's wording into our own
 * message: a data file given as a second positional argument ({@code check m.hbm d.csv}) is told
 * to use {@code --data}. Every other usage error keeps picocli's message and usage help; the exit
 * status is {@link ErrorReporting#USER_ERROR} either way.
 */
final class UsageErrors implements CommandLine.IParameterExceptionHandler {

  private final CommandLine.IParameterExceptionHandler fallback;

  private UsageErrors(CommandLine.IParameterExceptionHandler fallback) {
    this.fallback = fallback;
  }

  /** Installs the handler on {@code commandLine} and its subcommands; returns it. */
  static CommandLine install(CommandLine commandLine) {
    commandLine.setParameterExceptionHandler(
        new UsageErrors(commandLine.getParameterExceptionHandler()));
    return commandLine;
  }

  @Override
  public int handleParseException(CommandLine.ParameterException exception, String[] args)
      throws Exception {
    CommandLine command = exception.getCommandLine();
    if (exception instanceof CommandLine.UnmatchedArgumentException unmatched
        && readsData(command)) {
      List<String> files =
          unmatched.getUnmatched().stream().filter(arg -> !arg.startsWith("-")).toList();
      if (!files.isEmpty() && files.size() == unmatched.getUnmatched().size()) {
        PrintWriter err = command.getErr();
        err.println("hullbound " + command.getCommandName() + ": " + quoted(files)
            + " given after the model file; a data file is named with --data, as in "
            + "--data " + files.get(0));
        err.flush();
        return ErrorReporting.USER_ERROR;
      }
    }
    return fallback.handleParseException(exception, args);
  }

  /** True for the commands that read a model and its data ({@link ModelOptions}). */
  private static boolean readsData(CommandLine command) {
    return command.getCommandSpec().optionsMap().containsKey("--data");
  }

  private static String quoted(List<String> files) {
    return files.size() == 1
        ? "'" + files.get(0) + "' is"
        : String.join(", ", files.stream().map(f -> "'" + f + "'").toList()) + " are";
  }
}

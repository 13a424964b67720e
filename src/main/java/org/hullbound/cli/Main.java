package org.hullbound.cli;

import org.hullbound.app.HeapExhaustedException;
import org.hullbound.gibbs.MemoryBudget;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * The {@code hullbound} command: a thin picocli front over the library's packages.
 *
 * <p>It only parses arguments, calls the library and turns typed failures into messages and exit
 * codes (0 success, 1 a sampling failure, 2 a usage, model or data error); no numerics live here.
 */
@Command(
    name = "hullbound",
    mixinStandardHelpOptions = true,
    versionProvider = VersionProvider.class,
    description = "Exact draws from log-concave densities, and Gibbs fits of small models.",
    subcommands = {
      CommandLine.HelpCommand.class,
      CheckCommand.class,
      FitCommand.class,
      SummarizeCommand.class,
      ReportCommand.class,
      DrawCommand.class,
      ValidateCommand.class,
      CalibrateCommand.class,
      FitUnitsCommand.class
    })
public final class Main implements Runnable {

  @CommandLine.Spec CommandLine.Model.CommandSpec spec;

  @CommandLine.Option(
      names = "--debug",
      scope = CommandLine.ScopeType.INHERIT,
      description = "Print the full stack trace of an error.")
  boolean debug;

  public static void main(String[] args) {
    System.exit(run(args));
  }

  /**
   * Runs the command line; an {@link Error} that escapes picocli's handling (out of memory, a
   * stack overflow) still becomes a one-line message and exit status 1, never a stack trace
   * unless {@code --debug} was given.
   */
  static int run(String[] args) {
    return run(commandLine(), args);
  }

  /** {@link #run(String[])} on {@code line} (a test may give one that fails as it runs). */
  static int run(CommandLine line, String[] args) {
    try {
      return line.execute(args);
    } catch (OutOfMemoryError e) {
      System.err.println(outOfMemory(commandName(line)));
      return ErrorReporting.FAILURE;
    } catch (Error e) {
      System.err.println("hullbound: internal error: " + e);
      if (java.util.Arrays.asList(args).contains("--debug")) {
        e.printStackTrace();
      }
      return ErrorReporting.FAILURE;
    }
  }

  /**
   * The out-of-memory message for {@code command} (its name, or null when none was parsed): more
   * heap always, and the options that shrink what that command holds, where it has any.
   */
  static String outOfMemory(String command) {
    String fewer =
        command == null ? null : switch (command) {
          case "fit" -> "keep fewer draws (--draws, or --thin K to keep every K-th sweep)";
          case "calibrate" -> "make fewer or smaller fits (--replicates, --draws, --thin)";
          case "fit-units" -> "keep fewer draws per unit (--draws, --thin) or fit fewer units at"
              + " once (--workers)";
          case "validate" -> "run fewer draws or cases (--draws, --case)";
          case "draw" -> "make fewer draws (--draws)";
          default -> null;
        };
    return "hullbound" + (command == null ? "" : " " + command)
        + ": out of memory; give the JVM more, e.g. HULLBOUND_JAVA_OPTS=-Xmx8g"
        + (fewer == null ? "" : ", or " + fewer);
  }

  /**
   * The out-of-memory message of a {@code fit} that knew where it was ({@link
   * HeapExhaustedException}): more heap always, with the launcher's way of giving it; fewer rows
   * or data columns where the data fill the heap; fewer kept draws only where they are a large
   * share of it.
   */
  static String outOfMemory(String command, HeapExhaustedException full) {
    long heap = full.heapBytes();
    long suggested = Math.max(1, (2 * heap + (1L << 30) - 1) >> 30);
    String moreHeap = "give Java more memory (HULLBOUND_JAVA_OPTS=-Xmx" + suggested
        + "g ./hullbound " + command + " ...)";
    String fewerRows = "fit fewer rows or data columns";
    String rows = full.dataRows() >= 0 ? "its " + full.dataRows() + " data rows"
        : MemoryBudget.describe(full.dataFileBytes()) + " of data files";
    String inHeap = " in a Java heap of " + MemoryBudget.describe(heap);
    String prefix = "hullbound " + command + ": out of memory while ";
    return switch (full.stage()) {
      case READING -> prefix + "reading and binding the data (" + rows + ")" + inHeap
          + ": the data's rows fill it, not the draws; " + moreHeap + " or " + fewerRows;
      case COMPILING -> prefix + "compiling the model over " + rows + inHeap
          + ": the data's rows fill it, not the draws; " + moreHeap + " or " + fewerRows;
      case SAMPLING, SUMMARISING -> {
        String where = prefix + (full.stage() == HeapExhaustedException.Stage.SAMPLING
            ? "sampling" : "summarising the draws and writing the report") + inHeap;
        String draws = MemoryBudget.describe(Math.max(0, full.keptDrawBytes()));
        yield full.drawsAreACause()
            ? where + ", of which the kept draws need about " + draws + ": keep fewer draws"
                + " (--draws, or --thin K to keep every K-th sweep) or " + moreHeap
            : where + ": the model over " + rows + " fills it (the kept draws need only about "
                + draws + "); " + moreHeap + " or " + fewerRows;
      }
    };
  }

  /** The subcommand that ran, or null when parsing did not get that far. */
  private static String commandName(CommandLine line) {
    CommandLine.ParseResult parsed = line.getParseResult();
    if (parsed == null || parsed.subcommand() == null) {
      return null;
    }
    return parsed.subcommand().commandSpec().name();
  }

  /** The configured command line, shared by {@link #main} and the tests. */
  public static CommandLine commandLine() {
    return UsageErrors.install(
        ErrorReporting.install(NumberOptions.register(new CommandLine(new Main()))));
  }

  @Override
  public void run() {
    spec.commandLine().usage(spec.commandLine().getOut());
  }
}

package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import org.hullbound.app.HeapExhaustedException;
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

  /**
   * A fit that runs out of memory says where it was and what helps there (issue 14): a fit of the
   * 200 MB clinics file ran out while binding and was told to keep fewer draws, which it could not
   * change. Injected as {@code fit}'s failure through {@link Main#run(CommandLine, String[])}, as
   * {@code FitRun} raises it (its stages are tested in {@code app.FitRunHeapTest}).
   */
  @Test
  void aFitOutOfMemoryNamesWhereItRanOutAndAdvisesOnlyWhatHelpsThere() {
    long heap = Runtime.getRuntime().maxMemory();
    HeapExhaustedException.Facts reading =
        new HeapExhaustedException.Facts(200L << 20, -1, -1);
    String read = runOutOfMemory(HeapExhaustedException.Stage.READING, reading);
    assertTrue(read.startsWith("hullbound fit: out of memory while reading and binding the data"
        + " (200.0 MiB of data files) in a Java heap of "), read);
    assertTrue(read.contains("the data's rows fill it, not the draws; give Java more memory"
        + " (HULLBOUND_JAVA_OPTS=-Xmx"), read);
    assertTrue(read.endsWith(" or fit fewer rows or data columns\n"), read);
    assertFalse(read.contains("--draws") || read.contains("--thin"), read);

    HeapExhaustedException.Facts bound = reading.withRows(23_000_000);
    String compiling = runOutOfMemory(HeapExhaustedException.Stage.COMPILING, bound);
    assertTrue(compiling.startsWith("hullbound fit: out of memory while compiling the model over"
        + " its 23000000 data rows in a Java heap of "), compiling);
    assertFalse(compiling.contains("--draws") || compiling.contains("--thin"), compiling);

    // sampling with few kept draws: the rows fill the heap, fewer draws would not help
    String fewDraws = runOutOfMemory(
        HeapExhaustedException.Stage.SAMPLING, bound.withKeptDrawBytes(heap / 100));
    assertTrue(fewDraws.startsWith(
        "hullbound fit: out of memory while sampling in a Java heap of "), fewDraws);
    assertTrue(fewDraws.contains(": the model over its 23000000 data rows fills it (the kept"
        + " draws need only about "), fewDraws);
    assertFalse(fewDraws.contains("--draws") || fewDraws.contains("--thin"), fewDraws);

    // kept draws past a quarter of the heap (MemoryBudget.NOTE_SHARE): fewer draws help
    for (HeapExhaustedException.Stage stage : new HeapExhaustedException.Stage[] {
        HeapExhaustedException.Stage.SAMPLING, HeapExhaustedException.Stage.SUMMARISING}) {
      String manyDraws = runOutOfMemory(stage, bound.withKeptDrawBytes(heap / 2));
      assertTrue(manyDraws.contains(", of which the kept draws need about "), manyDraws);
      assertTrue(manyDraws.contains(": keep fewer draws (--draws, or --thin K to keep every K-th"
          + " sweep) or give Java more memory (HULLBOUND_JAVA_OPTS=-Xmx"), manyDraws);
      assertFalse(manyDraws.contains("fewer rows"), manyDraws);
    }
    String summarising = runOutOfMemory(
        HeapExhaustedException.Stage.SUMMARISING, bound.withKeptDrawBytes(heap / 100));
    assertTrue(summarising.startsWith("hullbound fit: out of memory while summarising the draws and"
        + " writing the report in a Java heap of "), summarising);
    assertFalse(summarising.contains("--draws"), summarising);
  }

  /**
   * The heap suggested is twice this one, in whole GiB, as the launcher takes it: common practice
   * (a heap that ran out needs more than it had; doubling is the usual next try).
   */
  @Test
  void theHeapSuggestedIsTwiceTheHeapInWholeGibibytes() {
    long heap = Runtime.getRuntime().maxMemory();
    long gib = Math.max(1, (long) Math.ceil(2.0 * heap / (1L << 30)));
    String message = Main.outOfMemory("fit", HeapExhaustedException.of(
        HeapExhaustedException.Stage.READING, new HeapExhaustedException.Facts(0, -1, -1), null,
        new OutOfMemoryError()));
    assertTrue(message.contains("HULLBOUND_JAVA_OPTS=-Xmx" + gib + "g ./hullbound fit ...)"),
        message);
  }

  /** Standard error of {@code fit} failing with the heap exhausted at {@code stage}; status 1. */
  private static String runOutOfMemory(
      HeapExhaustedException.Stage stage, HeapExhaustedException.Facts facts) {
    CommandLine line = Main.commandLine();
    java.io.StringWriter err = new java.io.StringWriter();
    line.setErr(new PrintWriter(err, true));
    line.setExecutionStrategy(parsed -> {
      throw new CommandLine.ExecutionException(parsed.subcommand().commandSpec().commandLine(),
          "injected", HeapExhaustedException.of(stage, facts, null,
              new OutOfMemoryError("Java heap space")));
    });
    assertEquals(1, Main.run(line, new String[] {
        "fit", "models/clinics.hbm", "--data", "models/clinics.csv"}));
    return err.toString();
  }

  /** Every option an out-of-memory message names exists on its command. */
  @Test
  void theOutOfMemoryAdviceNamesOnlyOptionsOfItsCommand() {
    CommandLine line = Main.commandLine();
    for (String command : line.getSubcommands().keySet()) {
      String message = Main.outOfMemory(command);
      java.util.regex.Matcher option =
          java.util.regex.Pattern.compile("--[a-z-]+").matcher(message);
      while (option.find()) {
        assertTrue(line.getSubcommands().get(command).getCommandSpec().findOption(option.group()) != null,
            command + " has no " + option.group() + ": " + message);
      }
    }
  }
}

package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * {@code --debug} prints the stack trace on every error path of every command (issue 10; draw and
 * check have their own tests): the same failure without it is one plain message, with it the same
 * message, the same exit status, and the trace of the exception that {@link ErrorReporting} mapped.
 */
class DebugEveryPathTest {
  @TempDir static Path folder;

  /** A failing invocation of each command, with the exception type its trace must name. */
  private static List<String> failing(String path) throws Exception {
    Path badDraws = folder.resolve("bad-draws.csv");
    Files.writeString(badDraws, "chain,x\n1,0.5\n1,22d\n");
    Path badModel = folder.resolve("bad.hbm");
    Files.writeString(badModel, "model bad\nparam x ~ normal(mean = 0, sd = )\n");
    Path emptyRun = Files.createDirectories(folder.resolve("empty-run-" + path));
    Path init = folder.resolve("init.csv");
    Files.writeString(init, "spread,-1\n");
    return switch (path) {
      case "fit model" -> List.of("ModelException", "fit", badModel.toString(), "--quiet",
          "--out", folder.resolve("out-model").toString());
      case "fit start value" -> List.of("StartingValueException", "fit", "models/seedlings.hbm",
          "--data", "models/seedlings.csv", "--quiet", "--init", init.toString(), "--out",
          folder.resolve("out-init").toString());
      case "summarize" -> List.of("ModelException", "summarize", badDraws.toString());
      case "summarize missing file" -> List.of("NoSuchFileException", "summarize",
          folder.resolve("no-such.csv").toString());
      case "report bad draws" -> {
        Files.copy(badDraws, emptyRun.resolve("draws.csv"));
        yield List.of("ModelException", "report", emptyRun.toString());
      }
      case "report damaged checkpoint" -> {
        Files.writeString(emptyRun.resolve("draws.csv"), "chain,draw,x\n1,1,0.5\n");
        Files.writeString(emptyRun.resolve("checkpoint.txt"), "not a checkpoint\n");
        yield List.of("CheckpointException", "report", emptyRun.toString());
      }
      case "calibrate" -> List.of("ModelException", "calibrate", badModel.toString(),
          "--replicates", "100", "--out", folder.resolve("out-calibrate").toString());
      case "calibrate settings" -> List.of("IllegalArgumentException", "calibrate",
          "models/seedlings.hbm", "--data", "models/seedlings.csv", "--replicates", "5", "--out",
          folder.resolve("out-calibrate-5").toString());
      case "validate" -> List.of("Exception", "validate", "--suite",
          folder.resolve("no-such-suite").toString());
      default -> throw new IllegalArgumentException(path);
    };
  }

  @ParameterizedTest
  @ValueSource(strings = {"fit model", "fit start value", "summarize", "summarize missing file",
      "report bad draws", "report damaged checkpoint", "calibrate", "calibrate settings",
      "validate"})
  void debugAddsTheStackTraceAndNothingElseChanges(String path) throws Exception {
    List<String> invocation = failing(path);
    String exceptionType = invocation.get(0);
    List<String> args = invocation.subList(1, invocation.size());
    CliRun plain = CliRun.of(args.toArray(String[]::new));
    assertTrue(plain.exit() != 0, plain.toString());
    assertTrue(plain.errorIsPlain(), plain.toString());
    assertFalse(plain.err().contains("\tat "), plain.toString());

    List<String> withDebug = new ArrayList<>(args);
    withDebug.add(1, "--debug");
    CliRun debug = CliRun.of(withDebug.toArray(String[]::new));
    assertEquals(plain.exit(), debug.exit(), debug.toString());
    assertTrue(debug.err().startsWith(plain.err().strip().lines().findFirst().orElseThrow()),
        "the same message first: " + debug);
    assertTrue(debug.err().contains(exceptionType), debug.toString());
    assertTrue(debug.err().contains("\tat org.hullbound."), "a trace: " + debug);
  }
}

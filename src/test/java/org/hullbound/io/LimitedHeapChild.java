package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;

/**
 * Runs a class's {@code main} in a child JVM with a hard heap limit and the serial collector, on
 * this JVM's class path, and gives its exit value and what it printed: a heap test passes or
 * fails by whether the child ran out of its heap, as heap gauges read in the test JVM would be
 * disturbed by the other tests running there (issue 14: {@link CsvDataHeapTest}, {@code
 * app.FitHeapLimitTest}).
 */
public final class LimitedHeapChild {
  private LimitedHeapChild() {}

  /** The child's exit value and its standard output and error, trimmed. */
  public record Result(int exitValue, String printed) {}

  /**
   * Runs {@code main} with {@code args} under {@code heap} (such as {@code -Xmx48m}), its output
   * in {@code output}, and waits at most {@code seconds} for it.
   */
  public static Result run(String heap, Path output, long seconds, Class<?> main, String... args)
      throws IOException, InterruptedException {
    List<String> command = new ArrayList<>(List.of(
        Path.of(System.getProperty("java.home"), "bin", "java").toString(),
        heap, "-XX:+UseSerialGC", "-cp", System.getProperty("java.class.path"), main.getName()));
    command.addAll(List.of(args));
    Process child = new ProcessBuilder(command)
        .redirectErrorStream(true)
        .redirectOutput(output.toFile())
        .start();
    assertTrue(child.waitFor(seconds, TimeUnit.SECONDS), "the child finished");
    return new Result(child.exitValue(), Files.readString(output).trim());
  }
}

package org.hullbound.cli;

import java.nio.file.Path;
import picocli.CommandLine.Option;

/**
 * {@code --out DIR}, the folder a run writes its files to, declared once for every command that
 * writes a folder ({@code fit}, {@code calibrate}) as a picocli mixin.
 */
public final class OutputFolder {

  @Option(
      names = "--out",
      paramLabel = "DIR",
      description =
          "Folder for the run's files, used by one run at a time (default:"
              + " ${COMMAND-NAME}-out/<model name>).")
  Path out;

  /** The folder given, or null. */
  Path given() {
    return out;
  }

  /** The folder given, else {@code command-out/model}. */
  Path orDefault(String command, String modelName) {
    return out != null ? out : Path.of(command + "-out", modelName);
  }
}

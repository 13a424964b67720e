package org.hullbound.cli;

import org.hullbound.app.TaskEngine;
import picocli.CommandLine.Option;

/**
 * Where the independent tasks of a command run ({@code fit-units}'s units, {@code calibrate}'s
 * replicates): on local worker threads, or as Apache Spark tasks. Declared once as a picocli
 * mixin. The results do not depend on the choice.
 */
public final class EngineOptions {

  @Option(
      names = "--workers",
      paramLabel = "N",
      description = "Tasks run side by side on this machine (default: the processors).")
  Integer workers;

  @Option(
      names = "--spark",
      description =
          "Run the tasks on Apache Spark; needs hullbound-spark.jar started with spark-submit,"
              + " whose --master says where (docs/spark.md).")
  boolean spark;

  /** What is wrong with the options, or null. */
  String problem() {
    if (workers != null && workers < 1) {
      return "--workers must be at least 1, got " + workers;
    }
    if (workers != null && spark) {
      return "--workers is for local runs; with --spark the master says how many tasks run at"
          + " once (e.g. spark-submit --master 'local[4]')";
    }
    return null;
  }

  /**
   * The engine chosen.
   *
   * @throws org.hullbound.app.RunRefusedException when Spark was asked for but is not there
   */
  TaskEngine open() {
    return spark
        ? TaskEngine.distributed("spark")
        : TaskEngine.local(workers != null ? workers : Runtime.getRuntime().availableProcessors());
  }
}

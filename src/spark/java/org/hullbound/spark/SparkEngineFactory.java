package org.hullbound.spark;

import org.apache.spark.SparkConf;
import org.hullbound.app.TaskEngine;

/**
 * Offers {@link SparkTasks} as the engine called {@code spark} to {@code --spark}
 * ({@link TaskEngine#distributed}), configured from what spark-submit set (its {@code --master},
 * {@code --conf} options); found through {@code META-INF/services}.
 */
public final class SparkEngineFactory implements TaskEngine.Factory {
  @Override
  public String name() {
    return "spark";
  }

  @Override
  public TaskEngine open() {
    return SparkTasks.of(new SparkConf());
  }
}

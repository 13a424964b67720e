/**
 * Calibration replicates and the units of a batch as Apache Spark tasks ({@link
 * org.hullbound.spark.SparkTasks}): built only by the {@code spark} Maven profile, never part of
 * the plain command-line jar or of {@code mvn verify}'s class path. See docs/spark.md.
 */
package org.hullbound.spark;

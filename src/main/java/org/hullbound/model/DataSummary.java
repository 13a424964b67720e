package org.hullbound.model;

import java.util.List;

/**
 * What binding read from one data source: the file (or {@code "inline"}), the index set its rows
 * run over, its row count, its columns and how many of its cells were missing observations.
 *
 * <p>Shown by {@code hullbound check} so a user sees at a glance that the right data was read.
 */
public record DataSummary(
    String source, String indexSet, int rows, List<String> columns, int missingCells) {
  /** The {@code indexSet} of a data file of scalars (one row, no index set). */
  public static final String SCALARS = "(scalars)";

  public DataSummary {
    columns = List.copyOf(columns);
  }
}

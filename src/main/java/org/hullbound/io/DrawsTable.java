package org.hullbound.io;

import java.util.List;
import java.util.Map;

/**
 * The draws of a draws CSV, held column by column and grouped into chains, as read by {@link
 * DrawsReader}.
 *
 * <p>Why a table of its own rather than a map of arrays: it keeps the variable order of the file,
 * the chain labels and the notes on what the reader did (such as cutting chains to a common
 * length), so that a summary can say all of it. Every chain has {@link #drawsPerChain()} draws.
 */
public final class DrawsTable {
  private final String fileName;
  private final List<String> variables;
  private final Map<String, double[]> columns;
  private final List<Long> chainLabels;
  private final int[][] rowsOfChain;
  private final List<String> notes;

  DrawsTable(
      String fileName,
      List<String> variables,
      Map<String, double[]> columns,
      List<Long> chainLabels,
      int[][] rowsOfChain,
      List<String> notes) {
    this.fileName = fileName;
    this.variables = List.copyOf(variables);
    this.columns = Map.copyOf(columns);
    this.chainLabels = List.copyOf(chainLabels);
    this.rowsOfChain = rowsOfChain;
    this.notes = List.copyOf(notes);
  }

  /** The file name as given to the reader, for messages. */
  public String fileName() {
    return fileName;
  }

  /** The variable columns in file order (the chain and draw columns excluded). */
  public List<String> variables() {
    return variables;
  }

  /** The chain labels in ascending order, as written in the file (one label 1 without a column). */
  public List<Long> chainLabels() {
    return chainLabels;
  }

  /** The number of chains, at least 1. */
  public int chainCount() {
    return rowsOfChain.length;
  }

  /** The draws per chain, at least 1, the same for every chain. */
  public int drawsPerChain() {
    return rowsOfChain[0].length;
  }

  /** Plain sentences on what the reader did beyond reading, e.g. chains cut to a common length. */
  public List<String> notes() {
    return notes;
  }

  /** Whether {@code variable} is one of {@link #variables()}. */
  public boolean hasVariable(String variable) {
    return columns.containsKey(variable);
  }

  /**
   * The draws of {@code variable} as a new array {@code [chain][iteration]}, chains in the order
   * of {@link #chainLabels()}, iterations in file order.
   *
   * @throws IllegalArgumentException when there is no such variable
   */
  public double[][] draws(String variable) {
    double[] column = columns.get(variable);
    if (column == null) {
      throw new IllegalArgumentException(
          "variable must be one of the columns " + variables + " of " + fileName + ", got '"
              + variable + "'");
    }
    double[][] draws = new double[rowsOfChain.length][];
    for (int c = 0; c < rowsOfChain.length; c++) {
      int[] rows = rowsOfChain[c];
      draws[c] = new double[rows.length];
      for (int i = 0; i < rows.length; i++) {
        draws[c][i] = column[rows[i]];
      }
    }
    return draws;
  }
}

package org.hullbound.model;

import java.util.Arrays;
import java.util.BitSet;
import java.util.function.Supplier;
import org.hullbound.lang.NumberSyntax;

/**
 * One column of a data file as numbers, row by row: each cell is a finite number, missing (empty
 * or {@code NA}), or not a number.
 *
 * <p>Values live in fixed-size chunks of primitive doubles, so a column of many million rows costs
 * 8 bytes a row and grows without copying what is already read; missing and non-number cells are
 * {@code NaN} there, told apart by two bit sets. Of the cells that are not numbers only the first
 * keeps its text: binding stops at it with a message quoting it, so later ones are never shown.
 */
public final class DataColumn {
  /** Rows per chunk, as a power of two: 16,384 rows, 128 KB of doubles. */
  static final int CHUNK_BITS = 14;
  static final int CHUNK = 1 << CHUNK_BITS;

  private final double[][] chunks;
  private final int size;
  private final BitSet missing;
  private final BitSet writtenNa;
  private final int firstInvalidRow;
  private final String firstInvalidText;

  private DataColumn(
      double[][] chunks,
      int size,
      BitSet missing,
      BitSet writtenNa,
      int firstInvalidRow,
      String firstInvalidText) {
    this.chunks = chunks;
    this.size = size;
    this.missing = missing;
    this.writtenNa = writtenNa;
    this.firstInvalidRow = firstInvalidRow;
    this.firstInvalidText = firstInvalidText;
  }

  /**
   * The number a data cell holds, or {@code NaN} when its text is not a finite number. The one
   * place where a cell's text becomes a number ({@code cell} is trimmed and neither empty nor
   * {@code NA}).
   */
  static double parseCell(String cell) {
    double value;
    try {
      // The language's own number forms only: Java's parser would take 22d or 0x1.6p4.
      value = NumberSyntax.parse(cell);
    } catch (NumberSyntax.InvalidNumberException notANumber) {
      return Double.NaN;
    }
    return Double.isFinite(value) ? value : Double.NaN;
  }

  /** The number of rows. */
  public int size() {
    return size;
  }

  /** The number in {@code row}, {@code NaN} when the cell is missing or not a number. */
  public double value(int row) {
    checkRow(row);
    return chunks[row >>> CHUNK_BITS][row & (CHUNK - 1)];
  }

  /** Whether the cell in {@code row} is missing: empty or {@code NA}. */
  public boolean missing(int row) {
    checkRow(row);
    return missing.get(row);
  }

  /** Whether the cell in {@code row} is empty (missing, and not written {@code NA}). */
  public boolean empty(int row) {
    return missing(row) && !writtenNa.get(row);
  }

  /** Whether the cell in {@code row} is neither a finite number nor missing. */
  public boolean invalid(int row) {
    return Double.isNaN(value(row)) && !missing.get(row);
  }

  /**
   * The cell's text as a message shows it: {@code an empty cell}, {@code 'NA'}, the number as
   * written for the first non-number cell, or the number read.
   */
  public String shown(int row) {
    if (missing(row)) {
      return writtenNa.get(row) ? "'NA'" : "an empty cell";
    }
    if (row == firstInvalidRow) {
      return "'" + firstInvalidText + "'";
    }
    double v = value(row);
    return Double.isNaN(v) ? "a cell that is not a number" : "'" + v + "'";
  }

  /** The text of the first cell that is not a number, or {@code null} when every cell is. */
  public String firstInvalidText() {
    return firstInvalidText;
  }

  /** The row of the first cell that is not a number, or -1. */
  public int firstInvalidRow() {
    return firstInvalidRow;
  }

  /** This column with the cells in {@code rows} set to the finite {@code values}. */
  DataColumn withNumbers(int[] rows, double[] values) {
    double[][] copy = new double[chunks.length][];
    for (int c = 0; c < chunks.length; c++) {
      copy[c] = chunks[c].clone();
    }
    BitSet newMissing = (BitSet) missing.clone();
    BitSet newNa = (BitSet) writtenNa.clone();
    int invalidRow = firstInvalidRow;
    for (int k = 0; k < rows.length; k++) {
      int row = rows[k];
      checkRow(row);
      if (!Double.isFinite(values[k])) {
        throw new IllegalArgumentException("values must be finite, got " + values[k]);
      }
      copy[row >>> CHUNK_BITS][row & (CHUNK - 1)] = values[k];
      newMissing.clear(row);
      newNa.clear(row);
      if (row == invalidRow) {
        invalidRow = -1;
      }
    }
    return new DataColumn(
        copy, size, newMissing, newNa, invalidRow, invalidRow < 0 ? null : firstInvalidText);
  }

  /**
   * {@code chunks}, doubled in length when {@code index} is past its end, with chunk {@code index}
   * made by {@code make} when absent: storage that grows without copying the rows it holds.
   */
  static <A> A[] withChunk(A[] chunks, int index, Supplier<A> make) {
    A[] grown = index < chunks.length ? chunks : Arrays.copyOf(chunks, 2 * chunks.length);
    if (grown[index] == null) {
      grown[index] = make.get();
    }
    return grown;
  }

  private void checkRow(int row) {
    if (row < 0 || row >= size) {
      throw new IndexOutOfBoundsException("row " + row + " of " + size);
    }
  }

  /** Collects a column cell by cell, in row order. */
  static final class Builder {
    private double[][] chunks = new double[4][];
    private int size;
    private final BitSet missing = new BitSet();
    private final BitSet writtenNa = new BitSet();
    private int firstInvalidRow = -1;
    private String firstInvalidText;

    /** Appends the cell whose text is {@code cell} (surrounding blanks are ignored). */
    void add(String cell) {
      cell = cell.trim();
      double value = Double.NaN;
      if (cell.isEmpty()) {
        missing.set(size);
      } else if (cell.equals("NA")) {
        missing.set(size);
        writtenNa.set(size);
      } else {
        value = parseCell(cell);
        if (Double.isNaN(value) && firstInvalidRow < 0) {
          firstInvalidRow = size;
          firstInvalidText = cell;
        }
      }
      chunks = withChunk(chunks, size >>> CHUNK_BITS, () -> new double[CHUNK]);
      chunks[size >>> CHUNK_BITS][size & (CHUNK - 1)] = value;
      size++;
    }

    DataColumn build() {
      int used = (size + CHUNK - 1) >>> CHUNK_BITS;
      double[][] kept = Arrays.copyOf(chunks, used);
      if (used > 0 && (size & (CHUNK - 1)) != 0) {
        kept[used - 1] = Arrays.copyOf(kept[used - 1], size & (CHUNK - 1));
      }
      return new DataColumn(
          kept, size, (BitSet) missing.clone(), (BitSet) writtenNa.clone(), firstInvalidRow,
          firstInvalidText);
    }
  }
}

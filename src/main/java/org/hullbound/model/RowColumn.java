package org.hullbound.model;

import java.util.Arrays;

/**
 * A column of numbers, one per row of a term shape in a compiled conditional (a data value, the
 * constant or a coefficient of a linear form, a slot an entry reads): a primitive array read at
 * {@code values[row * stride]}, held as one value with stride 0 when every row has the same bits
 * (the {@code 1} of {@code intercept} in every row, the slot of {@code slope}), so that a column
 * that does not vary costs nothing per row.
 *
 * <p>Why: a compiled conditional over a file of millions of rows must hold its per-row numbers
 * without an object per row (issue 14: {@code fit} of 23 million rows in the default heap), and
 * read them in row order with no pointer to chase (issue 11: a mixture's sweep linear in rows).
 */
final class RowColumn {
  private RowColumn() {}

  /** Doubles, grown while rows are added, then {@link #finish}ed. */
  static final class Doubles {
    double[] values = new double[4];
    int stride = 1;
    private int size;
    private boolean same = true;

    void add(double value) {
      if (size == values.length) {
        values = Arrays.copyOf(values, size + (size >> 1) + 4);
      }
      values[size] = value;
      same &= size == 0
          || Double.doubleToRawLongBits(value) == Double.doubleToRawLongBits(values[0]);
      size++;
    }

    /** Trims the column, or folds it to one value (stride 0) when every row holds its bits. */
    Doubles finish() {
      values = same ? Arrays.copyOf(values, Math.min(1, size)) : Arrays.copyOf(values, size);
      stride = same ? 0 : 1;
      return this;
    }

    double at(int row) {
      return values[row * stride];
    }
  }

  /** Ints (slots), as {@link Doubles}. */
  static final class Ints {
    int[] values = new int[4];
    int stride = 1;
    private int size;
    private boolean same = true;

    void add(int value) {
      if (size == values.length) {
        values = Arrays.copyOf(values, size + (size >> 1) + 4);
      }
      values[size] = value;
      same &= size == 0 || value == values[0];
      size++;
    }

    Ints finish() {
      values = same ? Arrays.copyOf(values, Math.min(1, size)) : Arrays.copyOf(values, size);
      stride = same ? 0 : 1;
      return this;
    }

    int at(int row) {
      return values[row * stride];
    }
  }

  /** A growable int list (per-term indexes while compiling), trimmed when done. */
  static final class IntList {
    int[] values = new int[4];
    int size;

    void add(int value) {
      if (size == values.length) {
        values = Arrays.copyOf(values, size + (size >> 1) + 4);
      }
      values[size++] = value;
    }

    int[] toArray() {
      return Arrays.copyOf(values, size);
    }
  }
}

package org.hullbound.model;

import java.lang.ref.WeakReference;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

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

  /**
   * Doubles, grown while rows are added, then {@link #finish}ed; read by row only once finished. A
   * column whose rows all hold the first row's bits so far is held as that value and a count while
   * it grows (a compile of 23 million rows would otherwise hold 8 bytes a row of each constant form
   * until it finishes).
   */
  static final class Doubles {
    double[] values = new double[4];
    int stride = 1;
    private int size;
    private boolean same = true;

    void add(double value) {
      if (same) {
        // While every row holds the first row's bits, the column is that one value and a count.
        if (size == 0 || Double.doubleToRawLongBits(value)
            == Double.doubleToRawLongBits(values[0])) {
          values[0] = size == 0 ? value : values[0];
          size++;
          return;
        }
        double first = values[0];
        values = new double[size + (size >> 1) + 4];
        Arrays.fill(values, 0, size, first);
        same = false;
      }
      if (size == values.length) {
        values = Arrays.copyOf(values, size + (size >> 1) + 4);
      }
      values[size++] = value;
    }

    /**
     * Trims the column, or folds it to one value (stride 0) when every row holds its bits; a long
     * column equal bit for bit to one already made by another conditional is that one ({@link
     * #shared}).
     */
    Doubles finish() {
      values = same ? Arrays.copyOf(values, Math.min(1, size)) : shared(values, size);
      stride = same ? 0 : 1;
      return this;
    }

    double at(int row) {
      return values[row * stride];
    }

    /** The column of rows {@code rows} of this one, in that order, finished. */
    Doubles select(int[] rows) {
      Doubles selected = new Doubles();
      if (stride == 0) {
        selected.values = values;
        selected.stride = 0;
        return selected;
      }
      for (int row : rows) {
        selected.add(values[row]);
      }
      return selected.finish();
    }
  }

  /** Columns shorter than this are not looked up in {@link #SHARED}: they cost little anyway. */
  static final int SHARED_FROM = 1024;

  /**
   * Long columns made so far, by length and hash of their bits, held weakly: the outcome and a
   * covariate of a statement appear in the conditional of every unknown its rows read and in every
   * line that moves them (clinics: the outcome five times, {@code dose} six), each the same numbers
   * in the same order; one array serves them all, read only.
   */
  private static final Map<Long, List<WeakReference<double[]>>> SHARED = new HashMap<>();

  /** The first {@code size} values, as an array equal bit for bit to any made before. */
  static double[] shared(double[] values, int size) {
    double[] column = Arrays.copyOf(values, size);
    if (size < SHARED_FROM) {
      return column;
    }
    long hash = size;
    for (double v : column) {
      hash = 31 * hash + Double.doubleToRawLongBits(v);
    }
    synchronized (SHARED) {
      List<WeakReference<double[]>> known = SHARED.computeIfAbsent(hash, h -> new ArrayList<>());
      known.removeIf(r -> r.get() == null);
      for (WeakReference<double[]> r : known) {
        double[] other = r.get();
        if (other != null && sameBits(other, column)) {
          return other;
        }
      }
      known.add(new WeakReference<>(column));
      if (known.size() == 1 && SHARED.size() % 64 == 0) {
        SHARED.values().removeIf(list -> {
          list.removeIf(r -> r.get() == null);
          return list.isEmpty();
        });
      }
      return column;
    }
  }

  private static boolean sameBits(double[] a, double[] b) {
    if (a.length != b.length) {
      return false;
    }
    for (int i = 0; i < a.length; i++) {
      if (Double.doubleToRawLongBits(a[i]) != Double.doubleToRawLongBits(b[i])) {
        return false;
      }
    }
    return true;
  }

  /** Ints (slots), as {@link Doubles}. */
  static final class Ints {
    int[] values = new int[4];
    int stride = 1;
    private int size;
    private boolean same = true;

    void add(int value) {
      if (same) {
        if (size == 0 || value == values[0]) {
          values[0] = size == 0 ? value : values[0];
          size++;
          return;
        }
        int first = values[0];
        values = new int[size + (size >> 1) + 4];
        Arrays.fill(values, 0, size, first);
        same = false;
      }
      if (size == values.length) {
        values = Arrays.copyOf(values, size + (size >> 1) + 4);
      }
      values[size++] = value;
    }

    Ints finish() {
      values = same ? Arrays.copyOf(values, Math.min(1, size)) : Arrays.copyOf(values, size);
      stride = same ? 0 : 1;
      return this;
    }

    int at(int row) {
      return values[row * stride];
    }

    /** The column of rows {@code rows} of this one, in that order, finished. */
    Ints select(int[] rows) {
      Ints selected = new Ints();
      if (stride == 0) {
        selected.values = values;
        selected.stride = 0;
        return selected;
      }
      for (int row : rows) {
        selected.add(values[row]);
      }
      return selected.finish();
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

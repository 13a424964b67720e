package org.hullbound.gibbs;

import java.util.Arrays;

/**
 * Everything of one updater that influences its future draws and is not a function of the chain's
 * state: warm-start predictions, ARMS initial points and their tuning sums, sweep counters, a
 * run-time switch (with its note), the counts the summary reports.
 *
 * <p>A flat list of 64-bit words (doubles by their raw bits, so that a restored updater continues
 * bit for bit) and an optional note, so that a checkpoint file needs no knowledge of the updater
 * kinds. {@link Writer} and {@link Reader} keep the order of words in one place per updater.
 *
 * @param words the numbers, in the order the updater wrote them
 * @param note a text the updater keeps for the report (its switch note), or {@code null}
 */
public record UpdaterState(long[] words, String note) {

  public UpdaterState {
    if (words == null) {
      throw new IllegalArgumentException("words must not be null");
    }
    words = words.clone();
  }

  @Override
  public long[] words() {
    return words.clone();
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof UpdaterState that
        && Arrays.equals(words, that.words)
        && java.util.Objects.equals(note, that.note);
  }

  @Override
  public int hashCode() {
    return 31 * Arrays.hashCode(words) + java.util.Objects.hashCode(note);
  }

  /** The state of an updater whose only memory between draws is how many it made. */
  static UpdaterState ofDrawCount(long draws) {
    return new Writer().put(draws).done();
  }

  /** The draw count saved by {@link #ofDrawCount}, checked to be all there is. */
  static long drawCountOf(UpdaterState saved, String owner) {
    Reader in = new Reader(saved, owner);
    long draws = in.nextLong();
    in.end();
    return draws;
  }

  /** Collects words in order. */
  static final class Writer {
    private long[] words = new long[16];
    private int size;
    private String note;

    Writer put(long word) {
      if (size == words.length) {
        words = Arrays.copyOf(words, 2 * size);
      }
      words[size++] = word;
      return this;
    }

    Writer put(double value) {
      return put(Double.doubleToRawLongBits(value));
    }

    Writer note(String text) {
      this.note = text;
      return this;
    }

    UpdaterState done() {
      return new UpdaterState(Arrays.copyOf(words, size), note);
    }
  }

  /** Reads words back in the order they were written; a short or long list is refused. */
  static final class Reader {
    private final long[] words;
    private final String method;
    private int next;

    Reader(UpdaterState state, String method) {
      if (state == null) {
        throw new IllegalArgumentException("the saved state of " + method + " is missing");
      }
      this.words = state.words;
      this.method = method;
    }

    long nextLong() {
      if (next >= words.length) {
        throw new IllegalArgumentException(
            "the saved state of " + method + " is too short: " + words.length + " numbers");
      }
      return words[next++];
    }

    double nextDouble() {
      return Double.longBitsToDouble(nextLong());
    }

    boolean nextFlag() {
      long flag = nextLong();
      if (flag != 0 && flag != 1) {
        throw new IllegalArgumentException(
            "the saved state of " + method + " has a flag " + flag + ", expected 0 or 1");
      }
      return flag == 1;
    }

    void end() {
      if (next != words.length) {
        throw new IllegalArgumentException(
            "the saved state of " + method + " has " + words.length + " numbers, expected " + next);
      }
    }
  }
}

package org.hullbound.gibbs;

import java.util.Arrays;

/**
 * Keeps every kept draw in memory, per quantity and chain, for the diagnostics at the end of a run.
 *
 * <p>Layout {@code [quantity][chain][draw]} is the one the diagnostics read. Storage grows as
 * draws arrive (so that a long run stopped early costs only what it made); each chain writes only
 * its own arrays, so concurrent {@link #accept} calls from different chains need no lock.
 */
public final class DrawStore implements DrawSink {
  private static final int FIRST_CAPACITY = 256;

  private final double[][][] values;
  private final int[] kept;

  private DrawStore(int chains, int expectedDraws, int width) {
    // Never more room than the run expects at first: many chains of few draws stay small.
    this.values = new double[width][chains][Math.min(FIRST_CAPACITY, expectedDraws)];
    this.kept = new int[chains];
  }

  /**
   * Room for draws of {@code width} quantities in each of {@code chains} chains.
   *
   * @param expectedDraws a hint only: draws per chain expected (storage grows beyond it)
   */
  public static DrawStore create(int chains, int expectedDraws, int width) {
    if (chains < 1 || expectedDraws < 1 || width < 0) {
      throw new IllegalArgumentException(
          "need chains >= 1, expectedDraws >= 1, width >= 0, got " + chains + ", "
              + expectedDraws + ", " + width);
    }
    return new DrawStore(chains, expectedDraws, width);
  }

  @Override
  public void accept(int chain, int draw, double[] row) {
    int slot = draw - 1;
    for (int quantity = 0; quantity < values.length; quantity++) {
      double[] series = values[quantity][chain];
      if (slot >= series.length) {
        series = Arrays.copyOf(series, Math.max(2 * series.length, slot + 1));
        values[quantity][chain] = series;
      }
      series[slot] = row[quantity];
    }
    synchronized (kept) {
      kept[chain] = Math.max(kept[chain], draw);
    }
  }

  /** Number of quantities per draw. */
  public int width() {
    return values.length;
  }

  /** The draws of {@code quantity}, {@code [chain][draw]}, cut to the length all chains reached. */
  public double[][] draws(int quantity) {
    int common = commonDraws();
    double[][] out = new double[values[quantity].length][];
    for (int chain = 0; chain < out.length; chain++) {
      out[chain] = Arrays.copyOf(values[quantity][chain], common);
    }
    return out;
  }

  /** The number of draws every chain has made. */
  public int commonDraws() {
    synchronized (kept) {
      return Arrays.stream(kept).min().orElse(0);
    }
  }
}

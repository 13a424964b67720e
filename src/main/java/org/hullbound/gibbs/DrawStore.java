package org.hullbound.gibbs;

import java.util.Arrays;
import java.util.stream.IntStream;

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

  /**
   * The draws of {@code quantity}, {@code [chain][draw]}, of the chains that kept any draw (in
   * chain order), cut to the length all of those reached.
   *
   * <p>A run stopped early may have chains that never started (more chains than threads); they
   * are left out rather than making every other chain's draws unusable.
   */
  public double[][] draws(int quantity) {
    int[] chains = chainsWithDraws();
    int common = commonDraws();
    double[][] out = new double[chains.length][];
    for (int i = 0; i < chains.length; i++) {
      out[i] = Arrays.copyOf(values[quantity][chains[i]], common);
    }
    return out;
  }

  /** The chains (0-based) that have kept at least one draw, in chain order. */
  public int[] chainsWithDraws() {
    synchronized (kept) {
      return IntStream.range(0, kept.length).filter(c -> kept[c] > 0).toArray();
    }
  }

  /** The number of draws every chain that kept any has made; 0 when none has. */
  public int commonDraws() {
    synchronized (kept) {
      return Arrays.stream(kept).filter(n -> n > 0).min().orElse(0);
    }
  }
}

package org.hullbound.gibbs;

import java.util.Arrays;

/**
 * Keeps every kept draw in memory, per quantity and chain, for the diagnostics at the end of a run.
 *
 * <p>Layout {@code [quantity][chain][draw]} is the one the diagnostics read; chains write disjoint
 * cells, so concurrent {@link #accept} calls from different chains need no lock.
 */
public final class DrawStore implements DrawSink {
  private final double[][][] values;
  private final int[] kept;

  private DrawStore(int chains, int draws, int width) {
    this.values = new double[width][chains][draws];
    this.kept = new int[chains];
  }

  /** Room for {@code draws} draws of {@code width} quantities in each of {@code chains} chains. */
  public static DrawStore create(int chains, int draws, int width) {
    if (chains < 1 || draws < 1 || width < 0) {
      throw new IllegalArgumentException(
          "need chains >= 1, draws >= 1, width >= 0, got " + chains + ", " + draws + ", " + width);
    }
    return new DrawStore(chains, draws, width);
  }

  @Override
  public void accept(int chain, int draw, double[] row) {
    for (int quantity = 0; quantity < values.length; quantity++) {
      values[quantity][chain][draw - 1] = row[quantity];
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

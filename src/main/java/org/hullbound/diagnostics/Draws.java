package org.hullbound.diagnostics;

import java.util.Arrays;
import java.util.function.DoubleUnaryOperator;

/**
 * Draws of one scalar unknown from several Markov chains, held chain x iteration, validated and
 * copied so that it cannot change underneath a diagnostic.
 *
 * <p>Every diagnostic of this package takes a {@code Draws}; building it once checks the shape
 * (at least one chain, every chain the same length) and the caller's array can be reused at once.
 * Non-finite values are kept, so that a summary can report where they are; the functions that
 * need finite draws call {@link #requireFinite()}.
 *
 * <table>
 *   <caption>Factories and views</caption>
 *   <tr><td>{@link #of(double[][])}</td><td>validated copy of chain x iteration draws</td></tr>
 *   <tr><td>{@link #split()}</td><td>each chain cut in halves (Vehtari et al. 2021, section 4.1)</td></tr>
 *   <tr><td>{@link #map(DoubleUnaryOperator)}</td><td>the same shape, every draw transformed</td></tr>
 * </table>
 */
public final class Draws {
  private final double[][] values;

  private Draws(double[][] values) {
    this.values = values;
  }

  /**
   * Copies and validates draws held chain x iteration.
   *
   * @param draws {@code draws[c][i]} is iteration {@code i} of chain {@code c}
   * @throws IllegalArgumentException if {@code draws} is null or empty, a chain is null or empty,
   *     or the chains differ in length
   */
  public static Draws of(double[][] draws) {
    if (draws == null) {
      throw new IllegalArgumentException("draws must not be null");
    }
    if (draws.length == 0) {
      throw new IllegalArgumentException("draws must hold at least one chain, got 0 chains");
    }
    double[][] copy = new double[draws.length][];
    for (int c = 0; c < draws.length; c++) {
      if (draws[c] == null) {
        throw new IllegalArgumentException("draws[" + c + "] (chain " + c + ") must not be null");
      }
      if (draws[c].length == 0) {
        throw new IllegalArgumentException(
            "draws[" + c + "] (chain " + c + ") must hold at least one draw, got 0");
      }
      if (draws[c].length != draws[0].length) {
        throw new IllegalArgumentException(
            "all chains must have the same length: chain 0 has "
                + draws[0].length
                + " draws, chain "
                + c
                + " has "
                + draws[c].length);
      }
      copy[c] = draws[c].clone();
    }
    return new Draws(copy);
  }

  /** Number of chains, at least 1. */
  public int chainCount() {
    return values.length;
  }

  /** Number of draws per chain, at least 1. */
  public int length() {
    return values[0].length;
  }

  /** Number of draws in all chains together. */
  public long totalCount() {
    return (long) values.length * values[0].length;
  }

  /** A copy of chain {@code c}. */
  public double[] chain(int c) {
    if (c < 0 || c >= values.length) {
      throw new IllegalArgumentException(
          "chain must be in [0, " + values.length + "), got " + c);
    }
    return values[c].clone();
  }

  /** A copy of all draws, chain after chain. */
  public double[] pooled() {
    int n = length();
    double[] all = new double[values.length * n];
    for (int c = 0; c < values.length; c++) {
      System.arraycopy(values[c], 0, all, c * n, n);
    }
    return all;
  }

  /** All draws sorted ascending (a new array). */
  public double[] sorted() {
    double[] all = pooled();
    Arrays.sort(all);
    return all;
  }

  /** Whether {@link #split()} drops a middle draw from every chain: the length is odd. */
  public boolean splitDropsMiddle() {
    return length() % 2 == 1;
  }

  /**
   * Cuts every chain into its first and second half, giving twice as many chains of half the
   * length, so that a trend within a chain shows as disagreement between chains (Vehtari et al.
   * 2021, section 4.1). For an odd length the middle draw (0-based index {@code length() / 2}) is
   * dropped from each chain; see {@link #splitDropsMiddle()}.
   *
   * @throws IllegalArgumentException if a chain has fewer than 2 draws
   */
  public Draws split() {
    int n = length();
    if (n < 2) {
      throw new IllegalArgumentException(
          "splitting chains needs at least 2 draws per chain, got " + n);
    }
    int half = n / 2;
    double[][] halves = new double[2 * values.length][];
    for (int c = 0; c < values.length; c++) {
      halves[2 * c] = Arrays.copyOfRange(values[c], 0, half);
      halves[2 * c + 1] = Arrays.copyOfRange(values[c], n - half, n);
    }
    return new Draws(halves);
  }

  /** Draws of the same shape with {@code f} applied to every value. */
  public Draws map(DoubleUnaryOperator f) {
    double[][] mapped = new double[values.length][];
    for (int c = 0; c < values.length; c++) {
      mapped[c] = Arrays.stream(values[c]).map(f).toArray();
    }
    return new Draws(mapped);
  }

  /** Whether every draw is finite (neither NaN nor infinite). */
  public boolean isFinite() {
    for (double[] chain : values) {
      for (double x : chain) {
        if (!Double.isFinite(x)) {
          return false;
        }
      }
    }
    return true;
  }

  /**
   * Returns this if every draw is finite.
   *
   * @throws NonFiniteDrawException naming the first NaN or infinity and the count of them
   */
  public Draws requireFinite() {
    int firstChain = -1;
    int firstIteration = -1;
    long count = 0;
    for (int c = 0; c < values.length; c++) {
      for (int i = 0; i < values[c].length; i++) {
        if (!Double.isFinite(values[c][i])) {
          if (count == 0) {
            firstChain = c;
            firstIteration = i;
          }
          count++;
        }
      }
    }
    if (count > 0) {
      throw new NonFiniteDrawException(
          firstChain, firstIteration, values[firstChain][firstIteration], count);
    }
    return this;
  }

  /** Whether all draws of all chains are equal. */
  public boolean isConstant() {
    double first = values[0][0];
    for (double[] chain : values) {
      for (double x : chain) {
        if (x != first) {
          return false;
        }
      }
    }
    return true;
  }

  /** The backing arrays, for this package's loops only; never handed out. */
  double[][] values() {
    return values;
  }

  /** Builds draws from arrays this package made itself and will not change. */
  static Draws wrap(double[][] values) {
    return new Draws(values);
  }
}

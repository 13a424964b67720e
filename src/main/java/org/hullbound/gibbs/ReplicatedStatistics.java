package org.hullbound.gibbs;

import java.util.List;
import org.hullbound.model.TestQuantities;

/**
 * Fed each kept sweep, replicates the modelled data from the sweep's unknowns and keeps every test
 * quantity's observed and replicated value, per chain and draw: the raw material of posterior
 * predictive p-values (Gelman, Meng and Stern 1996).
 *
 * <p>A {@link DrawSink}, so that it sits beside the draws file and the draw store without touching
 * the sweeps: the first {@code unknowns} values of each draw are the state. Each chain has its own
 * generator, split from a seed in chain order ({@link ChainSeeds}), and is fed by one thread in
 * draw order, so a seed gives the same replicates however threads are scheduled, and a resumed
 * run that replays its earlier draws first gives those of an uninterrupted one.
 */
public final class ReplicatedStatistics implements DrawSink {
  /** Mixed into the run's seed so that replication never shares a stream with the chains. */
  private static final long STREAM = 0x5265706c69636174L;

  private final TestQuantities tests;
  private final TestQuantities.Replicator[] replicators;
  private final ChainRandom[] generators;
  private final DrawSink data;
  private final DrawStore observed;
  private final DrawStore replicated;
  private final double[][] observedRow;
  private final double[][] replicatedRow;

  private ReplicatedStatistics(
      TestQuantities tests, int chains, long seed, int expectedDraws, DrawSink data) {
    this.tests = tests;
    this.data = data;
    int width = tests.quantities().size();
    this.replicators = new TestQuantities.Replicator[chains];
    this.generators = ChainSeeds.split(seed ^ STREAM, chains);
    this.observed = DrawStore.create(chains, expectedDraws, width);
    this.replicated = DrawStore.create(chains, expectedDraws, width);
    this.observedRow = new double[chains][width];
    this.replicatedRow = new double[chains][width];
    for (int c = 0; c < chains; c++) {
      replicators[c] = tests.replicator();
    }
  }

  /**
   * Statistics of {@code tests} for {@code chains} chains, replicating with generators split from
   * {@code seed}; {@code data}, when not null, receives every replicated data set: the elements
   * of every modelled name, name after name in {@link TestQuantities#elementLabels} order.
   *
   * @param expectedDraws a hint only: draws per chain expected (storage grows beyond it)
   */
  public static ReplicatedStatistics of(
      TestQuantities tests, int chains, long seed, int expectedDraws, DrawSink data) {
    if (tests == null) {
      throw new IllegalArgumentException("tests must not be null");
    }
    if (chains < 1 || expectedDraws < 1) {
      throw new IllegalArgumentException(
          "need chains >= 1 and expectedDraws >= 1, got " + chains + " and " + expectedDraws);
    }
    return new ReplicatedStatistics(tests, chains, seed, expectedDraws, data);
  }

  /** The quantities, in the order of {@link #observed} and {@link #replicated}. */
  public List<TestQuantities.Quantity> quantities() {
    return tests.quantities();
  }

  @Override
  public void accept(int chain, int draw, double[] values) {
    double[] observedValues = observedRow[chain];
    double[] replicatedValues = replicatedRow[chain];
    TestQuantities.Replicator replicator = replicators[chain];
    replicator.evaluate(values, generators[chain], observedValues, replicatedValues);
    if (data != null) {
      data.accept(chain, draw, replicator.replicatedRow());
    }
    observed.accept(chain, draw, observedValues);
    replicated.accept(chain, draw, replicatedValues);
  }

  /** Quantity {@code q}'s observed values, {@code [chain][draw]}, as {@link DrawStore#draws}. */
  public double[][] observed(int q) {
    return observed.draws(q);
  }

  /** Quantity {@code q}'s replicated values, {@code [chain][draw]}, as {@link DrawStore#draws}. */
  public double[][] replicated(int q) {
    return replicated.draws(q);
  }
}

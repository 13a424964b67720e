package org.hullbound.gibbs;

import java.util.ArrayList;
import java.util.List;
import java.util.random.RandomGenerator;

/**
 * A Gibbs sampler built from one {@link UpdateRule} per unknown (or block): makes each chain's
 * {@link GibbsKernel} with its own updaters and dispersed starting values.
 *
 * <p>Every state entry must be updated by exactly one rule, so that a sweep leaves the joint
 * posterior invariant (each update does, and so does their composition; Geman and Geman 1984).
 */
public final class GibbsSampler implements KernelFactory {
  private final int dimension;
  private final List<UpdateRule> rules;
  private final StartingValues starts;
  private final long adaptationSweeps;
  private final List<String> labels;

  private GibbsSampler(
      int dimension, List<UpdateRule> rules, StartingValues starts, long adaptationSweeps,
      List<String> labels) {
    this.dimension = dimension;
    this.rules = rules;
    this.starts = starts;
    this.adaptationSweeps = adaptationSweeps;
    this.labels = labels;
  }

  /**
   * @param dimension the length of the state
   * @param rules updates covering each entry 0 .. dimension - 1 exactly once, in sweep order,
   *     besides extra moves ({@link UpdateRule#extra()})
   * @param starts the starting values of each chain
   */
  public static GibbsSampler of(int dimension, List<UpdateRule> rules, StartingValues starts) {
    if (dimension < 1) {
      throw new IllegalArgumentException("dimension must be >= 1, got " + dimension);
    }
    if (rules == null || starts == null) {
      throw new IllegalArgumentException("rules and starts must not be null");
    }
    int[] covered = new int[dimension];
    for (UpdateRule rule : rules) {
      for (int index : rule.indices()) {
        if (index < 0 || index >= dimension) {
          throw new IllegalArgumentException(
              "rule index must be in [0, " + dimension + "), got " + index);
        }
        covered[index] += rule.extra() ? 0 : 1;
      }
    }
    for (int index = 0; index < dimension; index++) {
      if (covered[index] != 1) {
        throw new IllegalArgumentException(
            "state entry " + index + " must be updated by exactly one rule, got " + covered[index]);
      }
    }
    return new GibbsSampler(dimension, List.copyOf(rules), starts, 0, null);
  }

  /** The same sampler naming state entries by {@code labels} in failure messages. */
  public GibbsSampler withLabels(List<String> labels) {
    if (labels == null || labels.size() != dimension) {
      throw new IllegalArgumentException(
          "labels must name all " + dimension + " state entries, got "
              + (labels == null ? "null" : labels.size()));
    }
    return new GibbsSampler(dimension, rules, starts, adaptationSweeps, List.copyOf(labels));
  }

  /**
   * The same sampler whose fallback updaters tune themselves during the first {@code sweeps}
   * sweeps of each chain (pass the burn-in) and stay fixed afterwards.
   */
  public GibbsSampler withAdaptation(long sweeps) {
    if (sweeps < 0) {
      throw new IllegalArgumentException("sweeps must be >= 0, got " + sweeps);
    }
    return new GibbsSampler(dimension, rules, starts, sweeps, labels);
  }

  public int dimension() {
    return dimension;
  }

  public List<UpdateRule> rules() {
    return rules;
  }

  @Override
  public GibbsKernel newChain(int chain, RandomGenerator rng) {
    double[] state = new double[dimension];
    starts.fill(state, rng);
    List<Updater> updaters = new ArrayList<>();
    for (UpdateRule rule : rules) {
      updaters.add(updaterFor(rule));
    }
    return new GibbsKernel(state, updaters.toArray(new Updater[0]), labels);
  }

  private Updater updaterFor(UpdateRule rule) {
    return rule.accept(
        new UpdateRule.Visitor<Updater>() {
          @Override
          public Updater conjugate(UpdateRule.Conjugate conjugate) {
            return new ConjugateUpdater(conjugate);
          }

          @Override
          public Updater blockNormal(UpdateRule.BlockNormal block) {
            return new BlockNormalUpdater(block);
          }

          @Override
          public Updater adaptiveRejection(UpdateRule.AdaptiveRejection rejection) {
            return new AdaptiveRejectionUpdater(rejection, adaptationSweeps);
          }

          @Override
          public Updater fallback(UpdateRule.Fallback fallback) {
            return new FallbackUpdater(fallback, adaptationSweeps, Double.NaN, 1.0);
          }

          @Override
          public Updater move(UpdateRule.Move move) {
            return new LineMoveUpdater(move, adaptationSweeps);
          }

          @Override
          public Updater discrete(UpdateRule.Discrete discrete) {
            return new DiscreteUpdater(discrete);
          }
        });
  }
}

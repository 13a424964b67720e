package org.hullbound.gibbs;

import java.util.ArrayList;
import java.util.List;
import java.util.random.RandomGenerator;
import org.hullbound.model.BoundModel;
import org.hullbound.model.ConditionalDensity;
import org.hullbound.sampling.MarkovTransition;
import org.hullbound.sampling.RandomWalkMetropolis;
import org.hullbound.sampling.SliceSampler;

/**
 * The benchmark's baselines: every unknown of a model updated in turn by one Markov transition on
 * its sampling scale, slice sampling with stepping out (Neal 2003) or random-walk Metropolis tuned
 * toward 44% acceptance during burn-in (Gelman, Roberts and Gilks 1996; common practice).
 *
 * <p>Built for the comparison only (not used by {@code fit}); the same conditionals, scales and
 * state as the Gibbs sampler, so that only the one-variable update differs.
 */
final class WithinGibbsBaseline implements ChainKernel {
  /** Which transition each unknown gets. */
  enum Kind { SLICE, RANDOM_WALK }

  private final double[] state;
  private final ConditionalDensity[] conditionals;
  private final MarkovTransition[] transitions;

  private WithinGibbsBaseline(
      double[] state, ConditionalDensity[] conditionals, MarkovTransition[] transitions) {
    this.state = state;
    this.conditionals = conditionals;
    this.transitions = transitions;
  }

  /**
   * @param widths per unknown: the slice width w, or the random walk's first step size
   * @param adaptation sweeps over which the random walk tunes its step (its burn-in)
   */
  static WithinGibbsBaseline of(
      BoundModel model, Kind kind, double[] start, double[] widths, long adaptation) {
    int n = model.unknowns().size();
    double[] state = start.clone();
    ConditionalDensity[] conditionals = new ConditionalDensity[n];
    MarkovTransition[] transitions = new MarkovTransition[n];
    for (int i = 0; i < n; i++) {
      ConditionalDensity conditional = model.conditional(i);
      conditionals[i] = conditional;
      double lower = conditional.lowerBound(state);
      double upper = conditional.upperBound(state);
      transitions[i] =
          kind == Kind.SLICE
              ? SliceSampler.of(u -> conditional.logDensity(u, state, null), lower, upper,
                  widths[i], 100)
              : RandomWalkMetropolis.adaptive(u -> conditional.logDensity(u, state, null), lower,
                  upper, widths[i], adaptation);
    }
    return new WithinGibbsBaseline(state, conditionals, transitions);
  }

  @Override
  public int width() {
    return state.length;
  }

  @Override
  public void sweep(RandomGenerator rng) {
    for (int i = 0; i < transitions.length; i++) {
      double u = conditionals[i].toSamplingScale(state[i]);
      state[i] = conditionals[i].toNatural(transitions[i].next(u, rng));
    }
  }

  @Override
  public void record(double[] out) {
    System.arraycopy(state, 0, out, 0, state.length);
  }

  /** Density evaluations per conditional draw so far. */
  double evaluationsPerDraw() {
    long evaluations = 0;
    long draws = 0;
    for (MarkovTransition transition : transitions) {
      if (transition instanceof SliceSampler slice) {
        evaluations += slice.statistics().evaluations();
        draws += slice.statistics().transitions();
      } else if (transition instanceof RandomWalkMetropolis walk) {
        evaluations += walk.statistics().evaluations();
        draws += walk.statistics().transitions();
      }
    }
    return draws == 0 ? Double.NaN : (double) evaluations / draws;
  }

  /** Mean acceptance rate of the random walks (NaN for slice). */
  double acceptanceRate() {
    List<Double> rates = new ArrayList<>();
    for (MarkovTransition transition : transitions) {
      if (transition instanceof RandomWalkMetropolis walk) {
        rates.add(walk.statistics().acceptanceRate());
      }
    }
    return rates.stream().mapToDouble(Double::doubleValue).average().orElse(Double.NaN);
  }
}

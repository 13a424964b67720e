package org.hullbound.sampling;

import java.util.function.DoubleUnaryOperator;
import java.util.random.RandomGenerator;

/**
 * Random-walk Metropolis on the real line (Metropolis et al. 1953) with a normal proposal
 * {@code y = x + s Z}, optionally tuning the step {@code s} during a burn-in of fixed length toward
 * an acceptance rate of 0.44, the optimum for one dimension (Gelman, Roberts and Gilks 1996;
 * Roberts, Gelman and Gilks 1997).
 *
 * <p>It is the simplest fallback for a full conditional that is not log-concave, and a baseline
 * for the others. Random numbers per transition: one normal, one uniform.
 *
 * <p>Tuning: while adapting, after each transition {@code log s += (a - 0.44) / t^0.6}, where
 * {@code a = min(1, f(y) / f(x))} is the acceptance probability of that transition (a
 * Robbins-Monro recursion with Rao-Blackwellised acceptance; Andrieu and Thoms 2008, section 4).
 * After {@code adaptationLength} transitions the step is frozen for good, so from then on the
 * chain is an ordinary Metropolis chain leaving the target invariant; draws made while adapting
 * belong to the burn-in and should be discarded. The configuration is immutable; the step and the
 * counters are the state of one chain, not synchronised: use one instance per chain.
 */
public final class RandomWalkMetropolis implements MarkovTransition {
  /** The acceptance rate the tuning aims at: 0.44 for one dimension (see the class comment). */
  public static final double TARGET_ACCEPTANCE = 0.44;
  /** Exponent of the Robbins-Monro gain {@code t^-0.6}: in (1/2, 1], so the gains sum to infinity
   *  while their squares do not. */
  private static final double GAIN_EXPONENT = 0.6;

  private final DoubleUnaryOperator logDensity;
  private final double lower;
  private final double upper;
  private final long adaptationLength;

  private double logStep;
  private double step;
  private long transitions;
  private long accepted;
  private long evaluations;

  private RandomWalkMetropolis(DoubleUnaryOperator logDensity, double lower, double upper,
      double stepSize, long adaptationLength) {
    this.logDensity = logDensity;
    this.lower = lower;
    this.upper = upper;
    this.adaptationLength = adaptationLength;
    this.step = stepSize;
    this.logStep = Math.log(stepSize);
  }

  /**
   * Random-walk Metropolis with a fixed step.
   *
   * @param logDensity {@code log f} up to a constant; {@code -Infinity} where {@code f = 0}
   * @param lower lower end of the open support, may be {@code -Infinity}
   * @param upper upper end of the open support, may be {@code +Infinity}
   * @param stepSize the proposal standard deviation, finite and {@code > 0}
   */
  public static RandomWalkMetropolis of(
      DoubleUnaryOperator logDensity, double lower, double upper, double stepSize) {
    return adaptive(logDensity, lower, upper, stepSize, 0);
  }

  /**
   * Random-walk Metropolis that tunes its step during its first {@code adaptationLength}
   * transitions, then keeps it.
   *
   * @param initialStepSize the first proposal standard deviation, finite and {@code > 0}
   * @param adaptationLength number of transitions to tune over, {@code >= 0}
   */
  public static RandomWalkMetropolis adaptive(DoubleUnaryOperator logDensity, double lower,
      double upper, double initialStepSize, long adaptationLength) {
    Arguments.notNull("logDensity", logDensity);
    Arguments.support(lower, upper);
    Arguments.positive("initialStepSize", initialStepSize);
    if (adaptationLength < 0) {
      throw new IllegalArgumentException(
          "adaptationLength must be >= 0, got " + adaptationLength);
    }
    return new RandomWalkMetropolis(logDensity, lower, upper, initialStepSize, adaptationLength);
  }

  @Override
  public double next(double current, RandomGenerator rng) {
    Arguments.inSupport("current", current, lower, upper);
    double logCurrent = evaluate(current);
    if (logCurrent == Double.NEGATIVE_INFINITY) {
      throw new IllegalArgumentException(
          "current must have positive density, got log f = -Infinity at " + current);
    }
    double proposal = current + step * rng.nextGaussian();
    double logAcceptance = proposal > lower && proposal < upper
        ? Math.min(0.0, evaluate(proposal) - logCurrent)
        : Double.NEGATIVE_INFINITY;
    boolean accept = Math.log(rng.nextDouble()) < logAcceptance;
    transitions++;
    if (transitions <= adaptationLength) {
      logStep += (Math.exp(logAcceptance) - TARGET_ACCEPTANCE)
          / Math.pow(transitions, GAIN_EXPONENT);
      // Keep the step a positive finite double however far the tuning pushes it.
      logStep = Math.max(-700.0, Math.min(700.0, logStep));
      step = Math.exp(logStep);
    }
    if (accept) {
      accepted++;
      return proposal;
    }
    return current;
  }

  /** The proposal standard deviation now in use. */
  public double stepSize() {
    return step;
  }

  /** Whether the next transition still tunes the step. */
  public boolean isAdapting() {
    return transitions < adaptationLength;
  }

  /** Counts so far. */
  public MetropolisStatistics statistics() {
    return new MetropolisStatistics(transitions, accepted, evaluations, step, isAdapting());
  }

  private double evaluate(double x) {
    evaluations++;
    return Arguments.evaluate(logDensity, x);
  }
}

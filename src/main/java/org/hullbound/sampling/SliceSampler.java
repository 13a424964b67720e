package org.hullbound.sampling;

import java.util.function.DoubleUnaryOperator;
import java.util.random.RandomGenerator;

/**
 * Univariate slice sampling with stepping out and shrinkage (Neal 2003, "Slice sampling", Annals
 * of Statistics 31(3), figures 3 and 5): draw a level under the density at the current point, find
 * an interval around the slice by steps of width {@code w} (at most {@code m} of them), then draw
 * uniformly from the interval, shrinking it toward the current point after every miss.
 *
 * <p>It needs no derivative, no log-concavity and little tuning, which makes it the Gibbs driver's
 * fallback for full conditionals that adaptive rejection cannot handle. Random numbers per
 * transition: one exponential (the level), two uniforms (interval position, split of the {@code m}
 * steps), one uniform per shrinkage try.
 *
 * <p>The interval is cut to the support after stepping out: the cut is a function of the interval
 * alone, and points outside the support are never in the slice, so Neal's condition (the interval
 * is as likely from any point of the slice within it) still holds; the log-density is never
 * called outside the support. The configuration is immutable; the counters behind
 * {@link #statistics()} are not synchronised, so use one instance per chain.
 */
public final class SliceSampler implements MarkovTransition {
  /** Shrinkage tries after which the log-density is taken to be inconsistent. */
  private static final int MAX_SHRINKS = 10_000;

  private final DoubleUnaryOperator logDensity;
  private final double lower;
  private final double upper;
  private final double width;
  private final int maxSteps;

  private long transitions;
  private long evaluations;
  private long stepsOut;
  private long shrinks;

  private SliceSampler(
      DoubleUnaryOperator logDensity, double lower, double upper, double width, int maxSteps) {
    this.logDensity = logDensity;
    this.lower = lower;
    this.upper = upper;
    this.width = width;
    this.maxSteps = maxSteps;
  }

  /**
   * A slice sampler for {@code log f} on the open interval {@code (lower, upper)}.
   *
   * @param logDensity {@code log f} up to a constant; {@code -Infinity} where {@code f = 0}
   * @param lower lower end of the support, may be {@code -Infinity}
   * @param upper upper end of the support, may be {@code +Infinity}
   * @param width the step {@code w}, finite and {@code > 0}: about the width of the slice (a
   *     standard deviation or two of the target) works well (Neal 2003, section 4.1)
   * @param maxSteps the bound {@code m >= 1} on steps out; {@code m = 1} means no stepping out
   */
  public static SliceSampler of(
      DoubleUnaryOperator logDensity, double lower, double upper, double width, int maxSteps) {
    Arguments.notNull("logDensity", logDensity);
    Arguments.support(lower, upper);
    Arguments.positive("width", width);
    Arguments.atLeast("maxSteps", maxSteps, 1);
    return new SliceSampler(logDensity, lower, upper, width, maxSteps);
  }

  @Override
  public double next(double current, RandomGenerator rng) {
    Arguments.inSupport("current", current, lower, upper);
    double logCurrent = logDensityAt(current);
    if (logCurrent == Double.NEGATIVE_INFINITY) {
      throw new IllegalArgumentException(
          "current must have positive density, got log f = -Infinity at " + current);
    }
    transitions++;
    // Level: log y = log f(x0) - e with e ~ Exp(1), i.e. y ~ Uniform(0, f(x0)).
    double level = logCurrent - rng.nextExponential();

    // Figure 3, stepping out.
    double left = current - width * rng.nextDouble();
    double right = left + width;
    int stepsLeft = (int) Math.floor(maxSteps * rng.nextDouble());
    int stepsRight = maxSteps - 1 - stepsLeft;
    while (stepsLeft > 0 && left > lower && level < logDensityAt(left)) {
      left -= width;
      stepsLeft--;
      stepsOut++;
    }
    while (stepsRight > 0 && right < upper && level < logDensityAt(right)) {
      right += width;
      stepsRight--;
      stepsOut++;
    }
    left = Math.max(left, lower);
    right = Math.min(right, upper);

    // Figure 5, shrinkage.
    for (int attempt = 0; attempt < MAX_SHRINKS; attempt++) {
      double proposal = left + rng.nextDouble() * (right - left);
      if (proposal == current || level < logDensityAt(proposal)) {
        return proposal;
      }
      shrinks++;
      if (proposal < current) {
        left = proposal;
      } else {
        right = proposal;
      }
    }
    throw new IllegalStateException("slice shrinkage found no point after " + MAX_SHRINKS
        + " tries around x = " + current + ": the log-density seems not to be a fixed function");
  }

  /** The step width {@code w}. */
  public double width() {
    return width;
  }

  /** The bound {@code m} on steps out. */
  public int maxSteps() {
    return maxSteps;
  }

  /** Counts so far. */
  public SliceStatistics statistics() {
    return new SliceStatistics(transitions, evaluations, stepsOut, shrinks);
  }

  private double logDensityAt(double x) {
    if (!(x > lower && x < upper)) {
      return Double.NEGATIVE_INFINITY; // the open support's ends are never evaluated
    }
    evaluations++;
    return Arguments.evaluate(logDensity, x);
  }
}

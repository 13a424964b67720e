package org.hullbound.anchor;

import java.util.Arrays;
import java.util.random.RandomGenerator;

/**
 * The No-U-Turn sampler (Hoffman and Gelman 2014, "The No-U-Turn Sampler: Adaptively Setting Path
 * Lengths in Hamiltonian Monte Carlo", J. Mach. Learn. Res. 15, 1593-1623), Algorithm 6: slice
 * sampling over a trajectory doubled forwards or backwards until it turns back on itself, with the
 * step size tuned by dual averaging during warm-up ({@link DualAveraging}). Added to the paper, as
 * common practice: a diagonal mass matrix {@code M} estimated in windows of the warm-up ({@link
 * WarmupWindows}) from the regularised variances {@code (n / (n + 5)) var + 1e-3 (5 / (n + 5))}
 * (Stan's reference manual), the momentum drawn from N(0, M), the kinetic energy {@code r' M^-1 r /
 * 2}, the position stepping by {@code epsilon M^-1 r} and the U-turn test on {@code M^-1 r}; a
 * trajectory of at most {@code 2^maxDepth} steps (10 by default); the step size found again
 * (Algorithm 4) and dual averaging restarted at each new matrix.
 *
 * <p>The anchor of issue 12: the sampler a practitioner would use instead of hullbound's Gibbs
 * driver, on the same model and coordinates ({@link ModelTarget}). Never part of the CLI (test
 * scope, and the bench profile's sources). After the warm-up nothing adapts, so the kept
 * iterations form a Markov chain that leaves the target invariant.
 *
 * <p>Random draws per iteration: one normal per coordinate (momentum), one exponential (the slice:
 * {@code log u = H_0 - E} for {@code u} uniform on {@code [0, exp(H_0)]}), one fair coin per
 * doubling, and a uniform per choice between two subtrees' proposals. Numerics in log space:
 * {@code -inf} or NaN energies count as outside the slice and as divergent (energy error above
 * {@code Delta_max = 1000}, the paper's value).
 *
 * <p>Mutable: one per chain, used by one thread at a time.
 */
public final class NoUTurnSampler {
  private static final double MAX_ENERGY_ERROR = 1000;
  private static final int MAX_STEP_SEARCH = 100;

  /**
   * @param warmup iterations that adapt the step size and mass matrix (not to be kept)
   * @param targetAcceptance {@code delta}, the mean acceptance statistic dual averaging aims at
   *     (0.8 by default, as Stan's; the paper found 0.6 good)
   * @param maxDepth the most doublings of one trajectory
   */
  public record Settings(long warmup, double targetAcceptance, int maxDepth) {
    public Settings {
      if (warmup < 0) {
        throw new IllegalArgumentException("warmup must be >= 0, got " + warmup);
      }
      if (!(targetAcceptance > 0 && targetAcceptance < 1)) {
        throw new IllegalArgumentException(
            "targetAcceptance must be in (0, 1), got " + targetAcceptance);
      }
      if (maxDepth < 1 || maxDepth > 30) {
        throw new IllegalArgumentException("maxDepth must be in [1, 30], got " + maxDepth);
      }
    }

    /** {@code warmup} iterations, acceptance 0.8, depth at most 10. */
    public static Settings of(long warmup) {
      return new Settings(warmup, 0.8, 10);
    }
  }

  /** A point of phase space: position, momentum, gradient and log-density at the position. */
  private record Point(double[] position, double[] momentum, double[] gradient,
      double logDensity) {}

  /** What a subtree of Algorithm 6's BuildTree returns. */
  private static final class Subtree {
    Point minus;
    Point plus;
    Point proposal;
    long count;
    boolean proceed;
    double acceptanceSum;
    long acceptanceCount;
  }

  private final Target target;
  private final int dimension;
  private final Settings settings;
  private final WarmupWindows windows;
  private final double[] inverseMass;
  private double[] position;
  private double[] gradient;
  private double logDensity;
  private double stepSize = Double.NaN;
  private DualAveraging averaging;
  private long iteration;
  private final double[] windowMean;
  private final double[] windowSquares;
  private long windowCount;
  private boolean divergedNow;
  private long keptIterations;
  private long keptGradients;
  private long keptDivergences;
  private long keptDepths;
  private long gradients;

  private NoUTurnSampler(Target target, double[] start, double startLogDensity,
      double[] startGradient, Settings settings) {
    this.target = target;
    this.dimension = target.dimension();
    this.settings = settings;
    this.windows = WarmupWindows.of(settings.warmup());
    this.inverseMass = new double[dimension];
    Arrays.fill(inverseMass, 1);
    this.position = start;
    this.gradient = startGradient;
    this.logDensity = startLogDensity;
    this.windowMean = new double[dimension];
    this.windowSquares = new double[dimension];
  }

  /**
   * A chain of the No-U-Turn sampler on {@code target} from {@code start}.
   *
   * @throws IllegalArgumentException when the start has no finite log-density or the lengths
   *     differ
   */
  public static NoUTurnSampler of(Target target, double[] start, Settings settings) {
    if (target == null || start == null || settings == null) {
      throw new IllegalArgumentException("target, start and settings must not be null");
    }
    if (start.length != target.dimension()) {
      throw new IllegalArgumentException(
          "start must have " + target.dimension() + " coordinates, got " + start.length);
    }
    double[] gradient = new double[start.length];
    double value = target.logDensity(start.clone(), gradient);
    if (!(value > Double.NEGATIVE_INFINITY) || value == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException("start must have a finite log-density, got " + value);
    }
    return new NoUTurnSampler(target, start.clone(), value, gradient, settings);
  }

  /** One iteration: adapts while in warm-up, then leaves the target invariant. */
  public void iterate(RandomGenerator rng) {
    if (Double.isNaN(stepSize)) {
      stepSize = reasonableStepSize(rng);
      averaging = DualAveraging.from(stepSize, settings.targetAcceptance());
    }
    boolean warming = iteration < settings.warmup();
    long gradientsBefore = gradients;
    divergedNow = false;
    // Algorithm 6: momentum r0 ~ N(0, M), slice log u = H(theta, r0) - Exp(1)
    double[] momentum = new double[dimension];
    for (int i = 0; i < dimension; i++) {
      momentum[i] = rng.nextGaussian() / Math.sqrt(inverseMass[i]);
    }
    Point start = new Point(position, momentum, gradient, logDensity);
    double startEnergy = energy(start);
    double logSlice = startEnergy - rng.nextExponential();
    Point minus = start;
    Point plus = start;
    Point chosen = start;
    long count = 1;
    boolean proceed = true;
    int depth = 0;
    Subtree last = null;
    while (proceed && depth < settings.maxDepth()) {
      int direction = rng.nextBoolean() ? 1 : -1;
      Subtree tree = buildTree(direction < 0 ? minus : plus, logSlice, direction, depth,
          startEnergy, rng);
      if (direction < 0) {
        minus = tree.minus;
      } else {
        plus = tree.plus;
      }
      // with probability min(1, n'/n) the new subtree's proposal replaces the current one
      if (tree.proceed && tree.count > 0 && rng.nextDouble() * count < tree.count) {
        chosen = tree.proposal;
      }
      count += tree.count;
      proceed = tree.proceed && noUTurn(minus, plus);
      depth++;
      last = tree;
    }
    position = chosen.position();
    gradient = chosen.gradient();
    logDensity = chosen.logDensity();
    if (warming) {
      adapt(last.acceptanceSum / last.acceptanceCount, rng);
    } else {
      keptIterations++;
      keptGradients += gradients - gradientsBefore;
      keptDivergences += divergedNow ? 1 : 0;
      keptDepths += depth;
    }
    iteration++;
  }

  /** Algorithm 6's BuildTree: {@code 2^depth} leapfrog steps from {@code from}. */
  private Subtree buildTree(Point from, double logSlice, int direction, int depth,
      double startEnergy, RandomGenerator rng) {
    if (depth == 0) {
      Point next = leapfrog(from, direction * stepSize);
      double energy = energy(next);
      Subtree leaf = new Subtree();
      leaf.minus = next;
      leaf.plus = next;
      leaf.proposal = next;
      leaf.count = logSlice <= energy ? 1 : 0;
      leaf.proceed = energy > logSlice - MAX_ENERGY_ERROR;
      divergedNow |= !leaf.proceed;
      leaf.acceptanceSum = energy == Double.NEGATIVE_INFINITY
          ? 0 : Math.min(1, Math.exp(energy - startEnergy));
      leaf.acceptanceCount = 1;
      return leaf;
    }
    Subtree first = buildTree(from, logSlice, direction, depth - 1, startEnergy, rng);
    if (!first.proceed) {
      return first;
    }
    Subtree second = buildTree(direction < 0 ? first.minus : first.plus, logSlice, direction,
        depth - 1, startEnergy, rng);
    // with probability n'' / (n' + n'') the second half's proposal replaces the first's
    if (second.count > 0
        && rng.nextDouble() * (first.count + second.count) < second.count) {
      first.proposal = second.proposal;
    }
    if (direction < 0) {
      first.minus = second.minus;
    } else {
      first.plus = second.plus;
    }
    first.acceptanceSum += second.acceptanceSum;
    first.acceptanceCount += second.acceptanceCount;
    first.proceed = second.proceed && noUTurn(first.minus, first.plus);
    first.count += second.count;
    return first;
  }

  /** One leapfrog step of size {@code step} (negative backwards in time). */
  private Point leapfrog(Point from, double step) {
    double[] momentum = new double[dimension];
    double[] next = new double[dimension];
    for (int i = 0; i < dimension; i++) {
      momentum[i] = from.momentum()[i] + 0.5 * step * from.gradient()[i];
      next[i] = from.position()[i] + step * inverseMass[i] * momentum[i];
    }
    double[] nextGradient = new double[dimension];
    double value = target.logDensity(next, nextGradient);
    gradients++;
    if (!(value > Double.NEGATIVE_INFINITY) || value == Double.POSITIVE_INFINITY) {
      return new Point(next, momentum, nextGradient, Double.NEGATIVE_INFINITY);
    }
    for (int i = 0; i < dimension; i++) {
      momentum[i] += 0.5 * step * nextGradient[i];
    }
    return new Point(next, momentum, nextGradient, value);
  }

  /** {@code L(theta) - r' M^-1 r / 2}, {@code -inf} for a NaN. */
  private double energy(Point point) {
    double kinetic = 0;
    for (int i = 0; i < dimension; i++) {
      kinetic += point.momentum()[i] * point.momentum()[i] * inverseMass[i];
    }
    double energy = point.logDensity() - 0.5 * kinetic;
    return Double.isNaN(energy) ? Double.NEGATIVE_INFINITY : energy;
  }

  /** Whether neither end moves back toward the other: both velocities point outwards. */
  private boolean noUTurn(Point minus, Point plus) {
    double atMinus = 0;
    double atPlus = 0;
    for (int i = 0; i < dimension; i++) {
      double span = (plus.position()[i] - minus.position()[i]) * inverseMass[i];
      atMinus += span * minus.momentum()[i];
      atPlus += span * plus.momentum()[i];
    }
    return atMinus >= 0 && atPlus >= 0;
  }

  /** Dual averaging of the step size, and at a window's end a new mass matrix. */
  private void adapt(double acceptance, RandomGenerator rng) {
    stepSize = averaging.update(Double.isNaN(acceptance) ? 0 : acceptance);
    if (windows.collects(iteration)) {
      // Welford's running mean and sum of squared deviations
      windowCount++;
      for (int i = 0; i < dimension; i++) {
        double deviation = position[i] - windowMean[i];
        windowMean[i] += deviation / windowCount;
        windowSquares[i] += deviation * (position[i] - windowMean[i]);
      }
    }
    if (windows.endsWindow(iteration) && windowCount > 1) {
      double n = windowCount;
      for (int i = 0; i < dimension; i++) {
        double variance = windowSquares[i] / (n - 1);
        inverseMass[i] = n / (n + 5) * variance + 1e-3 * 5 / (n + 5);
      }
      windowCount = 0;
      Arrays.fill(windowMean, 0);
      Arrays.fill(windowSquares, 0);
      stepSize = reasonableStepSize(rng);
      averaging = DualAveraging.from(stepSize, settings.targetAcceptance());
    }
    if (windows.endsWarmup(iteration)) {
      stepSize = averaging.averaged();
    }
  }

  /**
   * Algorithm 4 of the paper: from the current step size (1 at first), halve or double it until
   * one leapfrog step's acceptance ratio crosses 1/2.
   */
  private double reasonableStepSize(RandomGenerator rng) {
    double step = Double.isNaN(stepSize) ? 1 : stepSize;
    double[] momentum = new double[dimension];
    for (int i = 0; i < dimension; i++) {
      momentum[i] = rng.nextGaussian() / Math.sqrt(inverseMass[i]);
    }
    Point start = new Point(position, momentum, gradient, logDensity);
    double startEnergy = energy(start);
    double logRatio = energy(leapfrog(start, step)) - startEnergy;
    int sign = logRatio > Math.log(0.5) ? 1 : -1;
    for (int k = 0; k < MAX_STEP_SEARCH && sign * logRatio > -sign * Math.log(2); k++) {
      step = Math.scalb(step, sign);
      logRatio = energy(leapfrog(start, step)) - startEnergy;
    }
    return step;
  }

  /** The current position (a copy). */
  public double[] position() {
    return position.clone();
  }

  /** The current step size. */
  public double stepSize() {
    return stepSize;
  }

  /** The diagonal of {@code M^-1}, the estimated posterior variances (a copy). */
  public double[] inverseMass() {
    return inverseMass.clone();
  }

  /** Gradient evaluations so far, warm-up included (one per leapfrog step). */
  public long gradientsSoFar() {
    return gradients;
  }

  /** Counts over the iterations after the warm-up. */
  public NoUTurnStatistics statistics() {
    return new NoUTurnStatistics(keptIterations, keptGradients, keptDivergences, keptDepths,
        stepSize);
  }
}

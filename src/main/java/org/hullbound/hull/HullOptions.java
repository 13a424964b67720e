package org.hullbound.hull;

import java.util.Arrays;

/**
 * Immutable settings of an adaptive rejection sampler: where the hull starts, how large it may
 * grow, how strictly log-concavity is checked.
 *
 * <p>Every {@code with...} method returns a new value. The start is either caller-given abscissae
 * (a warm start, e.g. from a previous sampler's {@link AdaptiveRejectionSampler#abscissae()}) or an
 * automatic outward search from a guess and a spread (Gilks and Wild 1992, section 2.2, ask only
 * that the starting tangents bracket the mode on unbounded sides).
 *
 * <table>
 *   <caption>Defaults</caption>
 *   <tr><td>start</td><td>automatic, guess 0, spread 1</td></tr>
 *   <tr><td>{@link #maximumHullSize()}</td><td>64 abscissae</td></tr>
 *   <tr><td>{@link #logConcavityTolerance()}</td><td>1e-8</td></tr>
 *   <tr><td>{@link #maximumSearchSteps()}</td><td>64 doublings per side</td></tr>
 *   <tr><td>{@link #maximumProposals()}</td><td>100 000 proposals per draw</td></tr>
 * </table>
 */
public final class HullOptions {

  /** Default cap on the number of abscissae. */
  public static final int DEFAULT_MAXIMUM_HULL_SIZE = 64;

  /**
   * Default log-concavity tolerance, in log-density units relative to max(1, the differences
   * between the values compared); see {@link #withLogConcavityTolerance(double)}.
   */
  public static final double DEFAULT_TOLERANCE = 1e-8;

  /** Default number of outward doubling steps per side before giving up. */
  public static final int DEFAULT_MAXIMUM_SEARCH_STEPS = 64;

  /**
   * Default cap on proposals per draw. A draw whose proposals are each accepted with probability
   * at least 1e-3 makes more with probability (1 - 1e-3)^100000 = e^-100, about 4e-44; adaptive
   * rejection accepts far more often (Gilks and Wild 1992 report about three density evaluations
   * per draw), so a correct sampler never reaches it, while a stuck one gives up within a second
   * or so of evaluations.
   */
  public static final long DEFAULT_MAXIMUM_PROPOSALS = 100_000;

  private static final HullOptions DEFAULTS =
      new HullOptions(
          null, 0.0, 1.0, DEFAULT_MAXIMUM_HULL_SIZE, DEFAULT_TOLERANCE,
          DEFAULT_MAXIMUM_SEARCH_STEPS, DEFAULT_MAXIMUM_PROPOSALS);

  private final double[] startingAbscissae;
  private final double guess;
  private final double spread;
  private final int maximumHullSize;
  private final double logConcavityTolerance;
  private final int maximumSearchSteps;
  private final long maximumProposals;

  private HullOptions(
      double[] startingAbscissae,
      double guess,
      double spread,
      int maximumHullSize,
      double logConcavityTolerance,
      int maximumSearchSteps,
      long maximumProposals) {
    this.startingAbscissae = startingAbscissae;
    this.guess = guess;
    this.spread = spread;
    this.maximumHullSize = maximumHullSize;
    this.logConcavityTolerance = logConcavityTolerance;
    this.maximumSearchSteps = maximumSearchSteps;
    this.maximumProposals = maximumProposals;
  }

  /** Automatic start from guess 0 with spread 1, cap 64, tolerance 1e-8. */
  public static HullOptions defaults() {
    return DEFAULTS;
  }

  /**
   * Automatic start: abscissae at {@code guess - spread} and {@code guess + spread} (and {@code
   * guess} itself for the derivative-free form), moved just inside a bound where they fall outside,
   * then stepped outward with doubling steps until the slopes bracket the mode.
   *
   * @param guess a rough location of the mode; finite
   * @param spread a rough scale of the density; finite and &gt; 0
   */
  public HullOptions withAutomaticStart(double guess, double spread) {
    if (!Double.isFinite(guess)) {
      throw new IllegalArgumentException("guess must be finite, got " + guess);
    }
    if (!(spread > 0) || spread == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException("spread must be finite and > 0, got " + spread);
    }
    return new HullOptions(
        null, guess, spread, maximumHullSize, logConcavityTolerance, maximumSearchSteps,
        maximumProposals);
  }

  /**
   * Caller-given starting abscissae (any order, duplicates removed), e.g. a warm start. They must
   * be finite and lie strictly inside the support; where they do not bracket the mode on an
   * unbounded side, points are added outward as in the automatic start.
   */
  public HullOptions withStartingAbscissae(double... abscissae) {
    double[] copy = nonEmpty(abscissae).clone();
    for (int i = 0; i < copy.length; i++) {
      if (!Double.isFinite(copy[i])) {
        throw new IllegalArgumentException(
            "starting abscissae must be finite, got " + copy[i] + " at index " + i);
      }
    }
    Arrays.sort(copy);
    int distinct = 0;
    for (int i = 0; i < copy.length; i++) {
      if (i == 0 || copy[i] != copy[distinct - 1]) {
        copy[distinct++] = copy[i];
      }
    }
    return new HullOptions(
        Arrays.copyOf(copy, distinct),
        guess,
        spread,
        maximumHullSize,
        logConcavityTolerance,
        maximumSearchSteps,
        maximumProposals);
  }

  /** {@code abscissae}, checked to be neither null nor empty. */
  static double[] nonEmpty(double[] abscissae) {
    if (abscissae == null || abscissae.length == 0) {
      throw new IllegalArgumentException("starting abscissae must not be empty");
    }
    return abscissae;
  }

  /**
   * The most abscissae adaptation may add up to. Past the cap no more points are added; sampling
   * stays exact, only the acceptance rate stops improving.
   *
   * @param maximumHullSize at least 3
   */
  public HullOptions withMaximumHullSize(int maximumHullSize) {
    if (maximumHullSize < 3) {
      throw new IllegalArgumentException("maximumHullSize must be >= 3, got " + maximumHullSize);
    }
    return new HullOptions(
        startingAbscissae, guess, spread, maximumHullSize, logConcavityTolerance, maximumSearchSteps,
        maximumProposals);
  }

  /**
   * How far h may exceed the hull (or fall below a chord) before it is called not log-concave: an
   * excess above {@code tolerance * max(1, d) + 2 ulp(m)} throws {@link NotLogConcaveException},
   * where d is the largest difference between the values compared (h(x) less the value at the
   * hull's anchor, the hull's rise from it, the gap to the squeeze; between two abscissae, the
   * difference of their values and the tangents' rises) and m the largest |h| among them. A
   * constant added to h changes neither, beyond the rounding it causes in h: a log-density is
   * defined only up to one. Where that rounding, {@code 2 ulp(m)}, exceeds {@code tolerance *
   * max(1, d)}, an excess within the tolerance could not be told from rounding, and the sampler
   * throws {@link ImpreciseDensityException} (with the default 1e-8, from constants of about 3e7
   * on; a tolerance of 1e-3 admits 1e12).
   *
   * @param tolerance finite and &gt;= 0
   */
  public HullOptions withLogConcavityTolerance(double tolerance) {
    if (!(tolerance >= 0) || tolerance == Double.POSITIVE_INFINITY) {
      throw new IllegalArgumentException(
          "logConcavityTolerance must be finite and >= 0, got " + tolerance);
    }
    return new HullOptions(
        startingAbscissae, guess, spread, maximumHullSize, tolerance, maximumSearchSteps,
        maximumProposals);
  }

  /**
   * Outward doubling steps allowed per side while looking for a falling slope; past them the
   * sampler throws {@link NonIntegrableHullException}.
   *
   * @param steps at least 1
   */
  public HullOptions withMaximumSearchSteps(int steps) {
    if (steps < 1) {
      throw new IllegalArgumentException("maximumSearchSteps must be >= 1, got " + steps);
    }
    return new HullOptions(
        startingAbscissae, guess, spread, maximumHullSize, logConcavityTolerance, steps,
        maximumProposals);
  }

  /**
   * Proposals one draw may make before it gives up with {@link ProposalLimitException}, so that a
   * draw never spins without end on a hull and density that disagree.
   *
   * @param proposals at least 1
   */
  public HullOptions withMaximumProposals(long proposals) {
    if (proposals < 1) {
      throw new IllegalArgumentException("maximumProposals must be >= 1, got " + proposals);
    }
    return new HullOptions(
        startingAbscissae, guess, spread, maximumHullSize, logConcavityTolerance,
        maximumSearchSteps, proposals);
  }

  /** True when the start is caller-given abscissae, false for the automatic start. */
  public boolean hasStartingAbscissae() {
    return startingAbscissae != null;
  }

  /** A copy of the caller-given starting abscissae, sorted and distinct; empty when automatic. */
  public double[] startingAbscissae() {
    return startingAbscissae == null ? new double[0] : startingAbscissae.clone();
  }

  double[] startingAbscissaeOrNull() {
    return startingAbscissae;
  }

  /** The guess of the automatic start. */
  public double guess() {
    return guess;
  }

  /** The spread of the automatic start. */
  public double spread() {
    return spread;
  }

  /** The cap on the number of abscissae. */
  public int maximumHullSize() {
    return maximumHullSize;
  }

  /** The log-concavity tolerance. */
  public double logConcavityTolerance() {
    return logConcavityTolerance;
  }

  /** Outward doubling steps allowed per side. */
  public int maximumSearchSteps() {
    return maximumSearchSteps;
  }

  /** Proposals one draw may make before it gives up. */
  public long maximumProposals() {
    return maximumProposals;
  }

  @Override
  public String toString() {
    return "HullOptions["
        + (startingAbscissae == null
            ? "automatic start, guess " + guess + ", spread " + spread
            : "starting abscissae " + Arrays.toString(startingAbscissae))
        + ", maximumHullSize "
        + maximumHullSize
        + ", logConcavityTolerance "
        + logConcavityTolerance
        + ", maximumSearchSteps "
        + maximumSearchSteps
        + ", maximumProposals "
        + maximumProposals
        + "]";
  }
}

package org.hullbound.hull;

import java.util.Arrays;
import java.util.random.RandomGenerator;

/**
 * An exact sampler for a log-concave mass on the whole numbers of a range (bounded or not) by
 * adaptive rejection: a piecewise-geometric upper envelope made of chords through neighbouring
 * integers, a squeeze of chords below, and a chord added at every integer the rejection test
 * evaluates ({@link GeometricHull} says why the chords bound h).
 *
 * <p>The steps are Gilks and Wild's (1992, Adaptive rejection sampling for Gibbs sampling, Applied
 * Statistics 41, 337-348, section 2.2) with integers for abscissae and the chord of {@code (a, a +
 * 1)} for the tangent at {@code a}:
 *
 * <ol>
 *   <li>Start with chords at {@code guess - spread}, {@code guess}, {@code guess + spread}
 *       (rounded, moved inside the range), stepping outward with doubling steps until the
 *       outermost chord falls away on each side or reaches its end of the range.
 *   <li>Draw k from the envelope and a uniform U; accept when {@code log U <= l(k) - u(k)} (the
 *       squeeze, no evaluation).
 *   <li>Otherwise evaluate h(k), accept when {@code log U <= h(k) - u(k)}, and add the chord at k
 *       while the envelope is below its cap.
 * </ol>
 *
 * <p>An accepted k has exactly the law {@code exp(h(k)) / sum exp(h)}, whatever happened before it.
 * Every evaluated value is checked against the envelope and squeeze, and every new chord's slope
 * against its neighbours', so a mass that is not log-concave stops with {@link
 * NotLogConcaveException} instead of being drawn from a wrong envelope. Each proposal uses three
 * uniforms (piece, point, acceptance). Not thread-safe; make one per conditional.
 */
public final class DiscreteAdaptiveRejection {
  private final LogMass mass;
  private final HullOptions options;
  private final double lower;
  private final double upper;
  private GeometricHull hull;
  private long evaluations;
  private long proposals;
  private long squeezeAcceptances;
  private long densityAcceptances;
  private long rejections;

  private DiscreteAdaptiveRejection(LogMass mass, double lower, double upper, HullOptions options) {
    this.mass = mass;
    this.options = options;
    this.lower = lower;
    this.upper = upper;
    if (lower < upper) {
      this.hull = start();
    }
  }

  /**
   * A sampler of the mass h on the whole numbers of {@code [lower, upper]}; the starting chords are
   * evaluated here, around the options' automatic start (guess and spread; a caller-given start is
   * not used on the integers).
   *
   * @param mass h, log-concave and finite on the range (it may be {@code -inf} outside the run of
   *     integers where the mass is positive, but not at the starting chords)
   * @param lower a whole number or {@code -inf}
   * @param upper a whole number {@code >= lower} or {@code inf}; finite ends within {@code 2^53}
   * @throws NotLogConcaveException when the starting chords already show h is not concave
   * @throws InvalidDensityException when h is NaN, +inf or -inf at a starting chord
   * @throws NonIntegrableHullException when no falling chord is found on an unbounded side
   */
  public static DiscreteAdaptiveRejection of(
      LogMass mass, double lower, double upper, HullOptions options) {
    if (mass == null || options == null) {
      throw new IllegalArgumentException("mass and options must not be null");
    }
    checkEnd(lower, "lower");
    checkEnd(upper, "upper");
    if (!(lower <= upper) || lower == Double.POSITIVE_INFINITY
        || upper == Double.NEGATIVE_INFINITY) {
      throw new IllegalArgumentException(
          "the range must have lower <= upper, got " + lower + " .. " + upper);
    }
    return new DiscreteAdaptiveRejection(mass, lower, upper, options);
  }

  private static void checkEnd(double end, String name) {
    boolean whole = Double.isInfinite(end)
        || (end == Math.rint(end) && Math.abs(end) <= GeometricHull.LARGEST_WHOLE);
    if (!whole) {
      throw new IllegalArgumentException(
          name + " must be a whole number within 2^53 or infinite, got " + end);
    }
  }

  /**
   * One exact draw.
   *
   * @throws NotLogConcaveException when an evaluation shows h is not concave
   * @throws InvalidDensityException when h returns NaN or +inf
   * @throws ProposalLimitException after {@link HullOptions#maximumProposals()} proposals
   */
  public long next(RandomGenerator rng) {
    if (!(lower < upper)) {
      squeezeAcceptances++;
      return (long) lower;
    }
    for (long made = 0; made < options.maximumProposals(); made++) {
      proposals++;
      double k = hull.sample(rng);
      double logU = Math.log(rng.nextDouble());
      double envelope = hull.upper(k);
      double squeeze = hull.squeeze(k);
      if (logU <= squeeze - envelope) {
        squeezeAcceptances++;
        return (long) k;
      }
      double h = evaluate(k, true);
      if (h != Double.NEGATIVE_INFINITY) {
        checkAgainstEnvelope(k, h, envelope, squeeze);
        refine(k, h);
      }
      if (logU <= h - envelope) {
        densityAcceptances++;
        return (long) k;
      }
      rejections++;
    }
    throw new ProposalLimitException(
        options.maximumProposals(), toDoubles(hull.anchors()), hull.values(), Double.NaN);
  }

  /** Counters since the sampler was made; {@code hullSize} counts chords. */
  public SamplerStatistics statistics() {
    return new SamplerStatistics(
        evaluations, proposals, squeezeAcceptances, densityAcceptances, rejections,
        hull == null ? 0 : hull.size(), 0); // every rejection here follows an evaluation
  }

  /** The anchors of the current chords, ascending (empty for a one-point range). */
  public long[] anchors() {
    return hull == null ? new long[0] : hull.anchors();
  }

  GeometricHull hull() {
    return hull;
  }

  private GeometricHull start() {
    long step = Math.max(1, Math.round(Math.min(options.spread(), GeometricHull.LARGEST_WHOLE)));
    double guess = Math.rint(options.guess());
    java.util.TreeMap<Long, double[]> chords = new java.util.TreeMap<>();
    for (double a : new double[] {guess - step, guess, guess + step}) {
      addChord(chords, anchorInside(a));
    }
    long leftStep = step;
    long rightStep = step;
    int leftSteps = 0;
    int rightSteps = 0;
    while (true) {
      long leftmost = chords.firstKey();
      long rightmost = chords.lastKey();
      // On a bounded side the search stops at the end: there the envelope is finite anyway, but a
      // chord that still rises far from the end would put its mass where h is tiny.
      boolean leftOk = leftmost <= lower || chords.get(leftmost)[1] > 0;
      boolean rightOk = rightmost + 1 >= upper || chords.get(rightmost)[1] < 0;
      if (leftOk && rightOk) {
        break;
      }
      if (!leftOk) {
        double a = Math.max(lower, (double) leftmost - leftStep);
        if (leftSteps++ == options.maximumSearchSteps() || -a > GeometricHull.LARGEST_WHOLE) {
          throw new NonIntegrableHullException(
              "no rising chord found below " + leftmost + ": the mass does not fall away towards"
                  + " -inf", leftmost);
        }
        leftStep *= 2;
        addChord(chords, (long) a);
      }
      if (!rightOk) {
        double a = Math.min(upper - 1, (double) rightmost + rightStep);
        if (rightSteps++ == options.maximumSearchSteps() || a > GeometricHull.LARGEST_WHOLE) {
          throw new NonIntegrableHullException(
              "no falling chord found above " + rightmost + ": the mass does not fall away"
                  + " towards inf", rightmost);
        }
        rightStep *= 2;
        addChord(chords, (long) a);
      }
    }
    long[] anchors = new long[chords.size()];
    double[] values = new double[anchors.length];
    double[] next = new double[anchors.length];
    int i = 0;
    for (var chord : chords.entrySet()) {
      anchors[i] = chord.getKey();
      values[i] = chord.getValue()[0];
      next[i] = chord.getValue()[0] + chord.getValue()[1];
      i++;
    }
    return GeometricHull.of(lower, upper, anchors, values, next);
  }

  /** Evaluates the chord at {@code a} into {@code chords} (value, slope), checking its slope. */
  private void addChord(java.util.TreeMap<Long, double[]> chords, long a) {
    if (chords.containsKey(a)) {
      return;
    }
    double h = evaluate(a, false);
    double slope = evaluate(a + 1, false) - h;
    var below = chords.lowerEntry(a);
    var above = chords.higherEntry(a);
    if (below != null) {
      checkOrder(below.getKey(), below.getValue()[1], below.getValue()[0], a, slope);
    }
    if (above != null) {
      checkOrder(a, slope, h, above.getKey(), above.getValue()[1]);
    }
    chords.put(a, new double[] {h, slope});
  }

  /** {@code a} moved so that the chord {@code (a, a + 1)} lies inside the range. */
  private long anchorInside(double a) {
    double inside = Math.max(lower, Math.min(upper - 1, a));
    return (long) Math.max(-GeometricHull.LARGEST_WHOLE, Math.min(GeometricHull.LARGEST_WHOLE - 1, inside));
  }

  /** Adds the chord at k (or k - 1 at the top of the range) while the envelope is under its cap. */
  private void refine(double k, double h) {
    if (hull.size() >= options.maximumHullSize()) {
      return;
    }
    long a = (long) k;
    long[] anchors = hull.anchors();
    if (k + 1 > upper) {
      a = (long) k - 1;
    }
    if (Arrays.binarySearch(anchors, a) >= 0) {
      return;
    }
    double left = a == (long) k ? h : evaluate(a, true);
    double right = a == (long) k ? evaluate(a + 1, true) : h;
    if (left == Double.NEGATIVE_INFINITY || right == Double.NEGATIVE_INFINITY) {
      return; // the edge of where the mass is positive: no chord to add, the others still bound
    }
    checkSlopes(hull, a, right - left);
    hull = hull.with(a, left, right);
  }

  /** A new chord's slope must lie between its neighbours' (differences of a concave h fall). */
  private void checkSlopes(GeometricHull current, long a, double slope) {
    long[] anchors = current.anchors();
    double[] slopes = current.slopes();
    double[] values = current.values();
    int i = -Arrays.binarySearch(anchors, a) - 1;
    if (i < 0) {
      return;
    }
    if (i > 0) {
      checkOrder(anchors[i - 1], slopes[i - 1], values[i - 1], a, slope);
    }
    if (i < anchors.length) {
      checkOrder(a, slope, values[i], anchors[i], slopes[i]);
    }
  }

  /** The chord at {@code left} must rise at least as much as the one at {@code right}. */
  private void checkOrder(long left, double leftSlope, double value, long right, double rightSlope) {
    if (rightSlope > leftSlope + allowance(leftSlope, rightSlope, value)) {
      throw notConcave(right, "the chord at " + right + " rises by " + rightSlope
          + ", more than the one at " + left + ", which rises by " + leftSlope);
    }
  }

  private void checkAgainstEnvelope(double k, double h, double envelope, double squeeze) {
    if (h > envelope + allowance(envelope, h, envelope)) {
      throw notConcave(k, "h(" + (long) k + ") = " + h + " lies above the envelope "
          + envelope);
    }
    if (squeeze > Double.NEGATIVE_INFINITY && h < squeeze - allowance(squeeze, h, squeeze)) {
      throw notConcave(k, "h(" + (long) k + ") = " + h + " lies below the squeeze " + squeeze);
    }
  }

  /**
   * How far two compared values may disagree by rounding: the options' tolerance relative to
   * their difference's size, and a few units in the last place of the larger magnitude.
   */
  private double allowance(double a, double b, double reference) {
    double size = Math.max(1, Math.abs(a - b));
    double magnitude = Math.max(Math.abs(reference), Math.max(Math.abs(a), Math.abs(b)));
    return options.logConcavityTolerance() * size + 4 * Math.ulp(magnitude);
  }

  private NotLogConcaveException notConcave(double k, String why) {
    return new NotLogConcaveException("the log mass is not concave at " + (long) k + ": " + why, k);
  }

  private double evaluate(double k, boolean allowMinusInfinity) {
    evaluations++;
    double h = mass.value((long) k);
    if (Double.isNaN(h) || h == Double.POSITIVE_INFINITY
        || (!allowMinusInfinity && h == Double.NEGATIVE_INFINITY)) {
      throw new InvalidDensityException(
          "the log mass is " + h + " at " + (long) k + ", inside the range " + lower + " .. "
              + upper + (h == Double.NEGATIVE_INFINITY
                  ? "; a starting chord needs a positive mass at both its integers" : ""),
          k, h);
    }
    return h;
  }

  private static double[] toDoubles(long[] values) {
    double[] out = new double[values.length];
    for (int i = 0; i < out.length; i++) {
      out[i] = values[i];
    }
    return out;
  }
}

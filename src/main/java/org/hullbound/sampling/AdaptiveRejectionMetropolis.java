package org.hullbound.sampling;

import java.util.Arrays;
import java.util.function.DoubleUnaryOperator;
import java.util.random.RandomGenerator;

/**
 * Adaptive rejection Metropolis sampling, ARMS (Gilks, Best and Tan 1995, "Adaptive rejection
 * Metropolis sampling within Gibbs sampling", Applied Statistics 44(4)): derivative-free adaptive
 * rejection from a piecewise-linear log envelope through secants (Gilks 1992), followed by a
 * Metropolis-Hastings step that corrects wherever the envelope is not an upper bound.
 *
 * <p>It is the Gibbs driver's fallback for full conditionals that are not log-concave: where the
 * target is log-concave the envelope is a true hull and every Metropolis-Hastings step accepts, so
 * ARMS costs little more than adaptive rejection; where it is not, the chain stays exact. Random
 * numbers per try of the rejection step: two uniforms (piece, position) and one for the test; one
 * more uniform for the Metropolis-Hastings step. The comments number the steps in the order the
 * paper describes them (initialisation, sampling, rejection step, Metropolis step, return); the
 * numbers are ours.
 *
 * <p>The envelope through abscissae {@code x_1 < ... < x_n} on {@code [x_i, x_{i+1}]} is {@code
 * max(L_{i,i+1}, min(L_{i-1,i}, L_{i+1,i+2}))}, where {@code L_{jk}} is the line through
 * {@code (x_j, log f(x_j))} and {@code (x_k, log f(x_k))}, an undefined line is left out, and the
 * outer pieces extend {@code L_{12}} and {@code L_{n-1,n}} to the ends of the support.
 *
 * <p>Why the chain is exact. Every call builds its envelope afresh from the same initial
 * abscissae, which depend only on the configuration and on the log-density: the given points,
 * plus, toward an infinite end, points stepped out from them by doubling distances until the outer
 * secant falls and its outer value is 3 below the highest (a bounded search). Within the call,
 * points are added only at candidates rejected in the rejection step, whose law does not involve
 * the current state; where log f is below a floor (1000 below the highest initial value, falling
 * away from the initial points) or -Infinity, as when a density underflows far out, the point is
 * stored at the floor, which only lowers the envelope there. So the envelope used in the
 * Metropolis-Hastings step is independent of the current state, the proposal is an independence
 * proposal with density proportional to {@code min(f, envelope)}, and the paper's acceptance
 * probability makes each call a reversible kernel for {@code f}. Nothing is carried from one call
 * to the next except the counters (so a changing full conditional is handled, at the cost of
 * re-evaluating the initial abscissae each call). Points stop being added at {@code maxPoints}
 * (which counts the search's points too); an added point that would make an infinite tail
 * non-integrable is not added: both rules depend only on rejected candidates, so they keep the
 * argument intact. The initial points must never be chosen from the chain's current state (nor
 * its history), or the argument fails.
 *
 * <p>The configuration is immutable; the counters behind {@link #statistics()} and the scratch
 * arrays are not synchronised, so use one instance per chain.
 */
public final class AdaptiveRejectionMetropolis implements MarkovTransition {
  /** Doublings tried per infinite end by the bounded search for a falling outer secant. */
  private static final int SEARCH_DOUBLINGS = 60;
  /**
   * How far below the highest initial log-density a stored envelope value may go. Candidates
   * where log f is lower, or -Infinity (a density that underflows far out), are stored at a floor
   * this deep at the initial points' centre and falling linearly away from it, so that they still
   * pull the envelope down and its outer secants keep falling; the envelope need not be an upper
   * bound, the Metropolis-Hastings step corrects.
   */
  private static final double FLOOR_DEPTH = 1000;
  /**
   * The bounded search steps out toward an infinite end until the outer secant falls and the
   * outermost log-density is this far below the highest, so that a nearly flat outer secant
   * cannot put almost all of the envelope's mass in its tail.
   */
  private static final double TAIL_DROP = 3;
  /** Rejection-step tries after which the target is taken to have no mass under the envelope. */
  private static final int MAX_TRIES = 100_000;

  private final DoubleUnaryOperator logDensity;
  private final double lower;
  private final double upper;
  private final double[] initialPoints;
  private final int maxPoints;

  // Scratch state of one call: abscissae and their log-densities, the envelope's pieces.
  private final double[] xs;
  private final double[] hs;
  private int size;
  private double highest;
  private final double centre;
  private final double spread;
  private final double[] pieceLeft;
  private final double[] pieceRight;
  private final double[] pieceAnchor;
  private final double[] pieceValue;
  private final double[] pieceSlope;
  private final double[] pieceWeight;
  private int pieces;
  private final double[] breaks = new double[5];

  /** The current value of the call in progress, for the failures' messages. */
  private double callCurrent = Double.NaN;
  private long transitions;
  private long evaluations;
  private long adaptiveRejections;
  private long metropolisRejections;
  private int largestEnvelope;

  private AdaptiveRejectionMetropolis(DoubleUnaryOperator logDensity, double lower, double upper,
      double[] initialPoints, int maxPoints) {
    this.logDensity = logDensity;
    this.lower = lower;
    this.upper = upper;
    this.initialPoints = initialPoints;
    this.maxPoints = maxPoints;
    this.centre = 0.5 * (initialPoints[0] + initialPoints[initialPoints.length - 1]);
    this.spread = initialPoints[initialPoints.length - 1] - initialPoints[0];
    int capacity = maxPoints + 2 * (SEARCH_DOUBLINGS + 1);
    this.xs = new double[capacity];
    this.hs = new double[capacity];
    int pieceCapacity = 4 * (capacity + 1);
    this.pieceLeft = new double[pieceCapacity];
    this.pieceRight = new double[pieceCapacity];
    this.pieceAnchor = new double[pieceCapacity];
    this.pieceValue = new double[pieceCapacity];
    this.pieceSlope = new double[pieceCapacity];
    this.pieceWeight = new double[pieceCapacity];
  }

  /**
   * ARMS for {@code log f} on the open interval {@code (lower, upper)}.
   *
   * @param logDensity {@code log f} up to a constant; {@code -Infinity} where {@code f = 0}
   * @param lower lower end of the support, may be {@code -Infinity}
   * @param upper upper end of the support, may be {@code +Infinity}
   * @param initialPoints at least 3 strictly increasing abscissae inside the support, where
   *     {@code f > 0}; they must not be chosen from the chain's current state. Points spread over
   *     the bulk of the target (for instance near its quartiles and mode) work well
   * @param maxPoints the cap on abscissae reached by adding rejected candidates, at least the
   *     number of initial points
   */
  public static AdaptiveRejectionMetropolis of(DoubleUnaryOperator logDensity, double lower,
      double upper, double[] initialPoints, int maxPoints) {
    Arguments.notNull("logDensity", logDensity);
    Arguments.support(lower, upper);
    Arguments.notNull("initialPoints", initialPoints);
    if (initialPoints.length < 3) {
      throw new IllegalArgumentException(
          "initialPoints must hold at least 3 points, got " + initialPoints.length);
    }
    for (int i = 0; i < initialPoints.length; i++) {
      Arguments.inSupport("initialPoints[" + i + "]", initialPoints[i], lower, upper);
      if (i > 0 && !(initialPoints[i] > initialPoints[i - 1])) {
        throw new IllegalArgumentException("initialPoints must be strictly increasing, got "
            + initialPoints[i - 1] + " then " + initialPoints[i] + " at index " + i);
      }
    }
    Arguments.atLeast("maxPoints", maxPoints, initialPoints.length);
    return new AdaptiveRejectionMetropolis(
        logDensity, lower, upper, initialPoints.clone(), maxPoints);
  }

  @Override
  public double next(double current, RandomGenerator rng) {
    Arguments.inSupport("current", current, lower, upper);
    callCurrent = current;
    double logCurrent = evaluate(current);
    if (logCurrent == Double.NEGATIVE_INFINITY) {
      throw failure("found zero density (log f = -Infinity) at the current value", current, 0);
    }
    transitions++;
    // Step 1, initialisation: abscissae S from the initial points (never from the current state),
    // then the envelope through them.
    initialiseAbscissae();
    buildEnvelope();

    for (int tries = 0; tries < MAX_TRIES; tries++) {
      // Step 2: x from the envelope's density, u uniform.
      int piece = choosePiece(rng);
      double candidate = drawWithin(piece, rng);
      double logEnvelope = lineAt(piece, candidate);
      double logTarget = candidate > lower && candidate < upper
          ? evaluate(candidate) : Double.NEGATIVE_INFINITY;
      // Step 3, rejection step: accept with probability min(1, f(x) / envelope(x)); on
      // rejection add x to S (when allowed), rebuild the envelope and go back to step 2.
      if (!(Math.log(rng.nextDouble()) < logTarget - logEnvelope)) {
        adaptiveRejections++;
        if (size < maxPoints) {
          insertIfProper(candidate, Math.max(logTarget, floorAt(candidate)));
        }
        continue;
      }
      // Step 4, Metropolis step: accept the candidate with probability
      // min(1, f(x) min(f(cur), env(cur)) / (f(cur) min(f(x), env(x)))).
      double logEnvelopeCurrent = envelopeAt(current);
      double logAcceptance = logTarget + Math.min(logCurrent, logEnvelopeCurrent)
          - logCurrent - Math.min(logTarget, logEnvelope);
      largestEnvelope = Math.max(largestEnvelope, size);
      // Step 5: return the new state.
      if (Math.log(rng.nextDouble()) < logAcceptance) {
        return candidate;
      }
      metropolisRejections++;
      return current;
    }
    throw failure("accepted no candidate in " + MAX_TRIES + " tries of its rejection step: the"
        + " target has almost no mass where the envelope through the initial points puts it",
        current, size);
  }

  /** A typed failure naming the current value (NaN: this call's) and the first {@code count} abscissae. */
  private ArmsFailureException failure(String what, double at, int count) {
    return new ArmsFailureException(what, Double.isNaN(at) ? callCurrent : at, lower, upper, xs, hs,
        count);
  }

  /** The initial abscissae this sampler starts every call from (a copy). */
  public double[] initialPoints() {
    return initialPoints.clone();
  }

  /** The cap on abscissae. */
  public int maxPoints() {
    return maxPoints;
  }

  /** Counts so far. */
  public ArmsStatistics statistics() {
    return new ArmsStatistics(transitions, evaluations, adaptiveRejections,
        metropolisRejections, largestEnvelope);
  }

  private double evaluate(double x) {
    evaluations++;
    return Arguments.evaluate(logDensity, x);
  }

  private void initialiseAbscissae() {
    size = initialPoints.length;
    for (int i = 0; i < size; i++) {
      xs[i] = initialPoints[i];
      hs[i] = evaluate(xs[i]);
      if (hs[i] == Double.NEGATIVE_INFINITY) {
        throw failure("found zero density (log f = -Infinity) at initialPoints[" + i + "] = "
            + xs[i] + "; it needs initial points where f > 0", Double.NaN, i + 1);
      }
    }
    highest = Double.NEGATIVE_INFINITY;
    for (int i = 0; i < size; i++) {
      highest = Math.max(highest, hs[i]);
    }
    // A bounded search toward infinite ends until the outer secant falls, so that the envelope's
    // tails are integrable.
    if (lower == Double.NEGATIVE_INFINITY) {
      for (int k = 0; !(slope(0, 1) > 0) || hs[0] > highest - TAIL_DROP; k++) {
        if (k > SEARCH_DOUBLINGS) {
          throw failure("found that log f does not fall toward -Infinity left of " + xs[0]
              + ": the target seems improper there; give a finite lower bound", Double.NaN, size);
        }
        double x = initialPoints[0] - spread * Math.scalb(1.0, k);
        double h = Math.max(evaluate(x), floorAt(x));
        System.arraycopy(xs, 0, xs, 1, size);
        System.arraycopy(hs, 0, hs, 1, size);
        xs[0] = x;
        hs[0] = h;
        size++;
      }
    }
    if (upper == Double.POSITIVE_INFINITY) {
      for (int k = 0; !(slope(size - 2, size - 1) < 0) || hs[size - 1] > highest - TAIL_DROP;
          k++) {
        if (k > SEARCH_DOUBLINGS) {
          throw failure("found that log f does not fall toward +Infinity right of "
              + xs[size - 1] + ": the target seems improper there; give a finite upper bound",
              Double.NaN, size);
        }
        double x = initialPoints[initialPoints.length - 1] + spread * Math.scalb(1.0, k);
        double h = Math.max(evaluate(x), floorAt(x));
        xs[size] = x;
        hs[size] = h;
        size++;
      }
    }
  }

  /** The floor for stored values at x: FLOOR_DEPTH below the top, falling away from the centre. */
  private double floorAt(double x) {
    return highest - FLOOR_DEPTH * (1 + Math.abs(x - centre) / spread);
  }

  private double slope(int i, int j) {
    return (hs[j] - hs[i]) / (xs[j] - xs[i]);
  }

  /** Adds (x, h) to S unless x is already there or the new outer secant would not fall. */
  private void insertIfProper(double x, double h) {
    int position = Arrays.binarySearch(xs, 0, size, x);
    if (position >= 0) {
      return;
    }
    int at = -position - 1;
    System.arraycopy(xs, at, xs, at + 1, size - at);
    System.arraycopy(hs, at, hs, at + 1, size - at);
    xs[at] = x;
    hs[at] = h;
    size++;
    boolean improper = lower == Double.NEGATIVE_INFINITY && !(slope(0, 1) > 0)
        || upper == Double.POSITIVE_INFINITY && !(slope(size - 2, size - 1) < 0);
    if (improper) {
      System.arraycopy(xs, at + 1, xs, at, size - at - 1);
      System.arraycopy(hs, at + 1, hs, at, size - at - 1);
      size--;
      return;
    }
    buildEnvelope();
  }

  /** The pieces of the envelope, each a line on an interval, and their log masses. */
  private void buildEnvelope() {
    pieces = 0;
    addPiece(lower, xs[0], 0, 1);
    for (int i = 0; i + 1 < size; i++) {
      boolean hasLeft = i >= 1;
      boolean hasRight = i + 2 < size;
      if (!hasLeft && !hasRight) {
        addPiece(xs[i], xs[i + 1], i, i + 1);
        continue;
      }
      // The envelope switches lines only where two of the three lines cross.
      int count = 0;
      breaks[count++] = xs[i];
      breaks[count++] = xs[i + 1];
      count = addCrossing(count, i, i, i - 1, hasLeft);
      count = addCrossing(count, i, i, i + 1, hasRight);
      if (hasLeft && hasRight) {
        count = addCrossing(count, i, i - 1, i + 1, true);
      }
      Arrays.sort(breaks, 0, count);
      for (int b = 0; b + 1 < count; b++) {
        double left = breaks[b];
        double right = breaks[b + 1];
        if (!(right > left)) {
          continue;
        }
        double middle = 0.5 * (left + right);
        int outer;
        if (!hasLeft) {
          outer = i + 1;
        } else if (!hasRight) {
          outer = i - 1;
        } else {
          outer = line(i - 1, middle) <= line(i + 1, middle) ? i - 1 : i + 1;
        }
        int active = line(i, middle) >= line(outer, middle) ? i : outer;
        addPiece(left, right, active, active + 1);
      }
    }
    addPiece(xs[size - 1], upper, size - 2, size - 1);
    normaliseWeights();
  }

  /** Where the secants starting at abscissae {@code j} and {@code k} cross inside interval i. */
  private int addCrossing(int count, int i, int j, int k, boolean defined) {
    if (!defined) {
      return count;
    }
    double sj = slope(j, j + 1);
    double sk = slope(k, k + 1);
    if (sj == sk) {
      return count;
    }
    double x = (hs[k] - hs[j] + sj * xs[j] - sk * xs[k]) / (sj - sk);
    if (x > xs[i] && x < xs[i + 1]) {
      breaks[count++] = x;
    }
    return count;
  }

  /** Value at x of the secant through abscissae j and j + 1. */
  private double line(int j, double x) {
    return hs[j] + slope(j, j + 1) * (x - xs[j]);
  }

  private void addPiece(double left, double right, int j, int k) {
    pieceLeft[pieces] = left;
    pieceRight[pieces] = right;
    pieceAnchor[pieces] = xs[j];
    pieceValue[pieces] = hs[j];
    pieceSlope[pieces] = (hs[k] - hs[j]) / (xs[k] - xs[j]);
    pieces++;
  }

  private double lineAt(int piece, double x) {
    return pieceValue[piece] + pieceSlope[piece] * (x - pieceAnchor[piece]);
  }

  /** log of the integral of exp(line) over the piece. */
  private double logMass(int piece) {
    double left = pieceLeft[piece];
    double right = pieceRight[piece];
    double s = pieceSlope[piece];
    if (left == Double.NEGATIVE_INFINITY) {
      return lineAt(piece, right) - Math.log(s); // s > 0, ensured by the tail rule
    }
    if (right == Double.POSITIVE_INFINITY) {
      return lineAt(piece, left) - Math.log(-s); // s < 0, ensured by the tail rule
    }
    double length = right - left;
    double rise = s * length;
    if (Math.abs(rise) < 1e-12) {
      return lineAt(piece, left) + Math.log(length) + 0.5 * rise;
    }
    // Anchor at the higher end so that the exponential stays at most 1.
    return rise > 0
        ? lineAt(piece, right) + Math.log(-Math.expm1(-rise)) - Math.log(s)
        : lineAt(piece, left) + Math.log(-Math.expm1(rise)) - Math.log(-s);
  }

  private void normaliseWeights() {
    double largest = Double.NEGATIVE_INFINITY;
    for (int p = 0; p < pieces; p++) {
      pieceWeight[p] = logMass(p);
      largest = Math.max(largest, pieceWeight[p]);
    }
    if (!Double.isFinite(largest)) {
      throw failure("built an envelope whose mass is not finite (largest log mass " + largest
          + "): the log-density values at the abscissae are too extreme", Double.NaN, size);
    }
    double total = 0;
    for (int p = 0; p < pieces; p++) {
      total += Math.exp(pieceWeight[p] - largest);
      pieceWeight[p] = total;
    }
    for (int p = 0; p < pieces; p++) {
      pieceWeight[p] /= total;
    }
  }

  private int choosePiece(RandomGenerator rng) {
    double u = rng.nextDouble();
    for (int p = 0; p < pieces - 1; p++) {
      if (u < pieceWeight[p]) {
        return p;
      }
    }
    return pieces - 1;
  }

  /** Inversion of the exponential-of-a-line density on the piece. */
  private double drawWithin(int piece, RandomGenerator rng) {
    double left = pieceLeft[piece];
    double right = pieceRight[piece];
    double s = pieceSlope[piece];
    double u = rng.nextDouble();
    if (left == Double.NEGATIVE_INFINITY) {
      return right + Math.log1p(-u) / s;
    }
    if (right == Double.POSITIVE_INFINITY) {
      return left + Math.log1p(-u) / s;
    }
    double length = right - left;
    double rise = s * length;
    double x;
    if (Math.abs(rise) < 1e-12) {
      x = left + u * length;
    } else if (rise > 0) {
      x = right + Math.log1p(u * Math.expm1(-rise)) / s;
    } else {
      x = left + Math.log1p(u * Math.expm1(rise)) / s;
    }
    return Math.min(right, Math.max(left, x));
  }

  /** The envelope's log value at x, from the same pieces the draws come from. */
  private double envelopeAt(double x) {
    int lo = 0;
    int hi = pieces - 1;
    while (lo < hi) {
      int mid = (lo + hi + 1) >>> 1;
      if (pieceLeft[mid] <= x) {
        lo = mid;
      } else {
        hi = mid - 1;
      }
    }
    return lineAt(lo, x);
  }
}

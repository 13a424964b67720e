package org.hullbound.hull;

/**
 * Derivative-free adaptive rejection sampling with the secant hull of Gilks (1992).
 *
 * <p>Needs at least three abscissae; on unbounded sides the outermost chords must fall away, found
 * by stepping outward with doubling steps. A new point is not added when it lies closer to a
 * neighbour than {@link #MINIMUM_SEPARATION} of the interval: an extended chord through two almost
 * equal points has a slope dominated by rounding in h, and the hull must stay an upper bound.
 */
final class SecantSampler extends AdaptiveSampler {

  /** Smallest distance to a neighbouring abscissa, as a fraction of the interval, for insertion. */
  static final double MINIMUM_SEPARATION = 1e-6;

  private final LogDensity density;
  /** The options' spread: where points are added around fewer than three starting ones. */
  private final double spread;

  SecantSampler(LogDensity density, Support support, HullOptions options) {
    super(support, options, 2);
    this.density = density;
    this.spread = options.spread();
    double[] start =
        options.hasStartingAbscissae()
            ? checkedStart(options.startingAbscissaeOrNull())
            : automaticStart(options.guess(), options.spread(), true);
    for (double x : start) {
      insert(k, x, evaluate(x, false));
    }
    initialise();
    rebuild();
  }

  @Override
  void insertEvaluated(int i, double x) {
    insert(i, x, evaluate(x, false));
  }

  /** Completes the start to three points, checks them and makes the outer chords fall away. */
  @Override
  void initialise() {
    completeToThree(spread);
    for (int i = 0; i + 2 < k; i++) {
      checkTriple(i);
    }
    searchOutward(initialStep(spread));
  }

  /** A caller may give fewer than three abscissae; add neighbours inside the support. */
  private void completeToThree(double spread) {
    if (k == 1) {
      double[] around = automaticStart(xs[0], spread, true);
      insert(0, around[0], evaluate(around[0], false));
      insert(2, around[2], evaluate(around[2], false));
    } else if (k == 2) {
      double middle = 0.5 * (xs[0] + xs[1]);
      insert(1, middle, evaluate(middle, false));
    }
  }

  /** Initialisation (Gilks 1992): the outermost chords must fall away on unbounded sides. */
  private void searchOutward(double step) {
    double leftStep = step;
    double rightStep = step;
    int leftSteps = 0;
    int rightSteps = 0;
    while (true) {
      boolean leftOk = support.isBoundedBelow() || SecantHull.chord(xs, hs, 0) > 0;
      boolean rightOk = support.isBoundedAbove() || SecantHull.chord(xs, hs, k - 2) < 0;
      if (leftOk && rightOk) {
        return;
      }
      if (!leftOk) {
        double x = xs[0] - leftStep;
        if (leftSteps++ == maximumSearchSteps || !Double.isFinite(x)) {
          throw noFallingSlope(true, xs[0], SecantHull.chord(xs, hs, 0));
        }
        leftStep *= 2;
        insert(0, x, evaluate(x, false));
        checkTriple(0);
      }
      if (!rightOk) {
        double x = xs[k - 1] + rightStep;
        if (rightSteps++ == maximumSearchSteps || !Double.isFinite(x)) {
          throw noFallingSlope(false, xs[k - 1], SecantHull.chord(xs, hs, k - 2));
        }
        rightStep *= 2;
        insert(k, x, evaluate(x, false));
        checkTriple(k - 3);
      }
    }
  }

  @Override
  double evaluateAndRefine(
      int piece, double x, double upper, double squeeze, double hullTerm) {
    double h = evaluate(x, true);
    if (h == Double.NEGATIVE_INFINITY) {
      return h; // outside where f > 0: rejected, and no chord to add
    }
    double relative = checkAgainstEnvelope(x, h, upper, squeeze, hullTerm);
    int i = insertionIndex(x);
    if (isAbscissa(i, x)) {
      refineInstead(piece);
      return relative;
    }
    // concavity of the new point with its neighbours, checked whether or not it is added
    if (i >= 2) {
      checkTriple(xs[i - 2], hs[i - 2], xs[i - 1], hs[i - 1], x, h);
    }
    if (i >= 1 && i < k) {
      checkTriple(xs[i - 1], hs[i - 1], x, h, xs[i], hs[i]);
    }
    if (i + 1 < k) {
      checkTriple(x, h, xs[i], hs[i], xs[i + 1], hs[i + 1]);
    }
    if (k < maximumHullSize) {
      if (wellSeparated(i, x)) {
        insert(i, x, h);
        markStale();
      } else {
        refineInstead(piece);
      }
    }
    return relative;
  }

  /**
   * A rejected proposal that cannot be added (it rounds onto an abscissa or lies too close to one)
   * would leave the hull as it is, and a steep extended chord can send every later proposal to
   * the same point. Add the middle of the proposal's piece instead (one step out on an unbounded
   * piece): any new abscissa keeps the hull an upper bound, and the accepted draws stay exact
   * because the hull never depends on the proposal being tested.
   */
  private void refineInstead(int piece) {
    if (k >= maximumHullSize) {
      return;
    }
    double lower = pieces.left[piece];
    double upper = pieces.right[piece];
    double s = Math.abs(pieces.slope[piece]);
    double m;
    if (lower == Double.NEGATIVE_INFINITY) {
      m = upper - (s > 0 ? 1 / s : upper - xs[0] + 1);
    } else if (upper == Double.POSITIVE_INFINITY) {
      m = lower + (s > 0 ? 1 / s : lower - xs[0] + 1);
    } else {
      m = 0.5 * (lower + upper);
    }
    if (!support.containsInInterior(m)) {
      return;
    }
    int i = insertionIndex(m);
    if (isAbscissa(i, m) || !wellSeparated(i, m)) {
      return;
    }
    int j = pieces.pieceOf(m);
    double offset = m - pieces.anchor[j];
    double hullTerm = pieces.slope[j] * offset;
    double hullAtM = pieces.value[j] + hullTerm;
    double gapAtM = pieces.gapValue[j] + pieces.gapSlope[j] * offset;
    double hm = evaluate(m, true);
    if (hm == Double.NEGATIVE_INFINITY) {
      return;
    }
    checkAgainstEnvelope(m, hm, hullAtM, hullAtM - gapAtM, hullTerm);
    if (i >= 2) {
      checkTriple(xs[i - 2], hs[i - 2], xs[i - 1], hs[i - 1], m, hm);
    }
    if (i >= 1 && i < k) {
      checkTriple(xs[i - 1], hs[i - 1], m, hm, xs[i], hs[i]);
    }
    if (i + 1 < k) {
      checkTriple(m, hm, xs[i], hs[i], xs[i + 1], hs[i + 1]);
    }
    insert(i, m, hm);
    markStale();
  }

  private boolean wellSeparated(int i, double x) {
    double interval;
    double nearest;
    if (i == 0) {
      interval = xs[1] - xs[0];
      nearest = xs[0] - x;
    } else if (i == k) {
      interval = xs[k - 1] - xs[k - 2];
      nearest = x - xs[k - 1];
    } else {
      interval = xs[i] - xs[i - 1];
      nearest = Math.min(x - xs[i - 1], xs[i] - x);
    }
    return nearest >= MINIMUM_SEPARATION * interval;
  }

  @Override
  void rebuild() {
    SecantHull.build(xs, hs, k, support, pieces);
  }

  private double evaluate(double x, boolean allowMinusInfinity) {
    evaluations++;
    double h = density.value(x);
    checkValue(x, h, allowMinusInfinity);
    return h;
  }

  private void insert(int i, double x, double h) {
    xs = grow(xs);
    hs = grow(hs);
    insertAt(xs, k, i, x);
    insertAt(hs, k, i, h);
    k++;
  }

  private void checkTriple(int i) {
    checkTriple(xs[i], hs[i], xs[i + 1], hs[i + 1], xs[i + 2], hs[i + 2]);
  }

  /**
   * Concavity of three points a &lt; b &lt; c: the chord slopes do not increase beyond the
   * tolerance; then the values' rounding must fit within it. The differences compared are hb - ha
   * and hc - hb.
   */
  private void checkTriple(double xa, double ha, double xb, double hb, double xc, double hc) {
    double first = Squeeze.chordSlope(xa, ha, xb, hb);
    double second = Squeeze.chordSlope(xb, hb, xc, hc);
    double differences = Math.max(Math.abs(hb - ha), Math.abs(hc - hb));
    double magnitude = Math.max(Math.abs(ha), Math.max(Math.abs(hb), Math.abs(hc)));
    double values = allowance(differences, magnitude);
    double slopes =
        tolerance * (Math.abs(first) + Math.abs(second))
            + values * (1.0 / (xb - xa) + 1.0 / (xc - xb));
    if (second > first + slopes) {
      throw new NotLogConcaveException(
          "h is not log-concave: chord slopes increase from " + first + " on [" + xa + ", " + xb
              + "] to " + second + " on [" + xb + ", " + xc + "] (tolerance " + slopes + ")",
          xb);
    }
    requirePrecision(xb, hb, differences, magnitude);
  }

  @Override
  public String toString() {
    return "AdaptiveRejectionSampler[secant hull, " + k + " abscissae, support " + support + "]";
  }
}

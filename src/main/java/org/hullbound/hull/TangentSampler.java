package org.hullbound.hull;

/**
 * Adaptive rejection sampling with the tangent hull of Gilks and Wild (1992).
 *
 * <p>Starting abscissae are evaluated and, on unbounded sides, extended outward with doubling steps
 * until h' &gt; 0 at the leftmost and h' &lt; 0 at the rightmost point (their section 2.2). Every
 * point evaluated at the rejection test is checked for concavity against its neighbours and added
 * while the hull is below its cap.
 */
final class TangentSampler extends AdaptiveSampler {

  private final DifferentiableLogDensity density;
  /** The options' spread: the first outward step from a single starting point. */
  private final double spread;
  private double[] ds;

  TangentSampler(DifferentiableLogDensity density, Support support, HullOptions options) {
    super(support, options, 2);
    this.density = density;
    this.ds = new double[xs.length];
    this.spread = options.spread();
    double[] start =
        options.hasStartingAbscissae()
            ? checkedStart(options.startingAbscissaeOrNull())
            : automaticStart(options.guess(), options.spread(), false);
    for (double x : start) {
      Evaluation e = evaluate(x, false);
      append(x, e.value(), e.slope());
    }
    initialise();
    rebuild();
  }

  @Override
  void insertEvaluated(int i, double x) {
    Evaluation e = evaluate(x, false);
    insert(i, x, e.value(), e.slope());
  }

  /** Checks the starting tangents pairwise and brackets the mode. */
  @Override
  void initialise() {
    for (int i = 0; i + 1 < k; i++) {
      checkPair(xs[i], hs[i], ds[i], xs[i + 1], hs[i + 1], ds[i + 1]);
    }
    searchOutward(initialStep(spread));
  }

  /** Initialisation, Gilks and Wild 1992 section 2.2: bracket the mode on unbounded sides. */
  private void searchOutward(double step) {
    double leftStep = step;
    double rightStep = step;
    int leftSteps = 0;
    int rightSteps = 0;
    while (true) {
      boolean leftOk = support.isBoundedBelow() || ds[0] > 0;
      boolean rightOk = support.isBoundedAbove() || ds[k - 1] < 0;
      if (leftOk && rightOk) {
        return;
      }
      if (!leftOk) {
        double x = xs[0] - leftStep;
        if (leftSteps++ == maximumSearchSteps || !Double.isFinite(x)) {
          throw noFallingSlope(true, xs[0], ds[0]);
        }
        leftStep *= 2;
        Evaluation e = evaluate(x, false);
        insert(0, x, e.value(), e.slope());
        checkPair(xs[0], hs[0], ds[0], xs[1], hs[1], ds[1]);
      }
      if (!rightOk) {
        double x = xs[k - 1] + rightStep;
        if (rightSteps++ == maximumSearchSteps || !Double.isFinite(x)) {
          throw noFallingSlope(false, xs[k - 1], ds[k - 1]);
        }
        rightStep *= 2;
        Evaluation e = evaluate(x, false);
        insert(k, x, e.value(), e.slope());
        checkPair(xs[k - 2], hs[k - 2], ds[k - 2], xs[k - 1], hs[k - 1], ds[k - 1]);
      }
    }
  }

  @Override
  double evaluateAndRefine(
      int piece, double x, double upper, double squeeze, double hullTerm) {
    Evaluation e = evaluate(x, true);
    double h = e.value();
    if (h == Double.NEGATIVE_INFINITY) {
      return h; // outside where f > 0: rejected, and no tangent to add
    }
    double relative = checkAgainstEnvelope(x, h, upper, squeeze, hullTerm);
    double d = e.slope();
    int i = insertionIndex(x);
    if (isAbscissa(i, x)) {
      return relative;
    }
    if (i > 0) {
      checkPair(xs[i - 1], hs[i - 1], ds[i - 1], x, h, d);
    }
    if (i < k) {
      checkPair(x, h, d, xs[i], hs[i], ds[i]);
    }
    if (k < maximumHullSize) {
      insert(i, x, h, d);
      markStale();
    }
    return relative;
  }

  @Override
  void rebuild() {
    UpperHull.build(xs, hs, ds, k, support, pieces);
  }

  private Evaluation evaluate(double x, boolean allowMinusInfinity) {
    evaluations++;
    Evaluation e = density.evaluate(x);
    if (e == null) {
      throw new InvalidDensityException(
          "the density returned null instead of an Evaluation at x = " + x, x, Double.NaN);
    }
    checkValue(x, e.value(), allowMinusInfinity);
    if (e.value() != Double.NEGATIVE_INFINITY && !Double.isFinite(e.slope())) {
      throw new InvalidDensityException(
          "h'(x) = " + e.slope() + " at x = " + x + " where h(x) = " + e.value()
              + ": expected a finite slope",
          x,
          e.slope());
    }
    return e;
  }

  private void append(double x, double h, double d) {
    insert(k, x, h, d);
  }

  private void insert(int i, double x, double h, double d) {
    xs = grow(xs);
    hs = grow(hs);
    ds = grow(ds);
    insertAt(xs, k, i, x);
    insertAt(hs, k, i, h);
    insertAt(ds, k, i, d);
    k++;
  }

  /**
   * Concavity of two tangent points a &lt; b: slopes do not increase, and neither value lies above
   * the other's tangent, each beyond the tolerance; then the values' rounding must fit within it.
   * The differences compared are hb - ha and the tangents' rises over the interval.
   */
  private void checkPair(double xa, double ha, double da, double xb, double hb, double db) {
    double width = xb - xa;
    double differences =
        Math.max(Math.abs(hb - ha), Math.max(Math.abs(da * width), Math.abs(db * width)));
    double magnitude = Math.max(Math.abs(ha), Math.abs(hb));
    double values = allowance(differences, magnitude);
    double slopes = tolerance * (Math.abs(da) + Math.abs(db)) + values / width;
    if (db > da + slopes) {
      throw new NotLogConcaveException(
          "h is not log-concave: slopes increase from h'(" + xa + ") = " + da + " to h'(" + xb
              + ") = " + db + " (tolerance " + slopes + ")",
          xb);
    }
    double tangentA = ha + da * width;
    if (hb > tangentA + values) {
      throw new NotLogConcaveException(
          "h is not log-concave: h(" + xb + ") = " + hb + " lies above the tangent at x = " + xa
              + ", whose value there is " + tangentA + " (tolerance " + values + ")",
          xb);
    }
    double tangentB = hb - db * width;
    if (ha > tangentB + values) {
      throw new NotLogConcaveException(
          "h is not log-concave: h(" + xa + ") = " + ha + " lies above the tangent at x = " + xb
              + ", whose value there is " + tangentB + " (tolerance " + values + ")",
          xa);
    }
    requirePrecision(xb, hb, differences, magnitude);
  }

  @Override
  public String toString() {
    return "AdaptiveRejectionSampler[tangent hull, " + k + " abscissae, support " + support + "]";
  }
}

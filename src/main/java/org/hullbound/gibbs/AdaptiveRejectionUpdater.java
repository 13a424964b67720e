package org.hullbound.gibbs;

import java.util.Arrays;
import java.util.random.RandomGenerator;
import org.hullbound.hull.AdaptiveRejectionSampler;
import org.hullbound.hull.DifferentiableLogDensity;
import org.hullbound.hull.Evaluation;
import org.hullbound.hull.HullException;
import org.hullbound.hull.HullOptions;
import org.hullbound.hull.ImpreciseDensityException;
import org.hullbound.hull.LogDensity;
import org.hullbound.hull.NotLogConcaveException;
import org.hullbound.hull.ProposalLimitException;
import org.hullbound.hull.Support;
import org.hullbound.sampling.TangentEnvelopeDraw;

/**
 * An exact draw by adaptive rejection sampling (Gilks and Wild 1992; derivative-free secants,
 * Gilks 1992, where the conditional is not smooth), warm-started from the previous sweep.
 *
 * <p>Warm start: the previous sweep's evaluations locate the conditional's mode (where the slope
 * changes sign) and its curvature there; the next hull starts from two tangents one conditional
 * standard deviation either side of the mode, predicted from that and corrected by a Newton step
 * from the first tangent, so that a draw costs about three evaluations instead of a search. One
 * sampler serves every draw, started over on the new conditional ({@link
 * AdaptiveRejectionSampler#restart(double...)}), so that a draw allocates almost nothing.
 *
 * <p>When the hull finds the conditional is not log-concave after all ({@link
 * NotLogConcaveException}), or its values too coarsely rounded to tell ({@link
 * ImpreciseDensityException}, a huge constant in the log-density), this unknown switches, for the
 * rest of the chain, to adaptive rejection Metropolis (Gilks, Best and Tan 1995), the draw is
 * redone, and the switch is reported.
 */
final class AdaptiveRejectionUpdater implements Updater {
  /**
   * Starting tangents this many conditional standard deviations from the predicted mode, widened
   * to sqrt(1 + e^2) where e is the typical miss of the prediction in standard deviations (an
   * offset of 1 needs the fewest evaluations when the mode is known: about 2.8 per draw for a
   * normal; measured with the hull package).
   */
  static final double START_OFFSET = 1.0;

  private static final int HULL_CAP = 32;

  /** A probe closer than this many spreads to the mode gets a starting point on either side. */
  static final double NEAR_MODE = 0.25;

  /** The longest Newton step from the probe that is trusted, in starting steps. */
  static final double FARTHEST_SHIFT = 3.0;

  /** Weight kept per sweep by the mode predictor's running regression. */
  private static final double FADE = 0.98;

  private final int index;
  private final ScalarConditional conditional;
  private final boolean smooth;
  private final String reason;
  private final Recorder recorder = new Recorder();
  /** The cheap path of a smooth draw: the envelope of this draw's few tangents. */
  private final TangentEnvelopeDraw envelope = TangentEnvelopeDraw.create();
  /**
   * A proposal the cheap path evaluated and handed over undecided, and whether its rejection test
   * passed: accepted once the general sampler has checked it (see {@link TangentEnvelopeDraw}).
   */
  private double pendingPoint = Double.NaN;
  private boolean pendingAccepted;
  /**
   * The hull of the last draw, started over for the next while the support stays the same; null
   * before the first draw and after a failure.
   */
  private AdaptiveRejectionSampler sampler;
  private double samplerLower;
  private double samplerUpper;
  private double centre = Double.NaN;
  private double spread = 1.0;
  private double squaredMiss;
  private double weight;
  private double sumX;
  private double sumY;
  private double sumXX;
  private double sumXY;
  private long draws;
  private long evaluations;
  private long sweeps;
  private FallbackUpdater fallback;
  private String switchNote;
  private long switchSweep;

  private final long adaptationSweeps;

  AdaptiveRejectionUpdater(UpdateRule.AdaptiveRejection rule, long adaptationSweeps) {
    this.adaptationSweeps = adaptationSweeps;
    this.index = rule.index();
    this.conditional = rule.conditional().forOneChain();
    this.smooth = conditional.smooth();
    this.reason = rule.reason();
  }

  @Override
  public void update(double[] state, RandomGenerator rng) {
    sweeps++;
    if (fallback != null) {
      fallback.update(state, rng);
      return;
    }
    double lower = conditional.lowerBound(state);
    double upper = conditional.upperBound(state);
    double current = conditional.toSamplingScale(state[index]);
    double guess = predictedMode(current);
    if (!Double.isFinite(guess)) {
      guess = 0;
    }
    recorder.start(state);
    double u;
    try {
      double[] start =
          smooth && Double.isFinite(centre) ? probedStart(guess, lower, upper) : null;
      if (start == null) {
        start = startingAbscissae(guess, lower, upper);
      }
      pendingAccepted = false;
      if (smooth) {
        start = steepen(start, lower, upper);
        u = cheapDraw(start, guess, lower, upper, current, rng);
      } else {
        u = drawWithOneRestart(start, guess, lower, upper, current, rng);
      }
    } catch (NotLogConcaveException | ImpreciseDensityException refused) {
      sampler = null;
      evaluations += recorder.count;
      switchSweep = sweeps;
      switchNote =
          "switched to adaptive rejection Metropolis at sweep " + sweeps + ": "
              + refused.getMessage();
      String reason =
          refused instanceof ImpreciseDensityException
              ? "too coarsely rounded for the hull at run time"
              : "not log-concave at run time";
      fallback =
          new FallbackUpdater(
              new UpdateRule.Fallback(index, conditional, reason),
              Math.max(0, adaptationSweeps - sweeps), Double.isFinite(centre) ? centre : current,
              spread);
      fallback.update(state, rng);
      return;
    } catch (RuntimeException failure) {
      sampler = null;
      throw failure;
    }
    evaluations += recorder.count;
    draws++;
    state[index] = conditional.toNatural(u);
    double predictionSpread = spread;
    learn(u);
    if (Double.isFinite(centre)) {
      double miss = (centre - guess) / predictionSpread;
      if (Double.isFinite(miss)) {
        squaredMiss = FADE * squaredMiss + (1 - FADE) * Math.min(miss * miss, 9.0);
      }
    }
    if (Double.isFinite(centre) && Double.isFinite(current)) {
      track(current, centre);
    }
  }

  /**
   * The draw from the envelope of the tangents evaluated so far (the starting points, the probe
   * and any the start moved outward: every one an evaluation of this conditional), which decides
   * nearly every draw with no hull built; where it hands over, the general sampler starts
   * from its abscissae, so that the draw is adaptive rejection all the same (Gilks and Wild 1992).
   * A recorded value that is not finite leaves the start to the general sampler as before, which
   * judges it.
   */
  private double cheapDraw(double[] start, double guess, double lower, double upper,
      double current, RandomGenerator rng) {
    envelope.clear();
    for (double x : start) {
      recorder.evaluate(x); // the general sampler would evaluate them too; cached
    }
    for (int i = 0; i < recorder.count; i++) {
      if (!Double.isFinite(recorder.h[i]) || !Double.isFinite(recorder.s[i])) {
        return drawWithOneRestart(start, guess, lower, upper, current, rng);
      }
      envelope.add(recorder.x[i], recorder.h[i], recorder.s[i]);
    }
    double drawn = envelope.draw(recorder, lower, upper, rng);
    if (!Double.isNaN(drawn)) {
      return drawn;
    }
    pendingPoint = envelope.pendingPoint();
    pendingAccepted = envelope.pendingAccepted();
    return drawWithOneRestart(envelope.abscissae(), guess, lower, upper, current, rng);
  }

  /**
   * A draw from the hull started at {@code start}; when that draw reaches the proposal cap, one
   * more from a new hull started at the stuck hull's highest abscissa and its neighbours, which
   * bracket the conditional's mode (for a concave h the mode lies between the neighbours of the
   * highest point). The cap is met when the hull ran out of abscissae far from a conditional much
   * narrower than where it started; the new hull spends its whole cap near the mode. This biases
   * nothing: an accepted proposal follows the target whatever was proposed before it (Gilks and
   * Wild 1992, the rejection step). Any failure of the new hull (its cap again, or values too
   * coarsely rounded to tell, as under 1e15 binomial trials) makes the conditional degenerate:
   * no fallback would fare better on it.
   */
  private double drawWithOneRestart(double[] start, double guess, double lower, double upper,
      double current, RandomGenerator rng) {
    try {
      return draw(start, guess, lower, upper, rng);
    } catch (ProposalLimitException stuck) {
      double[] around = aroundHighest(stuck.abscissae(), stuck.values());
      sampler = null;
      try {
        return draw(around, around[around.length / 2], lower, upper, rng);
      } catch (HullException restartFailed) {
        sampler = null;
        throw new DegenerateConditionalException(current, lower, upper, stuck, restartFailed);
      }
    }
  }

  /**
   * The highest of {@code xs} (by {@code hs}) with its neighbours on either side, where they
   * exist; ascending, inside the support since the hull's abscissae are.
   */
  static double[] aroundHighest(double[] xs, double[] hs) {
    int top = 0;
    for (int i = 1; i < hs.length; i++) {
      if (hs[i] > hs[top]) {
        top = i;
      }
    }
    int from = Math.max(0, top - 1);
    int to = Math.min(xs.length - 1, top + 1);
    return Arrays.copyOfRange(xs, from, to + 1);
  }

  /**
   * One exact draw from the hull started at {@code start}. The sampler of the previous draw is
   * started over on the new conditional (the recorder reads the current state) while the support
   * is the same, which draws exactly what a new sampler would, without allocating one.
   */
  private double draw(double[] start, double guess, double lower, double upper,
      RandomGenerator rng) {
    if (sampler != null && lower == samplerLower && upper == samplerUpper) {
      sampler.restart(start);
    } else {
      sampler = null;
      Support support = new Support(lower, upper);
      HullOptions options =
          HullOptions.defaults()
              .withAutomaticStart(guess, spread)
              .withMaximumHullSize(HULL_CAP)
              .withStartingAbscissae(start);
      sampler =
          smooth
              ? AdaptiveRejectionSampler.withDerivatives(recorder, support, options)
              : AdaptiveRejectionSampler.derivativeFree(
                  (LogDensity) recorder::value, support, options);
      samplerLower = lower;
      samplerUpper = upper;
    }
    if (pendingAccepted) {
      // the cheap path's proposal passed its rejection test and, now, the hull's checks
      pendingAccepted = false;
      return pendingPoint;
    }
    return sampler.sample(rng);
  }

  /**
   * Where this sweep's conditional probably peaks, from the value the unknown has now: a
   * regression of past modes on the values before their draws, with weights fading by 2% a sweep.
   * In a Gibbs sweep the other unknowns were just drawn given this value, so the new conditional
   * moves with it: for two correlated normals the mode is exactly linear in it (slope rho^2);
   * for a nearly independent unknown the slope is near 0 and the prediction is the last mode.
   */
  private double predictedMode(double current) {
    if (!Double.isFinite(centre)) {
      return Double.isFinite(current) ? current : 0;
    }
    if (weight < 5 || !Double.isFinite(current)) {
      return centre;
    }
    double meanX = sumX / weight;
    double meanY = sumY / weight;
    double varianceX = sumXX / weight - meanX * meanX;
    double covariance = sumXY / weight - meanX * meanY;
    // A value that does not vary predicts nothing: the fading mean of the past modes then. A move
    // along a line starts every draw at the same position (0, or 1 for a rescaling), and its
    // mode, relative to a base point that is itself a posterior draw, scatters about a mean: the
    // last mode alone misses the next by about twice the variance that the mean does.
    double slope = varianceX > 1e-12 * Math.max(1.0, meanX * meanX)
        ? Math.min(Math.max(covariance / varianceX, 0.0), 1.0) : 0.0;
    double predicted = meanY + slope * (current - meanX);
    // A prediction far from the last mode is not trusted: keep within three spreads of it.
    return Math.min(Math.max(predicted, centre - 3 * spread), centre + 3 * spread);
  }

  private void track(double before, double mode) {
    weight = FADE * weight + 1;
    sumX = FADE * sumX + before;
    sumY = FADE * sumY + mode;
    sumXX = FADE * sumXX + before * before;
    sumXY = FADE * sumXY + before * mode;
  }

  /**
   * Moves an outer starting point outward, by the spread, while its tangent is nearly flat (less
   * than a quarter of the slope one standard deviation from the mode of a normal) or points the
   * wrong way: a flat outer tangent would give the hull a heavy tail, costly to sample from. The
   * evaluations are cached, so the hull does not repeat them.
   */
  private double[] steepen(double[] start, double lower, double upper) {
    double left = start[0];
    double right = start[start.length - 1];
    double step = spread;
    for (int k = 0; k < 8 && lower == Double.NEGATIVE_INFINITY; k++) {
      double slope = recorder.slopeAt(left);
      if (!(slope * spread < 0.25) || !Double.isFinite(slope)) {
        break;
      }
      left -= step;
      step *= 2;
    }
    step = spread;
    for (int k = 0; k < 8 && upper == Double.POSITIVE_INFINITY; k++) {
      double slope = recorder.slopeAt(right);
      if (!(slope * spread > -0.25) || !Double.isFinite(slope)) {
        break;
      }
      right += step;
      step *= 2;
    }
    if (left == start[0] && right == start[start.length - 1]) {
      return start;
    }
    double[] moved = start.clone();
    moved[0] = left;
    moved[moved.length - 1] = right;
    return moved;
  }

  /**
   * Starting points about one conditional standard deviation either side of where the conditional
   * peaks now, found with one probe: the tangent at the upper point of {@link #startingAbscissae}
   * and the curvature learnt from the last draw give a Newton step to the mode (exact for a normal
   * conditional), and the other point goes one spread beyond it. A probe within {@value
   * #NEAR_MODE} spread of that mode has a nearly flat tangent, so then a point goes either side
   * (three in all). About 3.0 evaluations per draw instead of 3.3 for the clinics demo's intercept
   * and slope, whose predicted modes miss by about one spread; the same 2.84 for its group
   * effects, whose predictions hardly miss. Null where a point would leave the support or h is
   * not finite at the probe, for {@link #startingAbscissae} to place them instead. The hull is
   * then built from these points as from any others, so the draw stays exact. Null also where the
   * Newton step is longer than {@value #FARTHEST_SHIFT} starting steps.
   */
  private double[] probedStart(double guess, double lower, double upper) {
    double step = startingStep();
    double probe = guess + step;
    if (!(probe > lower && probe < upper)) {
      return null;
    }
    Evaluation atProbe = recorder.evaluate(probe);
    if (!Double.isFinite(atProbe.value()) || !Double.isFinite(atProbe.slope())) {
      return null;
    }
    // Newton: h'(mode) = 0 = h'(probe) - (mode - probe) / spread^2
    double shift = atProbe.slope() * spread * spread;
    if (!(Math.abs(shift) <= FARTHEST_SHIFT * step)) {
      // the conditional is not curved as learnt (a Newton step of 1832 spreads was met in a
      // fuzzed fit, whose hull then stalled at its cap): the plain start, the probe one of its
      // points
      return null;
    }
    double mode = probe + shift;
    double[] points;
    if (shift <= -NEAR_MODE * spread) {
      points = new double[] {mode - START_OFFSET * spread, probe};
    } else if (shift >= NEAR_MODE * spread) {
      points = new double[] {probe, mode + START_OFFSET * spread};
    } else {
      points =
          new double[] {mode - START_OFFSET * spread, probe, mode + START_OFFSET * spread};
    }
    for (double point : points) {
      if (!(point > lower && point < upper)) {
        return null;
      }
    }
    return points;
  }

  /** The distance of the starting points from the predicted mode. */
  private double startingStep() {
    return START_OFFSET * Math.min(Math.sqrt(1 + squaredMiss), 2.0) * spread;
  }

  /** Two points (three without derivatives) around the guess, strictly inside the support. */
  private double[] startingAbscissae(double guess, double lower, double upper) {
    double step = startingStep();
    double[] points =
        smooth
            ? new double[] {guess - step, guess + step}
            : new double[] {guess - step, guess, guess + step};
    boolean inside = true;
    for (double point : points) {
      inside &= point > lower && point < upper;
    }
    if (inside) {
      return points;
    }
    if (Double.isFinite(lower) && Double.isFinite(upper)) {
      double range = upper - lower;
      return smooth
          ? new double[] {lower + range / 3, lower + 2 * range / 3}
          : new double[] {lower + range / 4, lower + range / 2, lower + 3 * range / 4};
    }
    // One bound only: keep the points inside by stepping back from the bound.
    double[] moved = points.clone();
    for (int k = 0; k < moved.length; k++) {
      if (!(moved[k] > lower)) {
        moved[k] = lower + Math.min(step, Math.max(1e-8, Math.abs(lower) * 1e-8)) * (k + 1);
      } else if (!(moved[k] < upper)) {
        moved[k] = upper - Math.min(step, Math.max(1e-8, Math.abs(upper) * 1e-8)) * (moved.length - k);
      }
    }
    return moved;
  }

  /**
   * Locates the mode and curvature from this sweep's evaluations: between the last rising and the
   * first falling slope by the secant of the slopes (a Newton step on h'); without derivatives from
   * the highest value and its neighbours (a parabola).
   */
  private void learn(double drawn) {
    int n = recorder.count;
    double[] x = recorder.x;
    double[] h = recorder.h;
    double[] s = recorder.s;
    // in place: the recorder starts afresh at the next draw
    sortTogether(x, h, s, n);
    double newCentre = Double.NaN;
    double curvature = Double.NaN;
    if (smooth) {
      for (int k = 0; k + 1 < n; k++) {
        if (s[k] > 0 && s[k + 1] <= 0 && x[k + 1] > x[k]) {
          newCentre = x[k] + s[k] * (x[k + 1] - x[k]) / (s[k] - s[k + 1]);
          curvature = (s[k] - s[k + 1]) / (x[k + 1] - x[k]);
          break;
        }
      }
    } else if (n >= 3) {
      int best = 0;
      for (int k = 1; k < n; k++) {
        if (h[k] > h[best]) {
          best = k;
        }
      }
      int mid = Math.min(Math.max(best, 1), n - 2);
      double left = (h[mid] - h[mid - 1]) / (x[mid] - x[mid - 1]);
      double right = (h[mid + 1] - h[mid]) / (x[mid + 1] - x[mid]);
      curvature = (left - right) / ((x[mid + 1] - x[mid - 1]) / 2);
      newCentre = x[best];
    }
    if (Double.isFinite(newCentre) && curvature > 0 && Double.isFinite(curvature)) {
      centre = newCentre;
      double sd = 1 / Math.sqrt(curvature);
      double floor = 1e-10 * Math.max(1.0, Math.abs(centre));
      spread = Math.min(Math.max(sd, floor), 1e10);
    } else {
      centre = drawn;
    }
  }

  private static void sortTogether(double[] x, double[] h, double[] s, int n) {
    for (int i = 1; i < n; i++) {
      double xi = x[i];
      double hi = h[i];
      double si = s[i];
      int j = i - 1;
      while (j >= 0 && x[j] > xi) {
        x[j + 1] = x[j];
        h[j + 1] = h[j];
        s[j + 1] = s[j];
        j--;
      }
      x[j + 1] = xi;
      h[j + 1] = hi;
      s[j + 1] = si;
    }
  }

  @Override
  public int[] indices() {
    return new int[] {index};
  }

  @Override
  public String method() {
    String base = smooth ? "adaptive rejection" : "adaptive rejection (no derivatives)";
    return fallback == null ? base : base + ", then " + fallback.method();
  }

  @Override
  public long draws() {
    return draws + (fallback == null ? 0 : fallback.draws());
  }

  @Override
  public long evaluations() {
    return evaluations + (fallback == null ? 0 : fallback.evaluations());
  }

  @Override
  public UpdaterState save() {
    UpdaterState.Writer out = new UpdaterState.Writer();
    out.put(sweeps).put(draws).put(evaluations).put(switchSweep)
        .put(centre).put(spread).put(squaredMiss)
        .put(weight).put(sumX).put(sumY).put(sumXX).put(sumXY)
        .put(fallback == null ? 0L : 1L);
    if (fallback != null) {
      fallback.write(out);
    }
    return out.note(switchNote).done();
  }

  @Override
  public void restore(UpdaterState saved) {
    UpdaterState.Reader in = new UpdaterState.Reader(saved, method());
    long restoredSweeps = in.nextLong();
    long restoredDraws = in.nextLong();
    long restoredEvaluations = in.nextLong();
    long restoredSwitchSweep = in.nextLong();
    double restoredCentre = in.nextDouble();
    double restoredSpread = in.nextDouble();
    double restoredSquaredMiss = in.nextDouble();
    double restoredWeight = in.nextDouble();
    double restoredSumX = in.nextDouble();
    double restoredSumY = in.nextDouble();
    double restoredSumXX = in.nextDouble();
    double restoredSumXY = in.nextDouble();
    FallbackUpdater restoredFallback = null;
    if (in.nextFlag()) {
      // The switched-to fallback was made with what remained of burn-in at the switch; make it
      // the same way, then let it read its own words.
      restoredFallback =
          new FallbackUpdater(
              new UpdateRule.Fallback(index, conditional, "not log-concave at run time"),
              Math.max(0, adaptationSweeps - restoredSwitchSweep), Double.NaN, 1.0);
      restoredFallback.read(in);
    }
    in.end();
    sweeps = restoredSweeps;
    draws = restoredDraws;
    evaluations = restoredEvaluations;
    switchSweep = restoredSwitchSweep;
    centre = restoredCentre;
    spread = restoredSpread;
    squaredMiss = restoredSquaredMiss;
    weight = restoredWeight;
    sumX = restoredSumX;
    sumY = restoredSumY;
    sumXX = restoredSumXX;
    sumXY = restoredSumXY;
    fallback = restoredFallback;
    switchNote = restoredFallback == null ? null : saved.note();
  }

  @Override
  public String switchNote() {
    return switchNote;
  }

  @Override
  public long switchSweep() {
    return switchSweep;
  }

  /** The conditional at the current state, recording each evaluation for the warm start. */
  private final class Recorder implements DifferentiableLogDensity {
    private final double[] slope = new double[1];
    private double[] x = new double[16];
    private double[] h = new double[16];
    private double[] s = new double[16];
    private double[] state;
    private int count;

    void start(double[] state) {
      this.state = state;
      this.count = 0;
    }

    @Override
    public Evaluation evaluate(double u) {
      int seen = find(u);
      if (seen >= 0) {
        return new Evaluation(h[seen], s[seen]);
      }
      slope[0] = Double.NaN;
      double value = conditional.logDensity(u, state, slope);
      record(u, value, slope[0]);
      return new Evaluation(value, slope[0]);
    }

    /** The slope at {@code u}, evaluating (once) if needed. */
    double slopeAt(double u) {
      return evaluate(u).slope();
    }

    /** Where {@code u} was already evaluated in this update, else -1 (the state is unchanged). */
    private int find(double u) {
      for (int k = count - 1; k >= 0; k--) {
        if (x[k] == u) {
          return k;
        }
      }
      return -1;
    }

    double value(double u) {
      double value = conditional.logDensity(u, state, null);
      record(u, value, Double.NaN);
      return value;
    }

    private void record(double u, double value, double derivative) {
      if (count == x.length) {
        x = Arrays.copyOf(x, 2 * count);
        h = Arrays.copyOf(h, 2 * count);
        s = Arrays.copyOf(s, 2 * count);
      }
      x[count] = u;
      h[count] = value;
      s[count] = derivative;
      count++;
    }
  }

  /** Why the model chose this update. */
  String reason() {
    return reason;
  }
}

package org.hullbound.hull;

import java.util.random.RandomGenerator;

/**
 * The draw loop shared by the tangent and the secant form: sampling, squeezing and rejection tests
 * and the updating step of Gilks and Wild (1992, section 2.2), over a {@link PiecewiseExponential}
 * that the subclass rebuilds.
 *
 * <p>The loop allocates nothing while the squeeze accepts; abscissae are kept sorted in growable
 * arrays so that a fresh sampler per draw (as in Gibbs sampling) stays cheap to make.
 */
abstract class AdaptiveSampler implements AdaptiveRejectionSampler {

  /** Initial room for abscissae; arrays grow by doubling up to the cap. */
  private static final int INITIAL_CAPACITY = 4;

  /** Proposals without a rebuild (plus one per piece) after which the alias table is built. */
  static final int SETTLED_AFTER = 32;

  /**
   * Rounding of a comparison among values of h, in ulps of the largest: half an ulp from the last
   * rounding inside h of each of the two values compared, and as much again for the hull's own
   * arithmetic on them (common practice: a difference of two rounded values is good to about one
   * ulp of the larger).
   */
  static final int ROUNDING_ULPS = 2;

  /** Where an automatic start falls outside a bound: this fraction of the way from the bound in. */
  private static final double INSIDE_BOUND = 0.1;

  final Support support;
  final int maximumHullSize;
  final double tolerance;
  final int maximumSearchSteps;
  private final long maximumProposals;
  final PiecewiseExponential pieces;
  double[] xs;
  double[] hs;
  int k;
  /** Set when abscissae were added: the pieces are rebuilt before the next proposal needs them. */
  private boolean stale;

  /** The fast path over the current pieces, or null until the hull has settled. */
  private SettledPieces settled;
  /**
   * The settled table's columns and shift, held here as well so that a fast draw reads one array
   * reached from this sampler rather than through the table: null while {@link #settled} is.
   */
  private double[] settledColumns;
  private int settledShift;
  /** The table's storage, kept across rebuilds. */
  private SettledPieces spare;
  private int quietProposals;
  /**
   * Why the sampler may not draw, or null: a restart under way or failed; draws are refused until
   * a restart succeeds. A message, not an exception made at every restart: making one walks the
   * stack, which was about 5% of a sweep of many small draws.
   */
  private String unusable;
  /** The failure of the last restart, or null. */
  private RuntimeException restartFailure;

  long evaluations;
  long proposals;
  long squeezeAcceptances;
  /** Proposals accepted on the fast path alone; counted in proposals and squeeze acceptances. */
  long innerAcceptances;
  /** Rejections decided by the hull before an evaluation (see {@link SamplerStatistics}). */
  long hullRejections;
  long densityAcceptances;
  long rejections;

  AdaptiveSampler(Support support, HullOptions options, int piecesPerPoint) {
    if (support == null) {
      throw new IllegalArgumentException("support must not be null");
    }
    if (options == null) {
      throw new IllegalArgumentException("options must not be null");
    }
    this.support = support;
    this.maximumHullSize = options.maximumHullSize();
    this.tolerance = options.logConcavityTolerance();
    this.maximumSearchSteps = options.maximumSearchSteps();
    this.maximumProposals = options.maximumProposals();
    this.pieces = new PiecewiseExponential(piecesPerPoint * INITIAL_CAPACITY + 2);
    this.xs = new double[INITIAL_CAPACITY];
    this.hs = new double[INITIAL_CAPACITY];
  }

  @Override
  public final double sample(RandomGenerator rng) {
    double[] columns = settledColumns;
    if (columns == null) {
      return sampleFrom(rng, -1);
    }
    // a column inside an inner rectangle lies under the squeeze on all its step (Marsaglia and
    // Tsang 2000): the proposal is accepted at once
    long bits = rng.nextLong();
    int at = PackedRecords.COLUMN_STRIDE * (int) (bits >>> settledShift);
    // decided on the column's width alone, before the point is computed: a slow column is
    // known one load after the random bits
    double span = columns[at + PackedRecords.COLUMN_SPAN];
    if (span == span) {
      innerAcceptances++;
      return SettledPieces.columnPoint(columns, at, span, bits);
    }
    return sampleRemainder(rng, settled, bits);
  }

  /** A column not inside one inner rectangle was drawn: its inner part, else the rest. */
  private double sampleRemainder(RandomGenerator rng, SettledPieces fast, long bits) {
    double x = fast.innerPoint(bits);
    if (!Double.isNaN(x)) {
      innerAcceptances++;
      return x;
    }
    return sampleFrom(rng, fast.select(rng.nextLong()));
  }

  /**
   * The general draw loop. With a settled table, each proposal is drawn through its two layers;
   * the first one from entry {@code entry} of its rest when that is not -1.
   */
  private double sampleFrom(RandomGenerator rng, int entry) {
    PiecewiseExponential p = pieces;
    int e = entry;
    // a cap on proposals per draw, so that a hull far above the density cannot spin for hours
    long left = maximumProposals;
    double last = Double.NaN;
    while (true) {
      if (left-- == 0) {
        throw new ProposalLimitException(
            maximumProposals, abscissae(), java.util.Arrays.copyOf(hs, k), last);
      }
      refresh();
      SettledPieces fast = settled;
      if (fast != null && e < 0) {
        double inner = fast.innerDraw(rng.nextLong());
        if (!Double.isNaN(inner)) {
          innerAcceptances++;
          return inner;
        }
        e = fast.select(rng.nextLong());
      }
      proposals++;
      // Gilks and Wild 1992, sampling step: draw x* from the normalised envelope exp(E_k), with
      // w uniform under it relative to E_k(x*)
      int j;
      double x;
      double w;
      // how far the envelope lies below the piece's top E_k: a step of the settled staircase
      double drop = 0;
      if (fast != null) {
        int at = PackedRecords.REST_STRIDE * e;
        double[] d = fast.restRecords;
        j = fast.restPiece[e];
        if (p.uniform[j]) {
          // x uniform on the step, w uniform on [floor, 1) above its inner rectangle
          x = fast.uniformPoint(e, rng.nextDouble());
          w = d[at + PackedRecords.REST_FLOOR] + d[at + PackedRecords.REST_SHARE] * rng.nextDouble();
          drop = d[at + PackedRecords.REST_DROP];
        } else {
          x = p.position(j, rng.nextDouble());
          w = rng.nextDouble();
        }
        e = -1;
      } else {
        if (++quietProposals >= SETTLED_AFTER + p.size) {
          settle();
        }
        j = p.select(rng.nextDouble());
        x = p.position(j, rng.nextDouble());
        w = rng.nextDouble();
      }
      last = x;
      double[] d = p.pieceRecords;
      int at = PackedRecords.PIECE_STRIDE * j;
      double offset = x - d[at + PackedRecords.PIECE_ANCHOR];
      double gap =
          d[at + PackedRecords.PIECE_GAP_VALUE]
              + d[at + PackedRecords.PIECE_GAP_SLOPE] * offset
              - drop;
      // squeezing test: accept when w <= exp(l_k(x*) - E_k(x*)), with no evaluation of h
      if (belowExp(w, gap)) {
        squeezeAcceptances++;
        return x;
      }
      // on a piece drawn uniformly under its top, E_k > u_k: w above exp(u_k - E_k) is rejected
      // by the hull itself, before h is evaluated
      double raise =
          d[at + PackedRecords.PIECE_RAISE_VALUE]
              + d[at + PackedRecords.PIECE_RAISE_SLOPE] * offset
              - drop;
      if (!belowExp(w, raise)) {
        rejections++;
        hullRejections++;
        continue;
      }
      double hullTerm = p.slope[j] * offset;
      double upper = p.value[j] + hullTerm;
      // rejection test: evaluate h(x*) and accept when w <= exp(h(x*) - E_k(x*)), both measured
      // from the hull's reference value; updating step: the subclass adds x* to the abscissae
      double h = evaluateAndRefine(j, x, upper, upper - (gap - raise), hullTerm);
      if (w < Math.exp(h - upper - raise)) {
        densityAcceptances++;
        return x;
      }
      rejections++;
    }
  }

  /**
   * Whether w &lt; exp(-g), mostly without the exponential: 1 - g + g^2/2 - g^3/6 &lt;= exp(-g) for
   * every g and exp(-g) &lt;= 1 - g + g^2/2 for g &gt;= 0 (Taylor's theorem with the remainder's
   * sign), so only w in the thin band between the two needs exp.
   */
  static boolean belowExp(double w, double g) {
    double linear = 1.0 - g;
    if (w < linear) {
      return true;
    }
    double quadratic = linear + 0.5 * g * g;
    if (g >= 0 && w >= quadratic) {
      return false;
    }
    if (w < quadratic - g * g * g * (1.0 / 6.0)) {
      return true;
    }
    return w < Math.exp(-g);
  }

  /**
   * Switches to the alias-table path once the hull has gone {@link #SETTLED_AFTER} plus its size
   * proposals without a rebuild, so that a sampler used for a few draws never pays for the table.
   */
  private void settle() {
    if (spare == null) {
      spare = new SettledPieces();
    }
    spare.build(pieces);
    settled = spare;
    settledColumns = spare.columnRecords;
    settledShift = spare.columnShift;
  }

  @Override
  public final void restart(double... abscissae) {
    // unusable until the new start has passed every check: the old hull (and its settled table)
    // belongs to the old density and must never serve a draw of the new one
    markStale();
    unusable = "a restart is under way";
    restartFailure = null;
    try {
      checkedStart(HullOptions.nonEmpty(abscissae));
      k = 0;
      for (double x : abscissae) {
        int i = insertionIndex(x);
        if (!isAbscissa(i, x)) {
          insertEvaluated(i, x);
        }
      }
      initialise();
    } catch (RuntimeException failure) {
      // never null, or the half-built hull would serve draws
      unusable = failure.getMessage() != null ? failure.getMessage() : failure.toString();
      restartFailure = failure;
      throw failure;
    }
    unusable = null;
  }

  /** Throws while the last restart has failed: the hull is left half built. */
  private void requireUsable() {
    if (unusable != null) {
      throw new IllegalStateException(
          "the last restart failed ("
              + unusable
              + "); restart the sampler with a valid start before drawing from it",
          restartFailure);
    }
  }

  /** Evaluates h (and h') at a starting point x and inserts it at index i of the abscissae. */
  abstract void insertEvaluated(int i, double x);

  /** Checks the starting points and searches outward until the hull can be integrated. */
  abstract void initialise();

  /**
   * Evaluates h at a proposal that failed the squeeze test, checks it against the hull, adds it
   * when there is room, and returns h(x) less the hull's reference value (-inf where h is).
   *
   * @param piece the piece of the hull that x was drawn from
   * @param upper the hull at x before the update, less the reference
   * @param squeeze the squeeze at x before the update, less the reference (-inf where there is
   *     none)
   * @param hullTerm slope times the distance from the piece's anchor, the term that made {@code
   *     upper} from the anchor's value
   */
  abstract double evaluateAndRefine(
      int piece, double x, double upper, double squeeze, double hullTerm);

  /** Rebuilds {@link #pieces} from the abscissae. */
  abstract void rebuild();

  /**
   * Notes that abscissae were added; the rebuild waits for the next proposal, so a sampler used
   * for one draw (a fresh density per Gibbs step) never rebuilds after its last evaluation.
   */
  final void markStale() {
    stale = true;
    settled = null;
    settledColumns = null;
  }

  private void refresh() {
    requireUsable();
    if (stale) {
      rebuild();
      stale = false;
      quietProposals = 0;
    }
  }

  /** The settled table the draws go through now, or null while the hull still changes. */
  final SettledPieces settledOrNull() {
    return settled;
  }

  @Override
  public final SamplerStatistics statistics() {
    return new SamplerStatistics(
        evaluations,
        proposals + innerAcceptances,
        squeezeAcceptances + innerAcceptances,
        densityAcceptances,
        rejections,
        k,
        hullRejections);
  }

  @Override
  public final double[] abscissae() {
    requireUsable();
    double[] copy = new double[k];
    System.arraycopy(xs, 0, copy, 0, k);
    return copy;
  }

  @Override
  public final HullSnapshot snapshot() {
    refresh();
    return HullSnapshot.of(xs, hs, k, pieces);
  }

  @Override
  public final Support support() {
    return support;
  }

  /** Index of the first abscissa greater than {@code x}. */
  final int insertionIndex(double x) {
    int lo = 0;
    int hi = k;
    while (lo < hi) {
      int mid = (lo + hi) >>> 1;
      if (xs[mid] > x) {
        hi = mid;
      } else {
        lo = mid + 1;
      }
    }
    return lo;
  }

  /** True when {@code x} equals an abscissa next to insertion index {@code i}. */
  final boolean isAbscissa(int i, double x) {
    return (i > 0 && xs[i - 1] == x) || (i < k && xs[i] == x);
  }

  /** Makes room for one more abscissa; subclasses grow their own arrays alongside. */
  double[] grow(double[] array) {
    if (k < array.length) {
      return array;
    }
    double[] bigger = new double[Math.max(2 * array.length, INITIAL_CAPACITY)];
    System.arraycopy(array, 0, bigger, 0, k);
    return bigger;
  }

  /** Shifts {@code array[i..k)} one place up and stores {@code value} at i (k not yet counted). */
  static void insertAt(double[] array, int k, int i, double value) {
    System.arraycopy(array, i, array, i + 1, k - i);
    array[i] = value;
  }

  /**
   * The excess tolerated when log-density values are compared: the tolerance relative to the
   * differences compared, {@code tolerance * max(1, differences)}, plus the rounding of the values
   * themselves, {@value #ROUNDING_ULPS} ulps of the largest of them. Both are unchanged by a
   * constant added to h, up to the rounding that constant causes in h.
   *
   * @param differences the largest difference between the values (or terms) compared
   * @param magnitude the largest |h| among the values compared, as h returned them
   */
  final double allowance(double differences, double magnitude) {
    return tolerance * Math.max(1.0, differences) + ROUNDING_ULPS * Math.ulp(magnitude);
  }

  /**
   * Throws {@link ImpreciseDensityException} when the values compared are rounded more coarsely
   * than the tolerance for their differences, so that an excess within the tolerance could not be
   * told from rounding. Called after the log-concavity test, which an excess beyond rounding fails
   * first whatever the rounding.
   */
  final void requirePrecision(double x, double h, double differences, double magnitude) {
    double rounding = ROUNDING_ULPS * Math.ulp(magnitude);
    double strict = tolerance * Math.max(1.0, differences);
    if (rounding > strict) {
      throw new ImpreciseDensityException(
          "h(x) = "
              + h
              + " near x = "
              + x
              + " is rounded to "
              + rounding
              + " ("
              + ROUNDING_ULPS
              + " ulps of "
              + magnitude
              + "), coarser than the log-concavity tolerance "
              + strict
              + " for values that differ by "
              + differences
              + ": a constant of that size added to h swamps the density's variation; subtract"
              + " it (a log-density needs no constant) or raise logConcavityTolerance above "
              + rounding / Math.max(1.0, differences),
          x);
    }
  }

  /**
   * Throws when h(x) lies above the hull or below the squeeze beyond the tolerance; returns h(x)
   * less the reference.
   *
   * @param h h(x) as the density returned it
   * @param upper the hull at x, less the reference
   * @param squeeze the squeeze at x, less the reference (-inf where there is none)
   * @param hullTerm the term that made {@code upper} from its anchor's value
   */
  final double checkAgainstEnvelope(
      double x, double h, double upper, double squeeze, double hullTerm) {
    double reference = pieces.reference;
    double relative = h - reference;
    double anchorValue = upper - hullTerm;
    double differences = Math.max(Math.abs(relative - anchorValue), Math.abs(hullTerm));
    if (squeeze > Double.NEGATIVE_INFINITY) {
      differences = Math.max(differences, upper - squeeze);
    }
    double magnitude = Math.max(Math.abs(h), Math.abs(reference + anchorValue));
    double allowed = allowance(differences, magnitude);
    if (relative > upper + allowed) {
      throw new NotLogConcaveException(
          "h is not log-concave: at x = "
              + x
              + ", h(x) = "
              + h
              + " lies above the upper hull value "
              + (reference + upper)
              + " (tolerance "
              + allowed
              + ")",
          x);
    }
    if (relative < squeeze - allowed) {
      throw new NotLogConcaveException(
          "h is not log-concave: at x = "
              + x
              + ", h(x) = "
              + h
              + " lies below the chord (squeeze) value "
              + (reference + squeeze)
              + " (tolerance "
              + allowed
              + ")",
          x);
    }
    requirePrecision(x, h, differences, magnitude);
    return relative;
  }

  /** Throws for NaN or +inf; -inf is allowed where {@code allowMinusInfinity}. */
  static void checkValue(double x, double h, boolean allowMinusInfinity) {
    if (Double.isNaN(h) || h == Double.POSITIVE_INFINITY) {
      throw new InvalidDensityException(
          "h(x) = " + h + " at x = " + x + ": expected a finite log density (or -inf)", x, h);
    }
    if (h == Double.NEGATIVE_INFINITY && !allowMinusInfinity) {
      throw new InvalidDensityException(
          "h(x) = -inf at starting abscissa x = "
              + x
              + ": starting abscissae must lie where the density is positive; is the support right?",
          x,
          h);
    }
  }

  /** Checks caller-given starting abscissae lie strictly inside the support. */
  final double[] checkedStart(double[] start) {
    for (double x : start) {
      if (!support.containsInInterior(x)) {
        throw new IllegalArgumentException(
            "starting abscissa " + x + " must lie strictly inside the support " + support);
      }
    }
    return start;
  }

  /**
   * Automatic starting abscissae: guess - spread and guess + spread (and the guess itself when
   * {@code withCentre}), the guess moved into the support, points past a bound moved a fraction of
   * the way in from it.
   */
  final double[] automaticStart(double guess, double spread, boolean withCentre) {
    double lower = support.lower();
    double upper = support.upper();
    double centre = guess;
    if (!support.containsInInterior(centre)) {
      double room =
          support.isBoundedBelow() && support.isBoundedAbove()
              ? Math.min(spread, 0.5 * (upper - lower))
              : spread;
      centre = guess <= lower ? lower + room : upper - room;
    }
    double left = centre - spread;
    if (left <= lower) {
      left = lower + INSIDE_BOUND * (centre - lower);
    }
    double right = centre + spread;
    if (right >= upper) {
      right = upper - INSIDE_BOUND * (upper - centre);
    }
    double[] start = withCentre ? new double[] {left, centre, right} : new double[] {left, right};
    for (int i = 0; i < start.length; i++) {
      if (!support.containsInInterior(start[i]) || (i > 0 && !(start[i] > start[i - 1]))) {
        throw new IllegalArgumentException(
            "cannot place distinct starting abscissae inside the support "
                + support
                + " from guess "
                + guess
                + " and spread "
                + spread
                + "; give a spread on the scale of the support");
      }
    }
    return start;
  }

  /** The first outward step for a search from the given starting abscissae. */
  final double initialStep(double spread) {
    double range = k > 1 ? xs[k - 1] - xs[0] : 0.0;
    return range > 0 ? range : spread;
  }

  /** Thrown when an unbounded side needs more outward steps than allowed. */
  final NonIntegrableHullException noFallingSlope(boolean lowerSide, double x, double slope) {
    return new NonIntegrableHullException(
        "the hull is not integrable: on the unbounded "
            + (lowerSide ? "lower" : "upper")
            + " side the slope is still "
            + slope
            + " at x = "
            + x
            + " after "
            + maximumSearchSteps
            + " doubling steps outward (expected "
            + (lowerSide ? "> 0" : "< 0")
            + "); is the density proper on "
            + support
            + "?",
        x);
  }
}

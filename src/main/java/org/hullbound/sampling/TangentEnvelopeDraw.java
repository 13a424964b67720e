package org.hullbound.sampling;

import java.util.random.RandomGenerator;
import org.hullbound.hull.DifferentiableLogDensity;
import org.hullbound.hull.Evaluation;

/**
 * Adaptive rejection sampling (Gilks and Wild 1992, J. Roy. Statist. Soc. C 41, 337-348) over
 * the envelope of a few tangents, rebuilt from scratch for each proposal: the cheap path of a
 * Gibbs draw, whose density is new at every draw and is usually accepted after two or three
 * evaluations, so that the general hull's sorted pieces, log-space bookkeeping and alias tables
 * (built for many draws from one density) would cost more than the draw itself.
 *
 * <p>Steps as in the paper (section 2.2): the envelope {@code u_k} is the minimum of the tangents
 * at the abscissae, whose neighbours meet at {@code z_j}; the squeeze {@code l_k} the chords
 * between neighbouring abscissae. Sampling step: a piece by its mass, a point of it by inversion
 * (one uniform each), {@code w} uniform. Squeezing test: accept when {@code w <= exp(l_k(x) -
 * u_k(x))}, without evaluating h. Rejection test: evaluate h (and h') at x, accept when {@code w
 * <= exp(h(x) - u_k(x))}. Updating step: a rejected x joins the abscissae.
 *
 * <p>Nothing is drawn from a doubtful envelope: every round first checks that the abscissae
 * bracket the mode on each unbounded side and that the tangents are those of a concave function
 * (slopes fall strictly, each pair of neighbouring tangents meets between them), and every
 * evaluated proposal that it lies between the squeeze and the envelope. Where any of these
 * fails, even by rounding, or the envelope is full, the draw returns NaN and the caller hands the
 * abscissae ({@link #abscissae()}) to the general sampler ({@code hull.AdaptiveRejectionSampler}),
 * which checks them with its tolerances: it either refuses the density (not log-concave) or goes
 * on drawing. An evaluated proposal that failed a check is among those abscissae, and whether it
 * would have been accepted ({@link #pendingAccepted()}, decided by the same {@code w} as the
 * general sampler would) is kept, so that after a successful hand-over the caller accepts it or
 * draws afresh exactly as adaptive rejection would have. Either way the point returned follows
 * the density exactly.
 *
 * <p>Random draws per proposal: three uniforms (piece, position, {@code w}). One instance per
 * chain; it keeps its arrays between draws.
 */
public final class TangentEnvelopeDraw {
  /** The most abscissae kept before handing over to the general sampler. */
  public static final int CAPACITY = 12;

  /** Proposals tried before handing over (each rejected one needing an evaluation). */
  private static final int MAXIMUM_PROPOSALS = 16;

  private final double[] xs = new double[CAPACITY];
  private final double[] hs = new double[CAPACITY];
  private final double[] ss = new double[CAPACITY];
  /**
   * Piece j spans [ends[j], ends[j + 1]]; ends[0] and ends[k] are the support's ends. Package
   * private, with {@link #build} and {@link #tangent}, so that the property test in this package
   * reads the pieces drawn from (TangentEnvelopeProperties), not a copy of their arithmetic.
   */
  final double[] ends = new double[CAPACITY + 1];
  private final double[] cumulative = new double[CAPACITY];
  private int k;
  private double pendingPoint = Double.NaN;
  private boolean pendingAccepted;

  private TangentEnvelopeDraw() {}

  /** An empty envelope. */
  public static TangentEnvelopeDraw create() {
    return new TangentEnvelopeDraw();
  }

  /** Forgets every abscissa and any pending proposal: the start of a new draw. */
  public void clear() {
    k = 0;
    pendingPoint = Double.NaN;
    pendingAccepted = false;
  }

  /**
   * Adds an evaluated abscissa of the current density (kept in ascending order, a repeated one
   * ignored); returns false when the envelope is full.
   */
  public boolean add(double x, double h, double slope) {
    int i = 0;
    while (i < k && xs[i] < x) {
      i++;
    }
    if (i < k && xs[i] == x) {
      return true;
    }
    if (k == CAPACITY) {
      return false;
    }
    System.arraycopy(xs, i, xs, i + 1, k - i);
    System.arraycopy(hs, i, hs, i + 1, k - i);
    System.arraycopy(ss, i, ss, i + 1, k - i);
    xs[i] = x;
    hs[i] = h;
    ss[i] = slope;
    k++;
    return true;
  }

  /**
   * One exact draw from {@code density} on {@code (lower, upper)}, starting from the abscissae
   * added; NaN when the general sampler must take over from {@link #abscissae()} (see the class
   * comment). Every evaluation goes through {@code density}.
   */
  public double draw(DifferentiableLogDensity density, double lower, double upper,
      RandomGenerator rng) {
    for (int proposal = 0; proposal < MAXIMUM_PROPOSALS; proposal++) {
      double total = build(lower, upper);
      if (!(total > 0) || total == Double.POSITIVE_INFINITY) {
        return Double.NaN;
      }
      // sampling step: a piece by its mass, a point of it by inversion, w uniform
      double r = rng.nextDouble() * total;
      int j = 0;
      while (j < k - 1 && r >= cumulative[j]) {
        j++;
      }
      double x = position(j, rng.nextDouble());
      double w = rng.nextDouble();
      double upperValue = hs[j] + ss[j] * (x - xs[j]);
      double squeeze = squeeze(x);
      // squeezing test
      if (w < Math.exp(squeeze - upperValue)) {
        return x;
      }
      // rejection test
      Evaluation e = density.evaluate(x);
      double h = e.value();
      if (h == Double.NEGATIVE_INFINITY) {
        continue; // where the density is zero: rejected, no tangent to add
      }
      boolean accepted = w < Math.exp(h - upperValue);
      if (!(h <= upperValue) || h < squeeze || !Double.isFinite(e.slope())) {
        // above a tangent or below a chord (or no slope): the general sampler judges it
        add(x, h, e.slope());
        pendingPoint = x;
        pendingAccepted = accepted;
        return Double.NaN;
      }
      if (accepted) {
        return x;
      }
      // updating step
      if (!add(x, h, e.slope())) {
        return Double.NaN;
      }
    }
    return Double.NaN;
  }

  /**
   * The pieces' cumulative masses relative to the envelope's highest point, or NaN where the
   * abscissae do not make a valid envelope: fewer than two on an unbounded support, no rising
   * slope at the left end (no falling one at the right) of an unbounded side, slopes that do not
   * fall strictly, neighbouring tangents that do not meet between their abscissae.
   */
  double build(double lower, double upper) {
    if (k < 2 || (lower == Double.NEGATIVE_INFINITY && !(ss[0] > 0))
        || (upper == Double.POSITIVE_INFINITY && !(ss[k - 1] < 0))) {
      return Double.NaN;
    }
    ends[0] = lower;
    ends[k] = upper;
    for (int i = 0; i + 1 < k; i++) {
      double run = xs[i + 1] - xs[i];
      double fall = ss[i] - ss[i + 1];
      if (!(fall > 0) || !Double.isFinite(hs[i]) || !Double.isFinite(ss[i])) {
        return Double.NaN;
      }
      // tangents i and i + 1 meet where h_i + s_i (z - x_i) = h_{i+1} + s_{i+1} (z - x_{i+1})
      double z = xs[i] + (hs[i + 1] - hs[i] - ss[i + 1] * run) / fall;
      if (!(z >= xs[i] && z <= xs[i + 1])) {
        return Double.NaN;
      }
      ends[i + 1] = z;
    }
    if (!Double.isFinite(hs[k - 1]) || !Double.isFinite(ss[k - 1])) {
      return Double.NaN;
    }
    // the envelope is concave: its highest point is at a kink or at a finite end
    double top = Double.NEGATIVE_INFINITY;
    for (int j = 0; j < k; j++) {
      if (ends[j] > Double.NEGATIVE_INFINITY) {
        top = Math.max(top, tangent(j, ends[j]));
      }
      if (ends[j + 1] < Double.POSITIVE_INFINITY) {
        top = Math.max(top, tangent(j, ends[j + 1]));
      }
    }
    if (!Double.isFinite(top)) {
      return Double.NaN;
    }
    double sum = 0;
    for (int j = 0; j < k; j++) {
      sum += mass(j, top);
      cumulative[j] = sum;
    }
    return sum;
  }

  double tangent(int j, double x) {
    return hs[j] + ss[j] * (x - xs[j]);
  }

  /**
   * The integral of exp(tangent j - top) over piece j: an exponential tail where an end is
   * infinite, else written with expm1 from the piece's higher end so that nothing overflows.
   */
  private double mass(int j, double top) {
    double a = ends[j];
    double b = ends[j + 1];
    double s = ss[j];
    if (a == Double.NEGATIVE_INFINITY) {
      return Math.exp(tangent(j, b) - top) / s;
    }
    if (b == Double.POSITIVE_INFINITY) {
      return Math.exp(tangent(j, a) - top) / -s;
    }
    double width = b - a;
    if (s > 0) {
      return Math.exp(tangent(j, b) - top) * -Math.expm1(-s * width) / s;
    }
    if (s < 0) {
      return Math.exp(tangent(j, a) - top) * -Math.expm1(s * width) / -s;
    }
    return Math.exp(hs[j] - top) * width;
  }

  /** The point of piece j at which the envelope's mass from its higher end is the share v. */
  private double position(int j, double v) {
    double a = ends[j];
    double b = ends[j + 1];
    double s = ss[j];
    if (a == Double.NEGATIVE_INFINITY) {
      return b + Math.log1p(-v) / s;
    }
    if (b == Double.POSITIVE_INFINITY) {
      return a + Math.log1p(-v) / s;
    }
    double width = b - a;
    double x;
    if (s > 0) {
      x = b + Math.log1p(v * Math.expm1(-s * width)) / s;
    } else if (s < 0) {
      x = a + Math.log1p(v * Math.expm1(s * width)) / s;
    } else {
      x = a + v * width;
    }
    // rounding may step a hair outside the piece; the tangent used must be this piece's
    return Math.min(Math.max(x, a), b);
  }

  /** The chord between the abscissae around x, or -inf outside them. */
  double squeeze(double x) {
    if (!(x >= xs[0] && x <= xs[k - 1])) {
      return Double.NEGATIVE_INFINITY;
    }
    int i = 0;
    while (i + 2 < k && x > xs[i + 1]) {
      i++;
    }
    double run = xs[i + 1] - xs[i];
    return hs[i] + (hs[i + 1] - hs[i]) * ((x - xs[i]) / run);
  }

  /** The abscissae now held, ascending: where the general sampler starts after a hand-over. */
  public double[] abscissae() {
    return java.util.Arrays.copyOf(xs, k);
  }

  /**
   * The evaluated proposal that failed a check at the hand-over (it is among {@link
   * #abscissae()}), or NaN when there is none.
   */
  public double pendingPoint() {
    return pendingPoint;
  }

  /** Whether {@link #pendingPoint()} passed its rejection test ({@code w <= exp(h - u_k)}). */
  public boolean pendingAccepted() {
    return pendingAccepted;
  }
}

package org.hullbound.model;

import java.util.List;
import java.util.function.Supplier;
import org.hullbound.model.family.Scale;

/**
 * The density of the position {@code t} along one line through the state, compiled once from the
 * terms the line moves: what a move along a direction (a translation {@code x + t w}) or a
 * rescaling ({@code c x} for {@code c = t > 0}) of several unknowns at once draws from.
 *
 * <p>Generalised Gibbs (Liu and Sabatti 2000, J. Amer. Statist. Assoc. 95, 585-598): for a group
 * of transformations {@code g} acting on the state, drawing {@code g} from {@code p(g(x)) |J_g(x)|
 * H(dg)}, with {@code H} the group's left Haar measure and {@code J_g} the Jacobian of {@code x ->
 * g(x)}, and moving to {@code g(x)} leaves {@code p} invariant. For translations along a fixed
 * {@code w} the Jacobian is 1 and {@code H(dt) = dt}, so {@code t} has density {@code p(x + t w)}.
 * For the multiplicative group acting on {@code d} coordinates the Jacobian is {@code c^d} and
 * {@code H(dc) = dc / c}, so {@code c} has density {@code c^(d - 1) p(c x)} on {@code c > 0}
 * (their scale example): {@link #logDensity} adds {@code (d - 1) log c}, less one {@code log c}
 * for each prior left out because it is {@code -log c} plus a constant along the line.
 *
 * <p>The frame an evaluation reads is the state (natural values) in entries {@code 0 .. n - 1},
 * entry {@code n} unused (the position is the argument), and for a direction learned at run time
 * its weights in entries {@code n + 1 ..} ({@link #direct}). Terms left unchanged by every point
 * of the line (the linear predictors a shift leaves alone) are not compiled at all. Immutable;
 * chains share it, each with its own frame.
 *
 * <p>Compiled on the first evaluation, from the moved terms made again then: a line through
 * millions of rows compiles to hundreds of bytes a row, which {@code check} (which only states
 * the move and its proof) should not hold. The terms made again are the same as those the move
 * was proved on (made by the same deterministic substitution), so a fit draws the same.
 */
public final class LineDensity {
  /** How the line moves its members. */
  enum Geometry {
    /** {@code x_j + t w_j}, {@code w} fixed when the move was found. */
    FIXED_TRANSLATION,
    /** {@code x_j + t w_j}, {@code w} read from the frame (learned during burn-in). */
    LEARNED_TRANSLATION,
    /** {@code c x_j} for {@code c = t > 0}. */
    RESCALING,
    /**
     * For members {@code (s, e[1..K])} and a location {@code m} that stays: {@code c s}, {@code m
     * + c (e - m)}, {@code c = t > 0}; {@code m} read from the state ({@link #aboutLocation}).
     */
    RESCALING_ABOUT_LOCATION
  }

  private final int dimension;
  private final int[] members;
  private final double[] weights;
  private final Geometry geometry;
  private final double jacobianPower;
  private final boolean smooth;
  private final int termCount;
  /** The state entry of the location a rescaling turns about, or -1. */
  private final int pivot;
  /** Makes the moved terms again, for the compilation; dropped once compiled. */
  private Supplier<List<Term>> movedTerms;
  private volatile CompiledConditional compiled;

  /**
   * @param termCount how many terms {@code movedTerms} makes
   * @param movedTerms makes the terms the line moves, the same list on every call; called when
   *     the line is first evaluated
   */
  LineDensity(int dimension, int[] members, double[] weights, Geometry geometry,
      int termCount, Supplier<List<Term>> movedTerms, boolean smooth) {
    this(dimension, members, weights, geometry, -1, termCount, movedTerms, smooth,
        fullPower(geometry, members.length));
  }

  /**
   * A rescaling ({@link Geometry#RESCALING}, or {@link Geometry#RESCALING_ABOUT_LOCATION} about
   * the location in state entry {@code pivot}, which the line leaves where it is: {@code (c s, m
   * + c (e - m))}; for a fixed {@code m} a
   * one-parameter group, two steps composing to {@code c1 c2}, whose Jacobian is {@code c^(K +
   * 1)}, as for a rescaling about 0), whose {@code movedTerms} leave out {@code cancelled}
   * priors that are {@code -log c} plus a constant along the line: as many powers of {@code c}
   * of the Jacobian and Haar factor go with them (Liu and Sabatti 2000).
   */
  static LineDensity rescaling(int dimension, int[] members, Geometry geometry, int pivot,
      int cancelled, int termCount, Supplier<List<Term>> movedTerms, boolean smooth) {
    double power = fullPower(geometry, members.length);
    if (geometry == Geometry.FIXED_TRANSLATION || geometry == Geometry.LEARNED_TRANSLATION
        || cancelled < 0 || cancelled > power
        || (geometry == Geometry.RESCALING_ABOUT_LOCATION) != (pivot >= 0)) {
      throw new IllegalArgumentException("a rescaling cancels at most its Jacobian's " + power
          + " powers of c, and turns about a location exactly when its geometry says so; got "
          + geometry + ", " + cancelled + ", " + pivot);
    }
    return new LineDensity(dimension, members, null, geometry, pivot, termCount, movedTerms,
        smooth, power - cancelled);
  }

  /** The power of {@code c} of the Jacobian and Haar factor of {@code size} moved unknowns. */
  private static double fullPower(Geometry geometry, int size) {
    return switch (geometry) {
      case RESCALING, RESCALING_ABOUT_LOCATION -> size - 1;
      default -> 0;
    };
  }

  private LineDensity(int dimension, int[] members, double[] weights, Geometry geometry,
      int pivot, int termCount, Supplier<List<Term>> movedTerms, boolean smooth,
      double jacobianPower) {
    this.pivot = pivot;
    this.dimension = dimension;
    this.members = members.clone();
    this.weights = weights == null ? null : weights.clone();
    this.geometry = geometry;
    this.jacobianPower = jacobianPower;
    this.smooth = smooth;
    this.termCount = termCount;
    this.movedTerms = movedTerms;
  }

  /** The compiled density of the position, compiled by the first caller. */
  private CompiledConditional compiled() {
    CompiledConditional c = compiled;
    if (c == null) {
      synchronized (this) {
        c = compiled;
        if (c == null) {
          List<Term> moved = movedTerms.get();
          boolean rescaling = geometry != Geometry.FIXED_TRANSLATION
              && geometry != Geometry.LEARNED_TRANSLATION;
          Unknown position = new Unknown(dimension, "line position", "line position",
              Scale.NATURAL, rescaling ? 0 : Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY,
              false, false);
          c = new CompiledConditional(
              position, moved,
              Formula.constant(rescaling ? 0 : Double.NEGATIVE_INFINITY),
              Formula.constant(Double.POSITIVE_INFINITY),
              ArgumentBounds.of(dimension, moved.get(0), List.of(), Double.NaN, Double.NaN),
              smooth);
          compiled = c;
          movedTerms = null;
        }
      }
    }
    return c;
  }

  /** The state entries the line moves. */
  public int[] members() {
    return members.clone();
  }

  /** True for a rescaling (position {@code c > 0}), false for a translation ({@code x + t w}). */
  public boolean rescales() {
    return geometry == Geometry.RESCALING || geometry == Geometry.RESCALING_ABOUT_LOCATION;
  }

  /**
   * The power of {@code c} that the Jacobian and Haar measure add (0 for a translation), less the
   * {@code -log c} of the priors a rescaling leaves out of its terms ({@link #rescaling}).
   */
  public double jacobianPower() {
    return jacobianPower;
  }

  /** True when the direction is set at run time through {@link #direct}. */
  public boolean learned() {
    return geometry == Geometry.LEARNED_TRANSLATION;
  }

  /** The frame entry a draw of the position may use as its own (entry {@code n}). */
  public int position() {
    return dimension;
  }

  /** The length of the frame that {@link #logDensity} reads. */
  public int frameLength() {
    return dimension + 1 + (geometry == Geometry.LEARNED_TRANSLATION ? members.length : 0);
  }

  /** Copies the state (natural values) into {@code frame}: the base point {@code t} starts from. */
  public void load(double[] state, double[] frame) {
    System.arraycopy(state, 0, frame, 0, dimension);
  }

  /** Writes a learned direction's weights, one per member, into {@code frame}. */
  public void direct(double[] direction, double[] frame) {
    if (!learned() || direction.length != members.length) {
      throw new IllegalArgumentException(
          "direction must give one weight per member of a learned line, got " + direction.length);
    }
    System.arraycopy(direction, 0, frame, dimension + 1, members.length);
  }

  /** The position of the base point itself: 0 for a translation, 1 for a rescaling. */
  public double identity() {
    return rescales() ? 1 : 0;
  }

  /** The lower end of the positions: 0 for a rescaling, {@code -inf} for a translation. */
  public double lower() {
    return rescales() ? 0 : Double.NEGATIVE_INFINITY;
  }

  /**
   * The log-density of position {@code t} from the base point in {@code frame}, up to a constant,
   * with the Jacobian and Haar factor of a rescaling; {@code slope[0]} receives d/dt when {@code
   * slope} is not null.
   */
  public double logDensity(double t, double[] frame, double[] slope) {
    double value = compiled().logDensity(t, frame, slope);
    if (jacobianPower == 0 || value == Double.NEGATIVE_INFINITY) {
      return value;
    }
    if (slope != null) {
      slope[0] += jacobianPower / t;
    }
    return value + jacobianPower * Math.log(t);
  }

  /** Moves {@code state} to position {@code t} of the line through it ({@code frame} as loaded). */
  public void apply(double t, double[] state, double[] frame) {
    for (int k = 0; k < members.length; k++) {
      int j = members[k];
      switch (geometry) {
        case RESCALING -> state[j] = frame[j] * t;
        case RESCALING_ABOUT_LOCATION ->
            state[j] = k == 0 ? frame[j] * t : frame[pivot] + t * (frame[j] - frame[pivot]);
        case FIXED_TRANSLATION -> state[j] = frame[j] + t * weights[k];
        default -> state[j] = frame[j] + t * frame[dimension + 1 + k];
      }
    }
  }

  /** False when a moved term is not differentiable along the line. */
  public boolean smooth() {
    return smooth;
  }

  /** How many terms an evaluation sums (those the line changes). */
  public int termCount() {
    return termCount;
  }

  /**
   * The evaluations of terms or groups of one linear predictor one call makes ({@link
   * CompiledConditional#evaluationsPerCall}); compiles the line if it was not yet.
   */
  int evaluationsPerCall() {
    return compiled().evaluationsPerCall();
  }
}

package org.hullbound.gibbs;

/**
 * The density of the position along a line through the state, as a move draws it: the Gibbs
 * driver's narrow view of a model's line density ({@code org.hullbound.model.LineDensity}), so
 * that moves serve compiled models and hand-written targets in tests alike.
 *
 * <p>An evaluation reads a frame: the base point (natural values of every unknown) in entries
 * {@code 0 .. position() - 1}, entry {@link #position()} for the position itself, and for a
 * learned direction its weights after that ({@link #direct}).
 */
public interface LineTarget {

  /** The state entries the line moves. */
  int[] members();

  /** The frame entry of the position. */
  int position();

  /** The length of a frame. */
  int frameLength();

  /** True when the direction is set at run time ({@link #direct}), as learned in burn-in. */
  boolean learned();

  /** Copies the state into the frame's base point. */
  void load(double[] state, double[] frame);

  /** Writes a direction, one weight per member, into the frame (learned lines only). */
  void direct(double[] direction, double[] frame);

  /** The position of the base point itself (0 for a translation, 1 for a rescaling). */
  double identity();

  /** The lowest position ({@code -inf} for a translation, 0 for a rescaling). */
  double lower();

  /**
   * The log-density of position {@code t}, up to a constant, Jacobian included; {@code slope[0]}
   * receives d/dt when {@code slope} is not null; {@code -inf} where the density is zero.
   */
  double logDensity(double t, double[] frame, double[] slope);

  /** Moves {@code state} to position {@code t} of the line through the frame's base point. */
  void apply(double t, double[] state, double[] frame);

  /** Whether the derivative is available and continuous along the line. */
  boolean smooth();
}

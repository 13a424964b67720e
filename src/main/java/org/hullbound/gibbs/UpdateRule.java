package org.hullbound.gibbs;

import java.util.random.RandomGenerator;
import java.util.function.Function;

/**
 * How one unknown (or one block of unknowns) is updated in a sweep, as the model's analysis chose:
 * a closed set of kinds from exact to approximate.
 *
 * <p>A rule is shared by all chains; {@link GibbsSampler} turns it into one {@link Updater} per
 * chain, which holds the chain's warm-start state and counters. Code that treats each kind its
 * own way goes through {@link #accept(Visitor)}, so that a new kind cannot compile until every
 * such place handles it.
 */
public sealed interface UpdateRule {

  /** The state entries this rule updates. */
  int[] indices();

  /** Calls the method of {@code visitor} for this kind of rule and returns its result. */
  <R> R accept(Visitor<R> visitor);

  /**
   * True for an extra update that moves entries other rules already draw ({@link Move}): it does
   * not count towards each entry's one rule.
   */
  default boolean extra() {
    return false;
  }

  /** One method per kind of rule; see {@link #accept(Visitor)}. */
  interface Visitor<R> {
    R conjugate(Conjugate rule);

    R blockNormal(BlockNormal rule);

    R adaptiveRejection(AdaptiveRejection rule);

    R fallback(Fallback rule);

    R move(Move rule);

    R discrete(Discrete rule);
  }

  /** An exact draw from a conjugate full conditional; uses no density evaluation. */
  record Conjugate(int index, String family, ConjugateDraw draw) implements UpdateRule {
    @Override
    public int[] indices() {
      return new int[] {index};
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.conjugate(this);
    }
  }

  /** A block of coefficients with a multivariate normal full conditional in canonical form. */
  record BlockNormal(int[] block, Function<double[], CanonicalNormal> posterior)
      implements UpdateRule {
    public BlockNormal {
      block = block.clone();
    }

    @Override
    public int[] indices() {
      return block.clone();
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.blockNormal(this);
    }
  }

  /** Adaptive rejection on a conditional known to be log-concave (Gilks and Wild 1992). */
  record AdaptiveRejection(int index, ScalarConditional conditional, String reason)
      implements UpdateRule {
    @Override
    public int[] indices() {
      return new int[] {index};
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.adaptiveRejection(this);
    }
  }

  /**
   * Adaptive rejection Metropolis (Gilks, Best and Tan 1995) where log-concavity is not
   * established.
   */
  record Fallback(int index, ScalarConditional conditional, String reason) implements UpdateRule {
    @Override
    public int[] indices() {
      return new int[] {index};
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.fallback(this);
    }
  }

  /**
   * An extra update after the one-at-a-time ones: a draw of the position along the line of {@code
   * line} (a generalised Gibbs move, Liu and Sabatti 2000; or, for a learned line, one draw along
   * each direction fixed after burn-in), by adaptive rejection where {@code logConcave}, else by
   * the fallback. Each draw leaves the joint posterior invariant, so adding it to the sweep does
   * too.
   *
   * @param name the move in a few words, such as {@code shift move}
   */
  record Move(String name, LineTarget line, boolean logConcave, String reason)
      implements UpdateRule {
    @Override
    public int[] indices() {
      return line.members();
    }

    @Override
    public boolean extra() {
      return true;
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.move(this);
    }
  }

  /**
   * An exact draw of a whole-valued unknown: enumeration of its conditional log mass over a finite
   * support, or the integer hull ({@code hull.DiscreteAdaptiveRejection}) when {@code logConcave}
   * and the support is unbounded or too large to enumerate.
   */
  record Discrete(
      int index, ScalarConditional conditional, String reason, boolean finite, boolean logConcave)
      implements UpdateRule {
    @Override
    public int[] indices() {
      return new int[] {index};
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.discrete(this);
    }
  }

  /** Draws one unknown exactly from its conjugate full conditional given the state. */
  @FunctionalInterface
  interface ConjugateDraw {
    /** A draw on the sampling scale. */
    double draw(double[] state, RandomGenerator rng);
  }
}

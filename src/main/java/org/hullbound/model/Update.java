package org.hullbound.model;

/**
 * How the Gibbs driver should update one unknown, with the reason, as derived by the analysis of
 * its full conditional.
 *
 * <p>A closed set of kinds: an exact draw from a conjugate posterior, adaptive rejection sampling
 * (Gilks and Wild 1992) when the conditional is provably log-concave on the unknown's sampling
 * scale, or a fallback sampler when the rules cannot prove it. {@code hullbound check} prints it.
 *
 * <p>Code that treats each kind its own way goes through {@link #accept(Visitor)}: a new kind
 * adds a method to {@link Visitor}, so it cannot compile until every such place handles it (Java
 * 17 has no pattern-matching switch over a sealed interface without preview features).
 */
public sealed interface Update {

  /** One line a user can read: why this update was chosen. */
  String reason();

  /** Calls the method of {@code visitor} for this kind of update and returns its result. */
  <R> R accept(Visitor<R> visitor);

  /** One method per kind of update; see {@link #accept(Visitor)}. */
  interface Visitor<R> {
    R conjugate(Conjugate update);

    R adaptiveRejection(AdaptiveRejection update);

    R fallback(Fallback update);

    R linearNormalBlock(LinearNormalBlock update);

    R groupMove(GroupMove update);

    R directionBlock(DirectionBlock update);

    R discrete(Discrete update);
  }

  /** An exact draw: {@link #posterior(double[])} gives the conditional's family and arguments. */
  record Conjugate(ConjugateKind kind, String reason, PosteriorRule rule) implements Update {
    /** The exact full conditional at {@code state} (natural-scale values of all unknowns). */
    public Posterior posterior(double[] state) {
      return rule.posterior(state);
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.conjugate(this);
    }
  }

  /**
   * Adaptive rejection sampling on the sampling scale; {@code smooth} is false when a term is not
   * differentiable (laplace, abs, min, max), so the derivative-free hull must be used.
   */
  record AdaptiveRejection(String reason, boolean smooth) implements Update {
    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.adaptiveRejection(this);
    }
  }

  /** Not provably log-concave (or discrete): a fallback sampler; {@code reason} says why. */
  record Fallback(String reason, boolean smooth) implements Update {
    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.fallback(this);
    }
  }

  /**
   * An exact draw of a whole-valued unknown: by enumeration of its conditional's log mass over a
   * finite support, or, when {@code logConcave} (its differences are proved non-increasing), by
   * the integer hull ({@code hull.DiscreteAdaptiveRejection}) on an unbounded support or one too
   * large to enumerate; {@code finite} says whether the support is finite at every state.
   */
  record Discrete(String reason, boolean finite, boolean logConcave) implements Update {
    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.discrete(this);
    }
  }

  /**
   * An exact joint draw of several unknowns (the {@code members}, in state order) whose joint
   * full conditional is multivariate normal: every term that reads a member is normal with its
   * value minus its mean affine in the members jointly and its spread free of them. {@link
   * #canonical(double[])} gives the precision matrix Q and linear term b of N(Q^-1 b, Q^-1).
   */
  record LinearNormalBlock(int[] members, String reason, CanonicalRule rule) implements Update {
    public LinearNormalBlock {
      members = members.clone();
    }

    @Override
    public int[] members() {
      return members.clone();
    }

    /** How many unknowns the block draws jointly. */
    public int size() {
      return members.length;
    }

    /** The joint full conditional at {@code state} (natural-scale values of all unknowns). */
    public Canonical canonical(double[] state) {
      return rule.canonical(state);
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.linearNormalBlock(this);
    }
  }

  /**
   * An extra update after the one-at-a-time ones (from {@link BoundModel#moves()}): a generalised
   * Gibbs move (Liu and Sabatti 2000) of several unknowns at once along the line of {@code line},
   * a shift ({@code intercept + d}, every effect {@code - d}) or a rescaling of a hierarchical
   * scale with its effects ({@code c} times each). {@code logConcave} says whether the line's
   * density was proved log-concave (then drawn by adaptive rejection, else by the fallback);
   * {@code reason} gives the pattern and the proof.
   */
  record GroupMove(MoveKind kind, String reason, boolean logConcave, LineDensity line)
      implements Update {
    /** The unknowns the move changes, in state order of the pattern (the lead unknown first). */
    public int[] members() {
      return line.members();
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.groupMove(this);
    }
  }

  /**
   * An extra update after the one-at-a-time ones: a block of coefficients that enter the same
   * linear predictors, drawn along fixed directions learned during burn-in (the eigenvectors of
   * the block's burn-in covariance), one exact line draw per direction: a hit-and-run kernel with
   * a fixed set of directions (Belisle, Romeijn and Smith 1993). {@code line} reads the direction
   * from its frame.
   */
  record DirectionBlock(String reason, boolean logConcave, LineDensity line) implements Update {
    /** The block's unknowns. */
    public int[] members() {
      return line.members();
    }

    @Override
    public <R> R accept(Visitor<R> visitor) {
      return visitor.directionBlock(this);
    }
  }

  /** The group moves recognised (Liu and Sabatti 2000). */
  enum MoveKind {
    /** An intercept-like unknown up by d, the group effects that offset it down by d. */
    SHIFT("shift"),
    /**
     * A hierarchical scale multiplied by c > 0, and its effects about their prior mean (0, or an
     * unknown that stays).
     */
    RESCALE("rescale");

    private final String word;

    MoveKind(String word) {
      this.word = word;
    }

    /** The move's name in a few words, as check and the summary show it. */
    public String word() {
      return word;
    }
  }

  /**
   * A multivariate normal in canonical form: precision matrix Q (symmetric) and linear term b, so
   * that the mean is Q^-1 b; rows and columns follow the block's members.
   */
  record Canonical(double[][] precision, double[] linear) {}

  /** Computes a block's canonical-form full conditional from the current state. */
  @FunctionalInterface
  interface CanonicalRule {
    Canonical canonical(double[] state);
  }

  /** Computes a conjugate posterior from the current state. */
  @FunctionalInterface
  interface PosteriorRule {
    Posterior posterior(double[] state);
  }

  /** The conjugate pairs recognised (Gelman et al., Bayesian Data Analysis, 3rd ed., ch. 2-3). */
  enum ConjugateKind {
    /** Normal prior on the mean (or an affine coefficient of the mean) of normal children. */
    NORMAL_MEAN("normal prior on the mean of normal terms"),
    /** Gamma prior on the rate of Poisson, exponential or gamma children. */
    GAMMA_RATE("gamma prior on a rate"),
    /** Gamma prior on the precision of normal children. */
    GAMMA_PRECISION("gamma prior on the precision of normal terms"),
    /** Inverse-gamma prior on the variance of normal children. */
    INV_GAMMA_VARIANCE("inverse-gamma prior on the variance of normal terms"),
    /** Beta prior on the probability of binomial or Bernoulli children. */
    BETA_PROBABILITY("beta prior on the probability of binomial or bernoulli terms"),
    /** A missing observation nothing depends on: drawn from its own family. */
    PREDICTIVE("missing observation with no dependants, drawn from its own family");

    private final String description;

    ConjugateKind(String description) {
      this.description = description;
    }

    public String description() {
      return description;
    }
  }
}

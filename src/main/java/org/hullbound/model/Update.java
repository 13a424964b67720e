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

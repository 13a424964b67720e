package org.hullbound.gibbs;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.random.RandomGenerator;
import org.hullbound.model.BoundModel;
import org.hullbound.model.ConditionalDensity;
import org.hullbound.model.Posterior;
import org.hullbound.model.Unknown;
import org.hullbound.model.Update;
import org.hullbound.sampling.ConjugateDraws;

/**
 * The Gibbs sampler of a bound model: one update rule per scalar unknown, chosen from the model's
 * analysis of its full conditional, and dispersed starting values.
 *
 * <p>Blocks of unknowns with a multivariate normal joint conditional (linear-normal regressions)
 * are drawn jointly and exactly through {@link CanonicalNormal}; other conjugate conditionals are
 * drawn exactly one at a time; log-concave ones by adaptive rejection (tangents,
 * or secants where the conditional is not smooth); the others by the fallback. Missing
 * observations are unknowns like any other and are imputed the same way. Starting values: a draw
 * from the joint prior, then the values given with {@code --init} ({@link ModelStartingValues}).
 */
public final class ModelSampler {
  private final BoundModel model;
  private final GibbsSampler sampler;
  private final List<String> labels;
  private final List<String> reasons;

  private ModelSampler(
      BoundModel model, GibbsSampler sampler, List<String> labels, List<String> reasons) {
    this.model = model;
    this.sampler = sampler;
    this.labels = labels;
    this.reasons = reasons;
  }

  /**
   * Builds the sampler of {@code model}.
   *
   * @param given starting values by label (natural scale), possibly empty
   * @throws StartingValueException when a given value names no unknown or lies outside the support
   */
  public static ModelSampler of(BoundModel model, Map<String, Double> given) {
    return build(model, given, true, true);
  }

  /**
   * The same sampler without the extra moves along lines ({@link BoundModel#moves()}): one
   * unknown (or block) at a time only, for comparisons and benchmarks of the moves.
   */
  public static ModelSampler withoutMoves(BoundModel model, Map<String, Double> given) {
    return build(model, given, true, false);
  }

  /**
   * The same sampler with every linear-normal block replaced by its members' one-at-a-time
   * updates ({@link BoundModel#singleUpdate}): the baseline that benchmarks and comparisons of the
   * block draw need; {@link #of} is the sampler to use.
   */
  public static ModelSampler withoutBlocks(BoundModel model, Map<String, Double> given) {
    return build(model, given, false, true);
  }

  private static ModelSampler build(
      BoundModel model, Map<String, Double> given, boolean blocks, boolean moves) {
    List<Unknown> unknowns = model.unknowns();
    model.requireUnknowns();
    List<String> labels = new ArrayList<>();
    for (Unknown unknown : unknowns) {
      labels.add(unknown.label());
    }
    for (String name : given.keySet()) {
      if (!labels.contains(name)) {
        throw new StartingValueException(
            "--init names '" + name + "', which is not an unknown of model " + model.name()
                + model.nearestUnknown(name).map(near -> "; did you mean '" + near + "'?")
                    .orElse("; unknowns are " + abbreviate(labels)));
      }
    }
    requireInsideSupports(unknowns, given);
    double[] base = model.initialState();
    List<UpdateRule> rules = new ArrayList<>();
    List<String> reasons = new ArrayList<>();
    for (Unknown unknown : unknowns) {
      int index = unknown.index();
      Update update = blocks ? model.update(index) : model.singleUpdate(index);
      reasons.add(update.reason());
      ruleFor(model, unknown, update, base).ifPresent(rules::add);
    }
    if (moves) {
      rules = Interweaving.order(rules, model.moves());
      for (Update move : model.moves()) {
        rules.add(MoveRules.of(move));
      }
    }
    StartingValues starts = ModelStartingValues.of(model, base, given);
    return new ModelSampler(
        model, GibbsSampler.of(unknowns.size(), rules, starts).withLabels(labels),
        List.copyOf(labels),
        List.copyOf(reasons));
  }

  /**
   * A given value outside its own unknown's fixed support is named as such; otherwise the
   * zero-density check of the whole start would blame whichever unknown it meets first.
   */
  private static void requireInsideSupports(List<Unknown> unknowns, Map<String, Double> given) {
    for (Unknown unknown : unknowns) {
      Double value = given.get(unknown.label());
      if (value == null) {
        continue;
      }
      boolean outside = Double.isNaN(value) || value < unknown.lower() || value > unknown.upper()
          || (unknown.discrete() && Double.isFinite(value) && value != Math.rint(value));
      if (outside) {
        throw new StartingValueException(
            "--init gives " + unknown.label() + " = " + Unknown.shown(value) + ", outside its support "
                + unknown.support());
      }
    }
  }

  /** The sampler to run. */
  public GibbsSampler sampler() {
    return sampler;
  }

  /** The columns of a draw: each unknown's label in state order. */
  public List<String> labels() {
    return labels;
  }

  /** Why each unknown's update was chosen, in state order. */
  public List<String> reasons() {
    return reasons;
  }

  public BoundModel model() {
    return model;
  }

  private static UpdateRule blockRule(Update.LinearNormalBlock block) {
    return new UpdateRule.BlockNormal(
        block.members(),
        state -> {
          Update.Canonical canonical = block.canonical(state);
          return CanonicalNormal.of(canonical.precision(), canonical.linear());
        });
  }

  /**
   * The rule of {@code unknown}, or none for a block member after the first: the block's rule goes
   * in the sweep where its first member would be.
   */
  private static Optional<UpdateRule> ruleFor(
      BoundModel model, Unknown unknown, Update update, double[] base) {
    int index = unknown.index();
    return update.accept(
        new Update.Visitor<Optional<UpdateRule>>() {
          @Override
          public Optional<UpdateRule> conjugate(Update.Conjugate conjugate) {
            return Optional.of(conjugateRule(unknown, model, conjugate, base));
          }

          @Override
          public Optional<UpdateRule> adaptiveRejection(Update.AdaptiveRejection rejection) {
            ScalarConditional conditional = adapt(model.conditional(index));
            return Optional.of(
                unknown.discrete()
                    ? new UpdateRule.Fallback(index, conditional, rejection.reason())
                    : new UpdateRule.AdaptiveRejection(index, conditional, rejection.reason()));
          }

          @Override
          public Optional<UpdateRule> fallback(Update.Fallback fallback) {
            return Optional.of(
                new UpdateRule.Fallback(index, adapt(model.conditional(index)), fallback.reason()));
          }

          @Override
          public Optional<UpdateRule> discrete(Update.Discrete discrete) {
            return Optional.of(new UpdateRule.Discrete(
                index, adapt(model.conditional(index)), discrete.reason(), discrete.finite(),
                discrete.logConcave()));
          }

          @Override
          public Optional<UpdateRule> linearNormalBlock(Update.LinearNormalBlock block) {
            return block.members()[0] == index ? Optional.of(blockRule(block)) : Optional.empty();
          }

          @Override
          public Optional<UpdateRule> groupMove(Update.GroupMove move) {
            throw new IllegalStateException("a move is an extra update, not one unknown's");
          }

          @Override
          public Optional<UpdateRule> directionBlock(Update.DirectionBlock block) {
            throw new IllegalStateException("a move is an extra update, not one unknown's");
          }
        });
  }

  private static UpdateRule conjugateRule(
      Unknown unknown, BoundModel model, Update.Conjugate conjugate, double[] base) {
    int index = unknown.index();
    Posterior sample = conjugate.posterior(base);
    String family = sample.family();
    List<String> names = sample.argumentNames();
    if (conjugate.kind() == Update.ConjugateKind.PREDICTIVE) {
      if (PredictiveDraw.supports(family, names)) {
        double lower = unknown.lower();
        double upper = unknown.upper();
        return new UpdateRule.Conjugate(
            index, "predictive " + family,
            (state, rng) -> {
              Posterior posterior = conjugate.posterior(state);
              return PredictiveDraw.draw(
                  family, names, posterior.arguments(),
                  Double.isNaN(lower) ? Double.NEGATIVE_INFINITY : lower,
                  Double.isNaN(upper) ? Double.POSITIVE_INFINITY : upper, rng);
            });
      }
      return new UpdateRule.Fallback(
          index, adapt(model.conditional(index)), "no exact draw for " + family);
    }
    ConditionalDensity density = model.conditional(index);
    UpdateRule.ConjugateDraw exact = conjugateDraw(conjugate, family, names);
    return new UpdateRule.Conjugate(
        index, family,
        (state, rng) -> {
          double value = exact.draw(state, rng);
          if (!Double.isFinite(density.toSamplingScale(value))) {
            throw new IllegalStateException(
                "the exact " + family + " draw is " + value + ", on the edge of the support "
                    + unknown.support() + " and so outside it: the posterior "
                    + conjugate.posterior(state) + " puts its mass closer to the edge than a"
                    + " double can tell apart from it");
          }
          return value;
        });
  }

  private static UpdateRule.ConjugateDraw conjugateDraw(
      Update.Conjugate conjugate, String family, List<String> names) {
    switch (family) {
      case "normal":
        return (state, rng) -> {
          double[] a = conjugate.posterior(state).arguments();
          return ConjugateDraws.normal(rng, a[names.indexOf("mean")], a[names.indexOf("sd")]);
        };
      case "gamma":
        return (state, rng) -> {
          double[] a = conjugate.posterior(state).arguments();
          return ConjugateDraws.gamma(rng, a[names.indexOf("shape")], a[names.indexOf("rate")]);
        };
      case "inverse-gamma":
        return (state, rng) -> {
          double[] a = conjugate.posterior(state).arguments();
          return ConjugateDraws.inverseGamma(
              rng, a[names.indexOf("shape")], a[names.indexOf("scale")]);
        };
      case "beta":
        return (state, rng) -> {
          double[] a = conjugate.posterior(state).arguments();
          return ConjugateDraws.beta(rng, a[names.indexOf("a")], a[names.indexOf("b")]);
        };
      default:
        throw new IllegalStateException(
            "the model offered a conjugate " + family + " posterior, which has no exact draw here");
    }
  }

  /** The model's conditional seen through the driver's narrow interface. */
  static ScalarConditional adapt(ConditionalDensity density) {
    boolean discrete = density.unknown().discrete();
    return new ScalarConditional() {
      @Override
      public double logDensity(double u, double[] state, double[] slope) {
        return density.logDensity(u, state, slope);
      }

      @Override
      public double toNatural(double u) {
        double value = density.toNatural(u);
        // exp(u) underflows to 0 below u = -745 (and expit(u) rounds to 0 or 1 past
        // |u| = 745 or 37): a draw there would leave the open support silently.
        if (Double.isFinite(u) && !Double.isFinite(density.toSamplingScale(value))) {
          throw new IllegalStateException(
              "the draw " + u + " on the " + density.unknown().scale().name().toLowerCase(
                  java.util.Locale.ROOT) + " scale is " + value + " on the natural scale, on the"
                  + " edge of the support " + density.unknown().support() + " and so outside it:"
                  + " the conditional puts its mass closer to the edge than a double can tell"
                  + " apart from it");
        }
        return value;
      }

      @Override
      public double toSamplingScale(double v) {
        return density.toSamplingScale(v);
      }

      @Override
      public double lowerBound(double[] state) {
        return density.lowerBound(state);
      }

      @Override
      public double upperBound(double[] state) {
        return density.upperBound(state);
      }

      @Override
      public boolean smooth() {
        return density.smooth();
      }

      @Override
      public boolean discrete() {
        return discrete;
      }

      @Override
      public ScalarConditional forOneChain() {
        ConditionalDensity own = density.forOneChain();
        return own == density ? this : adapt(own);
      }
    };
  }

  private static String abbreviate(List<String> labels) {
    if (labels.size() <= 8) {
      return String.join(", ", labels);
    }
    return String.join(", ", labels.subList(0, 8)) + ", ... (" + labels.size() + " in all)";
  }
}

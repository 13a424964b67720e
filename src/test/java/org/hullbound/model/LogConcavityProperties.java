package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import net.jqwik.api.Example;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.IntRange;
import org.hullbound.lang.Parser;

/**
 * Where the analysis calls a conditional log-concave, a numerical second derivative (central
 * difference of the compiled slope) must be non-positive at generated points, for generated data
 * and states. A check of the rules against the mathematics they claim, not of any one formula.
 */
class LogConcavityProperties {

  /** A model template, the unknown to check, and how to make its data for a seed. */
  private record Case(String label, String model, DataMaker data) {}

  @FunctionalInterface
  private interface DataMaker {
    String inline(RandomGenerator random);
  }

  private static String vector(RandomGenerator random, int n, java.util.function.Supplier<Double> v) {
    List<String> values = new ArrayList<>();
    for (int i = 0; i < n; i++) {
      values.add(String.format(Locale.ROOT, "%.4f", v.get()));
    }
    return "[" + String.join(", ", values) + "]";
  }

  private static final List<Case> CASES =
      List.of(
          new Case(
              "effect[2]",
              "index g = 1 .. 3\nindex obs = 1 .. 12\ndata g_of[obs] = [1,2,3,1,2,3,1,2,3,1,2,3]\n"
                  + "data y[obs] = %s ~ bernoulli(logit_p = alpha + effect[g_of[obs]])\n"
                  + "param alpha ~ normal(mean = 0, sd = 2)\n"
                  + "param spread ~ half-normal(sd = 1)\n"
                  + "param effect[g] ~ normal(mean = 0, sd = spread)",
              r -> vector(r, 12, () -> (double) (r.nextBoolean() ? 1 : 0))
                  .replace(".0000", "")),
          new Case(
              "spread",
              "index g = 1 .. 5\nparam spread ~ half-normal(sd = 1)\n"
                  + "data e[g] = %s ~ normal(mean = 0, sd = spread)",
              r -> vector(r, 5, () -> 3 * r.nextGaussian())),
          new Case(
              "b",
              "index t = 1 .. 6\ndata x[t] = [0.1, 0.5, 1.0, 1.5, 2.0, 3.0]\n"
                  + "data y[t] = %s ~ poisson(rate = exp(a + b * x[t]))\n"
                  + "param a ~ normal(mean = 0, sd = 1)\nparam b ~ normal(mean = 0, sd = 1)",
              r -> vector(r, 6, () -> (double) r.nextInt(12))
                  .replace(".0000", "")),
          new Case(
              "noise",
              "index obs = 1 .. 6\n"
                  + "data y[obs] = %s ~ student-t(df = 3, location = 1, scale = noise)\n"
                  + "param noise ~ half-cauchy(scale = 1)",
              r -> vector(r, 6, () -> 1 + 4 * r.nextGaussian())),
          new Case(
              "v",
              "index obs = 1 .. 4\n"
                  + "data y[obs] = %s ~ normal(mean = 0, sd = sqrt(v))\n"
                  + "param v ~ lognormal(meanlog = 0, sdlog = 1)",
              r -> vector(r, 4, () -> 2 * r.nextGaussian())),
          new Case(
              "k",
              "index obs = 1 .. 4\n"
                  + "data w[obs] = %s ~ gamma(shape = k, rate = 2)\n"
                  + "param k ~ exponential(rate = 0.5)",
              r -> vector(r, 4, () -> 0.05 + 3 * r.nextDouble())));

  @Property(tries = 300, seed = "20240806")
  void aConditionalTheRulesCallLogConcaveHasNoPositiveCurvature(
      @ForAll @IntRange(min = 0, max = 5) int which,
      @ForAll @IntRange(min = 0, max = 1_000_000) int dataSeed,
      @ForAll @DoubleRange(min = -3, max = 3) double u) {
    Case c = CASES.get(which);
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(dataSeed);
    String text = String.format(Locale.ROOT, c.model(), c.data().inline(random));
    BoundModel model = BoundModel.bind(Parser.parse("case.hbm", text), List.of());
    Unknown unknown = model.unknown(c.label());
    assertInstanceOf(Update.AdaptiveRejection.class, model.update(unknown.index()),
        model.update(unknown.index()).reason());
    double[] state = model.initialState();
    for (Unknown other : model.unknowns()) {
      if (other != unknown && other.scale() != org.hullbound.model.family.Scale.NATURAL) {
        state[other.index()] = Math.exp(random.nextGaussian() * 0.5);
      } else if (other != unknown) {
        state[other.index()] = random.nextGaussian();
      }
    }
    ConditionalDensity conditional = model.conditional(unknown.index());
    double lower = conditional.lowerBound(state);
    // Points inside the support: a natural-scale positive unknown is checked at lower + e^u.
    u = Double.isFinite(lower) ? lower + Math.exp(u) : u;
    double h = 1e-4 * Math.min(1, Double.isFinite(lower) ? u - lower : 1);
    double[] up = new double[1];
    double[] down = new double[1];
    conditional.logDensity(u + h, state, up);
    conditional.logDensity(u - h, state, down);
    double second = (up[0] - down[0]) / (2 * h);
    // Rounding error of the difference of slopes is about 1e-16 |slope| / h; 1e-8 (1 + |slope|)
    // leaves a wide margin over it and is still far below any real positive curvature.
    double tolerance = 1e-8 * (1 + Math.abs(up[0]) + Math.abs(down[0])) / h;
    assertTrue(second <= tolerance,
        c.label() + " at u = " + u + ": second derivative " + second + "\n" + text);
  }

  /** The check has power: where the rules say "not provably", it does find positive curvature. */
  @Example
  void theNumericalCheckFindsTheConvexStretchOfAStudentTLocation() {
    BoundModel model =
        BoundModel.bind(
            Parser.parse(
                "t.hbm",
                "index obs = 1 .. 2\n"
                    + "data y[obs] = [-5, 5] ~ student-t(df = 3, location = mu, scale = 1)\n"
                    + "param mu ~ normal(mean = 0, sd = 100)"),
            List.of());
    assertInstanceOf(Update.Fallback.class, model.update(0));
    ConditionalDensity conditional = model.conditional(0);
    double[] up = new double[1];
    double[] down = new double[1];
    double h = 1e-4;
    // Between two far observations the t log-likelihood is convex: a dip at mu = 0.
    conditional.logDensity(h, new double[1], up);
    conditional.logDensity(-h, new double[1], down);
    assertTrue((up[0] - down[0]) / (2 * h) > 0.1);
  }
}

package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.junit.jupiter.api.Test;

/** Dispersed starting values from a prior draw, with --init overrides and a fallback. */
class ModelStartingValuesTest {
  private static final String MODEL =
      "index obs = 1 .. 3\n"
          + "data y[obs] = [1.0, 0.0, 1.0] ~ bernoulli(p = p)\n"
          + "data z[obs] = [0.3, -0.2, 0.9] ~ normal(mean = mu, sd = sigma)\n"
          + "param p ~ beta(a = 2, b = 2)\n"
          + "param mu ~ normal(mean = 0, sd = 100)\n"
          + "param sigma ~ half-normal(sd = 1)\n";

  private static BoundModel bind(String text) {
    return BoundModel.bind(Parser.parse(SourceText.of("test.hbm", text)), List.of());
  }

  /** The starts of {@code chains} chains, each from its own split generator, in chain order. */
  private static double[][] starts(BoundModel model, Map<String, Double> given, int chains, long seed) {
    ModelSampler.of(model, given);
    StartingValues starts = ModelStartingValues.of(model, model.initialState(), given);
    RandomGenerator.SplittableGenerator root =
        (RandomGenerator.SplittableGenerator)
            RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
    double[][] out = new double[chains][model.unknowns().size()];
    for (int c = 0; c < chains; c++) {
      starts.fill(out[c], root.split());
    }
    return out;
  }

  @Test
  void chainsStartApartInsideTheSupportAndReproducibly() {
    BoundModel model = bind(MODEL);
    double[][] a = starts(model, Map.of(), 20, 5L);
    double[][] b = starts(model, Map.of(), 20, 5L);
    int p = model.unknown("p").index();
    int mu = model.unknown("mu").index();
    int sigma = model.unknown("sigma").index();
    for (int c = 0; c < a.length; c++) {
      assertArrayEquals(a[c], b[c], "chain " + c + " with the same seed");
      assertTrue(a[c][p] > 0 && a[c][p] < 1, "p = " + a[c][p]);
      assertTrue(a[c][sigma] > 0, "sigma = " + a[c][sigma]);
      assertFalse(Arrays.equals(a[c], a[(c + 1) % a.length]), "chains " + c + " and next");
    }
    // mu's prior has sd 100: the sample sd of 20 prior draws is below 20 with probability
    // P(chi2_19 < 19 * 0.04) < 1e-12, while uniform(-2, 2) shifts have sd 1.15.
    double mean = 0;
    for (double[] start : a) {
      mean += start[mu] / a.length;
    }
    double squares = 0;
    for (double[] start : a) {
      squares += (start[mu] - mean) * (start[mu] - mean);
    }
    double sd = Math.sqrt(squares / (a.length - 1));
    assertTrue(sd > 20, "sd of mu's starts " + sd);
  }

  @Test
  void givenValuesOverrideThePriorDraw() {
    BoundModel model = bind(MODEL);
    double[][] a = starts(model, Map.of("mu", 3.5), 5, 9L);
    for (double[] start : a) {
      assertEquals(3.5, start[model.unknown("mu").index()]);
    }
  }

  @Test
  void aPriorDrawWithZeroDensityFallsBackToTheShiftedStart() {
    // The prior puts t below the observation 0.5 with probability 1 - exp(-5) = 0.993, where the
    // uniform likelihood is zero; the fallback (log 1 + uniform(-2, 2), or 1) keeps every start
    // valid.
    BoundModel model =
        bind(
            "data y = 0.5 ~ uniform(lower = 0, upper = t)\n"
                + "param t ~ exponential(rate = 10)\n");
    double[][] a = starts(model, Map.of(), 20, 3L);
    for (double[] start : a) {
      assertTrue(start[0] > 0.5, "t = " + start[0]);
    }
    assertTrue(Arrays.stream(a).mapToDouble(s -> s[0]).distinct().count() > 5);
  }

  @Test
  void aStartWithZeroDensityNamesTheTermAndItsStatement() {
    // At m = 0 the observation y = 2 lies outside uniform(0, 1): the likelihood term, declared at
    // line 3 column 6, is what makes the joint density zero, not the prior of m.
    BoundModel model =
        bind(
            "param m ~ normal(mean = 0, sd = 1)\n"
                + "# the observation\n"
                + "data y = 2 ~ uniform(lower = m, upper = m + 1)\n");
    StartingValueException e =
        org.junit.jupiter.api.Assertions.assertThrows(
            StartingValueException.class,
            () -> ModelStartingValues.of(model, model.initialState(), Map.of()));
    assertTrue(
        e.getMessage().contains("y = 2 ~ uniform(lower = 0, upper = 1) at test.hbm:3:6 has"
            + " log-density -inf: a uniform value must lie in [lower, upper] = [0, 1], got 2"),
        e.getMessage());
  }

  @Test
  void aStartWithAnUndefinedArgumentNamesTheTermAndTheArgument() {
    // log(m - 5) at m = 0 is NaN, so the term's mean is not a number.
    BoundModel model =
        bind(
            "param m ~ normal(mean = 0, sd = 1) within -1 .. 1\n"
                + "data y = 1 ~ normal(mean = log(m - 5), sd = 1)\n");
    StartingValueException e =
        org.junit.jupiter.api.Assertions.assertThrows(
            StartingValueException.class,
            () -> ModelStartingValues.of(model, model.initialState(), Map.of()));
    assertTrue(e.getMessage().contains("at test.hbm:2:6 has log-density NaN: mean must be a"
        + " finite number, got NaN"), e.getMessage());
  }

  @Test
  void aLatentCountStartsNoLowerThanTheCountObservedOfIt() {
    // A binomial count cannot exceed its trials (common practice): every clutch must start at
    // or above the chicks hatched from it, whatever the prior draw or the model's start.
    BoundModel model =
        bind(
            "index nest = 1 .. 4\n"
                + "param clutch ~ gamma(shape = 2, rate = 0.5)\n"
                + "param hatching ~ beta(a = 8, b = 4)\n"
                + "param laid[nest] ~ poisson(rate = clutch)\n"
                + "data hatched[nest] = [2, 9, 0, 14] ~ binomial(trials = laid[nest], p = hatching)\n");
    double[] hatched = {2, 9, 0, 14};
    for (double[] start : starts(model, Map.of(), 30, 11L)) {
      for (int i = 0; i < hatched.length; i++) {
        double laid = start[model.unknown("laid[" + (i + 1) + "]").index()];
        assertTrue(laid >= hatched[i] && laid == Math.rint(laid), "laid[" + (i + 1) + "] = " + laid);
      }
    }
  }
}

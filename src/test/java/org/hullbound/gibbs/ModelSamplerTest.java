package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.RealDistribution;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.junit.jupiter.api.Test;

/**
 * Fits of small model files with inline data against closed-form posteriors (Gelman et al.,
 * Bayesian Data Analysis, 3rd ed., ch. 2), through the whole path: parser, binding, the model's
 * update analysis, {@link ModelSampler}, the chain runner and the diagnostics. Tolerance 4 MCSE
 * (see {@link GibbsPosteriorTest} for its false-alarm rate).
 */
class ModelSamplerTest {
  private static final RunSettings SETTINGS = new RunSettings(4, 200, 1500, 1, 31L, 2);

  private static ModelSampler sampler(String text) {
    return ModelSampler.of(
        BoundModel.bind(Parser.parse(SourceText.of("test.hbm", text)), List.of()), Map.of());
  }

  private static void assertMean(RealDistribution truth, VariableSummary summary) {
    assertTrue(
        Math.abs(summary.mean() - truth.getNumericalMean()) < 4 * summary.mcseMean(),
        summary.name() + " mean " + summary.mean() + " vs " + truth.getNumericalMean()
            + ", mcse " + summary.mcseMean());
    double q975 = truth.inverseCumulativeProbability(0.975);
    assertTrue(
        Math.abs(summary.q975() - q975) < 4 * summary.mcseQ975(),
        summary.name() + " q975 " + summary.q975() + " vs " + q975);
  }

  @Test
  void betaBinomialIsDrawnExactlyAndMatchesTheBetaPosterior() {
    ModelSampler model =
        sampler(
            "index trial = 1 .. 4\n"
                + "data n[trial] = [10, 12, 8, 10]\n"
                + "data y[trial] = [3, 5, 2, 4] ~ binomial(trials = n[trial], p = p)\n"
                + "param p ~ beta(a = 2, b = 3)\n");
    Fits.Fit fit = Fits.run(model.sampler(), SETTINGS);
    // BDA 2.4: Beta(a + sum y, b + sum (n - y)) = Beta(16, 29).
    assertMean(new BetaDistribution(null, 16, 29), fit.summary(0));
    assertEquals("conjugate beta", fit.reports().get(0).method());
  }

  @Test
  void gammaPoissonIsDrawnExactlyAndMatchesTheGammaPosterior() {
    ModelSampler model =
        sampler(
            "index day = 1 .. 5\n"
                + "data count[day] = [4, 7, 3, 5, 6] ~ poisson(rate = rate)\n"
                + "param rate ~ gamma(shape = 2, rate = 0.5)\n");
    Fits.Fit fit = Fits.run(model.sampler(), SETTINGS);
    // BDA 2.6: Gamma(alpha + sum y, beta + n) = Gamma(27, 5.5).
    assertMean(new GammaDistribution(null, 27, 1 / 5.5), fit.summary(0));
    assertEquals("conjugate gamma", fit.reports().get(0).method());
  }

  @Test
  void anExactDrawOnTheEdgeOfAnOpenSupportIsAnErrorNamingTheUnknown() {
    // Gamma(1e-8, 1) is below 4.9e-324 (the smallest positive double) with probability about
    // 1 - 1e-8 * 744 (P(X < x) ~ x^shape / Gamma(shape + 1) for small x, closed form), so its draw
    // rounds to 0, outside the open support (0, inf) of a gamma; it must not be stored silently.
    ModelSampler model = sampler("param g ~ gamma(shape = 1e-8, rate = 1)\n");
    ChainFailedException failure =
        assertThrows(ChainFailedException.class, () -> Fits.run(model.sampler(), SETTINGS));
    assertTrue(failure.getMessage().contains("updating g (conjugate gamma): the exact gamma draw"
        + " is 0.0, on the edge of the support (0, inf)"), failure.getMessage());
  }

  @Test
  void aLogConcaveNonConjugateConditionalGoesThroughAdaptiveRejection() {
    // A normal mean with a logistic prior: not conjugate, log-concave (both terms are).
    ModelSampler model =
        sampler(
            "index obs = 1 .. 3\n"
                + "data y[obs] = [1.2, 0.4, 2.0] ~ normal(mean = mu, sd = 1)\n"
                + "param mu ~ logistic(location = 0, scale = 1)\n");
    Fits.Fit fit = Fits.run(model.sampler(), SETTINGS);
    assertEquals("adaptive rejection", fit.reports().get(0).method());
    assertTrue(fit.reports().get(0).evaluationsPerDraw() <= 3);
    assertTrue(fit.summary(0).rhat() < 1.01);
  }

  @Test
  void aStartingValueForAnUnknownThatDoesNotExistIsATypedError() {
    BoundModel model =
        BoundModel.bind(
            Parser.parse(
                SourceText.of(
                    "t.hbm",
                    "data y = 1 ~ normal(mean = mu, sd = 1)\nparam mu ~ normal(mean = 0, sd = 1)\n")),
            List.of());
    StartingValueException e =
        assertThrows(StartingValueException.class, () -> ModelSampler.of(model, Map.of("nu", 1.0)));
    assertTrue(e.getMessage().contains("'nu'"), e.getMessage());
    assertTrue(e.getMessage().contains("mu"), e.getMessage());
  }

  @Test
  void aGivenStartingValueOutsideTheSupportIsATypedError() {
    BoundModel model =
        BoundModel.bind(
            Parser.parse(
                SourceText.of(
                    "t.hbm",
                    "data y = 1 ~ poisson(rate = r)\nparam r ~ gamma(shape = 1, rate = 1)\n")),
            List.of());
    StartingValueException e =
        assertThrows(StartingValueException.class, () -> ModelSampler.of(model, Map.of("r", -1.0)));
    assertTrue(e.getMessage().contains("r = -1, outside its support (0, inf)"), e.getMessage());
  }

  @Test
  void aMistypedStartingValueNameGetsTheNearestUnknown() {
    BoundModel model =
        BoundModel.bind(
            Parser.parse(
                SourceText.of(
                    "t.hbm",
                    "data y = 1 ~ poisson(rate = lambda)\nparam lambda ~ gamma(shape = 1, rate = 1)\n")),
            List.of());
    StartingValueException near =
        assertThrows(StartingValueException.class, () -> ModelSampler.of(model, Map.of("lamda", 1.0)));
    assertTrue(near.getMessage().endsWith("'lamda', which is not an unknown of model t; did you"
        + " mean 'lambda'?"), near.getMessage());
    StartingValueException far =
        assertThrows(StartingValueException.class, () -> ModelSampler.of(model, Map.of("zzz", 1.0)));
    assertTrue(far.getMessage().endsWith("; unknowns are lambda"), far.getMessage());
  }

  @Test
  void givenStartingValuesAreUsedAndOthersAreDispersed() {
    ModelSampler model =
        sampler(
            "data y = 0.5 ~ normal(mean = mu, sd = s)\n"
                + "param mu ~ normal(mean = 0, sd = 1)\n"
                + "param s ~ half-normal(sd = 1)\n");
    BoundModel bound = model.model();
    ModelSampler given = ModelSampler.of(bound, Map.of("mu", 3.25));
    RandomGeneratorSource seeds = new RandomGeneratorSource();
    double[] first = given.sampler().newChain(0, seeds.next()).state();
    double[] second = given.sampler().newChain(1, seeds.next()).state();
    int mu = bound.unknown("mu").index();
    int s = bound.unknown("s").index();
    assertEquals(3.25, first[mu]);
    assertEquals(3.25, second[mu]);
    assertTrue(first[s] != second[s], "dispersed starts differ between chains");
    assertTrue(first[s] > 0 && second[s] > 0);
  }

  /** Two chains' generators from one seed, as the runner makes them. */
  private static final class RandomGeneratorSource {
    private final java.util.random.RandomGenerator[] generators = ChainSeeds.split(8, 2);
    private int next;

    java.util.random.RandomGenerator next() {
      return generators[next++];
    }
  }

  @Test
  void aMissingObservationIsImputedFromItsPredictive() {
    ModelSampler model =
        sampler(
            "index obs = 1 .. 4\n"
                + "data y[obs] = [1.0, NA, 2.0, 1.5] ~ normal(mean = mu, sd = 0.5)\n"
                + "param mu ~ normal(mean = 0, sd = 10)\n");
    BoundModel bound = model.model();
    assertTrue(model.labels().contains("y[2]"), model.labels().toString());
    Fits.Fit fit = Fits.run(model.sampler(), SETTINGS);
    int missing = bound.unknown("y[2]").index();
    int mu = bound.unknown("mu").index();
    // Posterior of mu from the three observed values (BDA 2.5), then y[2] ~ N(mu, 0.5^2):
    // predictive N(mean_mu, var_mu + 0.25) (BDA 2.5, posterior predictive).
    double precision = 1 / 100.0 + 3 / 0.25;
    double meanMu = (4.5 / 0.25) / precision;
    assertMean(new NormalDistribution(null, meanMu, Math.sqrt(1 / precision)), fit.summary(mu));
    assertMean(
        new NormalDistribution(null, meanMu, Math.sqrt(1 / precision + 0.25)), fit.summary(missing));
    assertTrue(fit.reports().get(missing).method().startsWith("predictive"),
        fit.reports().get(missing).method());
  }
}

package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * Conjugate posteriors against the textbook closed forms of Gelman et al., Bayesian Data
 * Analysis, 3rd ed. (2013), chapters 2-3, and against the compiled conditional itself: the
 * posterior's log-density (commons-math3) must differ from the conditional by a constant.
 */
class ConjugatePairsTest {

  private static Update.Conjugate conjugate(BoundModel model, String label) {
    // The one-at-a-time update: some of these models also form a linear-normal block.
    return assertInstanceOf(
        Update.Conjugate.class, model.singleUpdate(model.unknown(label).index()),
        model.singleUpdate(model.unknown(label).index()).reason());
  }

  /** The compiled conditional minus {@code posterior} (on the sampling scale) is constant. */
  private static void conditionalMatches(
      BoundModel model, String label, double[] state, DoubleUnaryOperator posterior) {
    ConditionalDensity c = model.conditional(model.unknown(label).index());
    double base = Double.NaN;
    for (double u : new double[] {-1.1, -0.3, 0.2, 0.9, 1.6}) {
      double difference = c.logDensity(u, state, null) - posterior.applyAsDouble(u);
      if (Double.isNaN(base)) {
        base = difference;
      }
      assertEquals(base, difference, 1e-8, "at u = " + u);
    }
  }

  @Test
  void normalMeanWithKnownSd() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [4.1, 5.3, 3.8, 6.0, 4.9] ~ normal(mean = mu, sd = 2)",
                "param mu ~ normal(mean = 1, sd = 3)"));
    Update.Conjugate update = conjugate(model, "mu");
    assertEquals(Update.ConjugateKind.NORMAL_MEAN, update.kind());
    Posterior p = update.posterior(model.initialState());
    // BDA3 eq. (2.11)-(2.12): 1/tau_n^2 = 1/tau_0^2 + n/sigma^2,
    // mu_n = (mu_0/tau_0^2 + n ybar/sigma^2) / (1/tau_n^2).
    double precision = 1 / 9.0 + 5 / 4.0;
    double mean = (1 / 9.0 + (4.1 + 5.3 + 3.8 + 6.0 + 4.9) / 4) / precision;
    assertEquals("normal", p.family());
    assertEquals(mean, p.argument("mean"), 1e-12);
    assertEquals(1 / Math.sqrt(precision), p.argument("sd"), 1e-12);
    NormalDistribution exact = new NormalDistribution(mean, 1 / Math.sqrt(precision));
    conditionalMatches(model, "mu", model.initialState(), exact::logDensity);
  }

  @org.junit.jupiter.params.ParameterizedTest
  @org.junit.jupiter.params.provider.ValueSource(doubles = {1e300, 1e-200, 1.5e154, 1e-160})
  void normalMeanWhoseSpreadSquaredOverflowsOrUnderflowsKeepsItsPrior(double sd) {
    // With no dependent term the posterior is the prior itself (BDA3 section 2.5 with n = 0);
    // sd^2 overflows above about 1.34e154 and underflows below about 1.5e-162 (IEEE 754 binary64
    // range, common practice), which made the mean 0 * inf or 0 / 0 = NaN.
    BoundModel model =
        bind("param m ~ normal(mean = 2, sd = " + sd + ")");
    Posterior p = conjugate(model, "m").posterior(model.initialState());
    assertEquals(2.0, p.argument("mean"));
    assertEquals(sd, p.argument("sd"), 1e-15 * sd);
  }

  @Test
  void normalMeanWithAVagueButRepresentablePriorFollowsTheData() {
    // Prior precision 1e-600 underflows to 0; its true contribution to the posterior precision
    // 1/4 + 1e-600 is below rounding, so the posterior is N(ybar, 2/sqrt(n)) to the last bit
    // (BDA3 eq. 2.11-2.12 with 1/tau_0^2 -> 0).
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [4.0, 6.0] ~ normal(mean = m, sd = 2)",
                "param m ~ normal(mean = 0, sd = 1e300)"));
    Posterior p = conjugate(model, "m").posterior(model.initialState());
    assertEquals(5.0, p.argument("mean"), 1e-15);
    assertEquals(Math.sqrt(2.0), p.argument("sd"), 1e-15);
  }

  @Test
  void normalCoefficientOfAnAffineMeanWithVarianceAndPrecisionForms() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data x[obs] = [0.5, -1.0, 2.0]",
                "data y[obs] = [1.0, -0.5, 3.5] ~ normal(mean = a + b * x[obs], var = 0.25)",
                "param a ~ normal(mean = 0, precision = 0.01)",
                "param b ~ normal(mean = 0, var = 4)"));
    double[] state = {0.3, 0};
    Posterior p = conjugate(model, "b").posterior(state);
    // Regression with one coefficient (BDA3 section 2.5 applied to (y_i - a) / x_i with variance
    // sigma^2 / x_i^2): precision 1/4 + sum x^2 / 0.25, mean sum x (y - a) / 0.25 / precision.
    double precision = 0.25 + (0.25 + 1 + 4) / 0.25;
    double weighted = (0.5 * (1.0 - 0.3) + -1.0 * (-0.5 - 0.3) + 2.0 * (3.5 - 0.3)) / 0.25;
    assertEquals(weighted / precision, p.argument("mean"), 1e-12);
    assertEquals(1 / Math.sqrt(precision), p.argument("sd"), 1e-12);
    conditionalMatches(
        model, "b", state,
        new NormalDistribution(weighted / precision, 1 / Math.sqrt(precision))::logDensity);
  }

  @Test
  void hierarchicalCentreReadsItsChildrenAndTheirSdFromTheState() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index group = 1 .. 3",
                "param centre ~ normal(mean = 0, sd = 2.5)",
                "param spread ~ half-normal(sd = 1)",
                "param effect[group] ~ normal(mean = centre, sd = spread)"));
    double[] state = {0, 0.5, 0.2, 1.0, -0.4};
    Posterior p = conjugate(model, "centre").posterior(state);
    double precision = 1 / 6.25 + 3 / 0.25;
    assertEquals((0.2 + 1.0 - 0.4) / 0.25 / precision, p.argument("mean"), 1e-12);
    assertEquals(1 / Math.sqrt(precision), p.argument("sd"), 1e-12);
  }

  @Test
  void gammaRateOfPoissonCountsWithExposures() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index shift",
                "data hours[shift] = [6, 8, 10]",
                "data rejects[shift] = [4, 9, 7] ~ poisson(rate = hours[shift] * rate)",
                "param rate ~ gamma(shape = 2, rate = 1.5)"));
    Update.Conjugate update = conjugate(model, "rate");
    assertEquals(Update.ConjugateKind.GAMMA_RATE, update.kind());
    Posterior p = update.posterior(model.initialState());
    // BDA3 section 2.6 (Poisson model with exposures x_i): Gamma(alpha + sum y, beta + sum x).
    assertEquals(2 + 20, p.argument("shape"), 1e-12);
    assertEquals(1.5 + 24, p.argument("rate"), 1e-12);
    GammaDistribution exact = new GammaDistribution(22, 1 / 25.5);
    // On the log scale the posterior density of u = log(rate) is p(e^u) e^u.
    conditionalMatches(model, "rate", model.initialState(),
        u -> exact.logDensity(Math.exp(u)) + u);
  }

  @Test
  void gammaRateOfExponentialWaitingTimesWithAScalePrior() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data wait[obs] = [0.5, 2.0, 1.5, 0.25] ~ exponential(rate = lambda)",
                "param lambda ~ gamma(shape = 3, scale = 0.5)"));
    Posterior p = conjugate(model, "lambda").posterior(model.initialState());
    // Exponential model with a gamma prior (BDA3 section 2.7): Gamma(alpha + n, beta + sum y).
    assertEquals(3 + 4, p.argument("shape"), 1e-12);
    assertEquals(2 + 4.25, p.argument("rate"), 1e-12);
  }

  @Test
  void gammaPrecisionOfNormalsWithAnUnknownMean() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [9.8, 10.4, 10.1, 9.5] ~ normal(mean = mu, precision = tau)",
                "param mu ~ normal(mean = 10, sd = 5)",
                "param tau ~ gamma(shape = 1, rate = 0.1)"));
    double[] state = {10.0, 1.0};
    Update.Conjugate update = conjugate(model, "tau");
    assertEquals(Update.ConjugateKind.GAMMA_PRECISION, update.kind());
    Posterior p = update.posterior(state);
    // BDA3 section 2.6 (normal with known mean, precision form): Gamma(alpha + n/2,
    // beta + sum (y - mu)^2 / 2).
    double ss = 0.04 + 0.16 + 0.01 + 0.25;
    assertEquals(1 + 2, p.argument("shape"), 1e-12);
    assertEquals(0.1 + ss / 2, p.argument("rate"), 1e-12);
    GammaDistribution exact = new GammaDistribution(3, 1 / (0.1 + ss / 2));
    conditionalMatches(model, "tau", state, u -> exact.logDensity(Math.exp(u)) + u);
  }

  @Test
  void inverseGammaVarianceOfNormals() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [1.2, -0.3, 0.8] ~ normal(mean = 0.5, var = v)",
                "param v ~ inverse-gamma(shape = 2, scale = 1)"));
    Update.Conjugate update = conjugate(model, "v");
    assertEquals(Update.ConjugateKind.INV_GAMMA_VARIANCE, update.kind());
    Posterior p = update.posterior(model.initialState());
    // BDA3 section 3.2 (variance with known mean, inverse-gamma form of the scaled inverse
    // chi-square): Inv-Gamma(alpha + n/2, beta + sum (y - mu)^2 / 2).
    double ss = 0.49 + 0.64 + 0.09;
    assertEquals(2 + 1.5, p.argument("shape"), 1e-12);
    assertEquals(1 + ss / 2, p.argument("scale"), 1e-12);
    // The inverse-gamma log-density of v = e^u is a log b - lgamma(a) - (a + 1) u - b e^-u; with
    // the Jacobian u that is -a u - b e^-u up to a constant.
    double a = 3.5;
    double b = 1 + ss / 2;
    conditionalMatches(model, "v", model.initialState(), u -> -a * u - b * Math.exp(-u));
  }

  @Test
  void betaProbabilityOfBinomialAndBernoulliChildren() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index tray = 1 .. 3",
                "index seed = 1 .. 4",
                "data planted[tray] = [10, 12, 8]",
                "data grew[tray] = [7, 5, 6] ~ binomial(trials = planted[tray], p = p)",
                "data sprouted[seed] = [1, 0, 1, 1] ~ bernoulli(p = p)",
                "param p ~ beta(a = 1.5, b = 2)"));
    Update.Conjugate update = conjugate(model, "p");
    assertEquals(Update.ConjugateKind.BETA_PROBABILITY, update.kind());
    Posterior p = update.posterior(model.initialState());
    // BDA3 section 2.4: Beta(a + sum y, b + sum (n - y)).
    assertEquals(1.5 + 18 + 3, p.argument("a"), 1e-12);
    assertEquals(2 + 12 + 1, p.argument("b"), 1e-12);
    BetaDistribution exact = new BetaDistribution(22.5, 15);
    // On the logit scale the density of u is p(x) x (1 - x) with x = expit(u).
    conditionalMatches(
        model, "p", model.initialState(),
        u -> {
          double x = 1 / (1 + Math.exp(-u));
          return exact.logDensity(x) + Math.log(x) + Math.log1p(-x);
        });
  }

  @Test
  void noPairWhenTheUnknownAlsoEntersAnotherArgumentOrATruncatedTerm() {
    BoundModel twoArguments =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [1.0, 2.0] ~ normal(mean = mu, sd = exp(mu))",
                "param mu ~ normal(mean = 0, sd = 1)"));
    assertInstanceOf(Update.Fallback.class, twoArguments.update(0));
    BoundModel truncated =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [1.0, 2.0] ~ normal(mean = mu, sd = 1) within 0 .. inf",
                "param mu ~ normal(mean = 0, sd = 1)"));
    assertInstanceOf(Update.Fallback.class, truncated.update(0));
    BoundModel nonLinearRate =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [1, 2] ~ poisson(rate = rate + 1)",
                "param rate ~ gamma(shape = 1, rate = 1)"));
    assertInstanceOf(Update.AdaptiveRejection.class, nonLinearRate.update(0));
  }
}

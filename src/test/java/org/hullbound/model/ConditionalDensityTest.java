package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.hullbound.model.TestModels.centralDifference;
import static org.hullbound.model.TestModels.table;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.ExponentialDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.hullbound.model.family.Scale;
import org.junit.jupiter.api.Test;

/**
 * Compiled conditionals against hand-written formulas built from commons-math3's {@code
 * logDensity} and {@code logProbability} (the reference library): differences of values at two
 * points (constants dropped by either side cancel), and derivatives against central finite
 * differences, through let chains, sums, nested indexing, truncation normalisers and the log and
 * logit transforms with their Jacobians.
 */
class ConditionalDensityTest {

  private static final double[] POINTS = {-1.3, -0.2, 0.4, 1.7};

  /** Checks value differences against {@code reference} (on the sampling scale) and slopes. */
  private static void agrees(
      ConditionalDensity c, double[] state, DoubleUnaryOperator reference, double[] points) {
    double[] slope = new double[1];
    double base = c.logDensity(points[0], state, null) - reference.applyAsDouble(points[0]);
    for (double u : points) {
      double value = c.logDensity(u, state, slope);
      assertEquals(base, value - reference.applyAsDouble(u), 1e-9 * (1 + Math.abs(value)),
          "value at u = " + u);
      // Central difference with h = 1e-5: truncation error O(h^2 f''') is far below 1e-5.
      double numeric = centralDifference(c, u, state, 1e-5);
      assertEquals(numeric, slope[0], 1e-5 * (1 + Math.abs(numeric)), "slope at u = " + u);
    }
  }

  private static double inverseLogit(double a) {
    return 1 / (1 + Math.exp(-a));
  }

  private static final String SEEDLINGS =
      String.join(
          "\n",
          "index bench = 1 .. 3",
          "index tray",
          "data  planted[tray], bench_of[tray]",
          "let   lp[tray] = centre + effect[bench_of[tray]]",
          "let   lp2[tray] = lp[tray]",
          "data  survived[tray] ~ binomial(trials = planted[tray], logit_p = lp2[tray])",
          "param centre ~ normal(mean = 0, sd = 2.5)",
          "param spread ~ half-normal(sd = 1)",
          "param effect[bench] ~ normal(mean = 0, sd = spread)");

  private static final DataTable TRAYS =
      table(
          "trays.csv",
          "planted,bench_of,survived",
          "20,1,15",
          "22,2,11",
          "25,3,20",
          "21,1,14",
          "24,2,12");

  @Test
  void aGroupEffectThroughALetChainAndNestedIndexing() {
    BoundModel model = bind(SEEDLINGS, TRAYS);
    double[] state = {0.4, 0.9, 0.3, -0.5, 1.1};
    ConditionalDensity c = model.conditional(model.unknown("effect[2]").index());
    assertEquals(Scale.NATURAL, c.scale());
    // Reference (commons-math3): prior normal(0, spread) and the binomial terms of trays 2 and 5.
    agrees(
        c,
        state,
        e ->
            new NormalDistribution(0, 0.9).logDensity(e)
                + new BinomialDistribution(22, inverseLogit(0.4 + e)).logProbability(11)
                + new BinomialDistribution(24, inverseLogit(0.4 + e)).logProbability(12),
        POINTS);
  }

  @Test
  void aScaleParameterOnTheLogScaleIncludesTheJacobian() {
    BoundModel model = bind(SEEDLINGS, TRAYS);
    double[] state = {0.4, 0.9, 0.3, -0.5, 1.1};
    ConditionalDensity c = model.conditional(model.unknown("spread").index());
    assertEquals(Scale.LOG, c.scale());
    // half-normal(1) density is 2 phi(s); the Jacobian of s = exp(u) is exp(u), log-Jacobian u.
    agrees(
        c,
        state,
        u -> {
          double s = Math.exp(u);
          return new NormalDistribution(0, 1).logDensity(s)
              + new NormalDistribution(0, s).logDensity(0.3)
              + new NormalDistribution(0, s).logDensity(-0.5)
              + new NormalDistribution(0, s).logDensity(1.1)
              + u;
        },
        POINTS);
    assertEquals(Math.exp(0.3), c.toNatural(0.3), 1e-15);
    assertEquals(0.3, c.toSamplingScale(Math.exp(0.3)), 1e-15);
  }

  @Test
  void aRegressionCoefficientThroughASum() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "index coef = 1 .. 3",
                "data X[obs, coef]",
                "let mu[obs] = sum(coef: X[obs, coef] * beta[coef])",
                "data y[obs] ~ normal(mean = mu[obs], sd = sigma)",
                "param beta[coef] ~ normal(mean = 0, sd = 10)",
                "param sigma ~ gamma(shape = 2, rate = 1)"),
            table(
                "obs.csv",
                "X[1],X[2],X[3],y",
                "1,0.5,2,1.2",
                "1,-1.5,3,0.3",
                "1,2.0,-1,2.2",
                "1,0.1,0.5,-0.7"));
    double[][] x = {{1, 0.5, 2}, {1, -1.5, 3}, {1, 2.0, -1}, {1, 0.1, 0.5}};
    double[] y = {1.2, 0.3, 2.2, -0.7};
    double[] state = {0.3, 0.8, -0.2, 1.4};
    ConditionalDensity c = model.conditional(model.unknown("beta[2]").index());
    agrees(
        c,
        state,
        b -> {
          double total = new NormalDistribution(0, 10).logDensity(b);
          for (int i = 0; i < 4; i++) {
            double mu = x[i][0] * 0.3 + x[i][1] * b + x[i][2] * -0.2;
            total += new NormalDistribution(mu, 1.4).logDensity(y[i]);
          }
          return total;
        },
        POINTS);
    ConditionalDensity s = model.conditional(model.unknown("sigma").index());
    agrees(
        s,
        state,
        u -> {
          double sigma = Math.exp(u);
          // commons-math3 GammaDistribution takes shape and scale = 1 / rate.
          double total = new GammaDistribution(2, 1).logDensity(sigma) + u;
          for (int i = 0; i < 4; i++) {
            double mu = x[i][0] * 0.3 + x[i][1] * 0.8 + x[i][2] * -0.2;
            total += new NormalDistribution(mu, sigma).logDensity(y[i]);
          }
          return total;
        },
        POINTS);
  }

  @Test
  void aTruncatedLikelihoodKeepsItsNormaliserWhenItsMeanIsUnknown() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [0.2, 1.5, 0.7, 3.1] ~ normal(mean = mu, sd = 1.5) within 0 .. 4",
                "param mu ~ normal(mean = 0, sd = 5)"));
    double[] y = {0.2, 1.5, 0.7, 3.1};
    ConditionalDensity c = model.conditional(0);
    agrees(
        c,
        new double[1],
        mu -> {
          NormalDistribution child = new NormalDistribution(mu, 1.5);
          double mass = Math.log(child.cumulativeProbability(4) - child.cumulativeProbability(0));
          double total = new NormalDistribution(0, 5).logDensity(mu);
          for (double v : y) {
            total += child.logDensity(v) - mass;
          }
          return total;
        },
        POINTS);
    assertFalse(model.update(0) instanceof Update.AdaptiveRejection,
        "a moving truncation normaliser is not covered by the rules");
  }

  @Test
  void aProbabilityOnTheLogitScaleIncludesTheJacobian() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data n[obs] = [10, 12, 8]",
                "data k[obs] = [3, 7, 2] ~ binomial(trials = n[obs], p = p)",
                "param p ~ beta(a = 2, b = 3)"));
    ConditionalDensity c = model.conditional(0);
    assertEquals(Scale.LOGIT, c.scale());
    agrees(
        c,
        new double[1],
        u -> {
          double p = inverseLogit(u);
          return new BetaDistribution(2, 3).logDensity(p)
              + new BinomialDistribution(10, p).logProbability(3)
              + new BinomialDistribution(12, p).logProbability(7)
              + new BinomialDistribution(8, p).logProbability(2)
              + Math.log(p) + Math.log1p(-p);
        },
        POINTS);
    assertEquals(0.25, c.toNatural(c.toSamplingScale(0.25)), 1e-15);
  }

  @Test
  void aGammaShapeKeepsItsLgammaNormaliser() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data wait[obs] = [0.8, 2.5, 1.1, 4.0] ~ gamma(shape = k, rate = 2)",
                "param k ~ exponential(rate = 0.5)"));
    double[] w = {0.8, 2.5, 1.1, 4.0};
    ConditionalDensity c = model.conditional(0);
    // -lgamma(k) is concave in k, but not in log k for every data set: the natural scale is used.
    assertEquals(Scale.NATURAL, c.scale());
    agrees(
        c,
        new double[1],
        k -> {
          // commons-math3 ExponentialDistribution takes the mean (1 / rate).
          double total = new ExponentialDistribution(2).logDensity(k);
          for (double v : w) {
            total += new GammaDistribution(k, 0.5).logDensity(v);
          }
          return total;
        },
        new double[] {0.3, 0.9, 1.6, 2.8});
  }

  @Test
  void aPoissonRegressionThroughExpAndLog1p() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index t = 1 .. 4",
                "let rate[t] = exp(a + log1p(b^2) * t)",
                "data y[t] = [2, 3, 5, 9] ~ poisson(rate = rate[t])",
                "param a ~ normal(mean = 0, sd = 1)",
                "param b ~ normal(mean = 0, sd = 1)"));
    int[] y = {2, 3, 5, 9};
    double a = 0.3;
    double[] state = {a, 0};
    ConditionalDensity c = model.conditional(1);
    agrees(
        c,
        state,
        b -> {
          double total = new NormalDistribution(0, 1).logDensity(b);
          for (int t = 1; t <= 4; t++) {
            double rate = Math.exp(a + Math.log1p(b * b) * t);
            total += new PoissonDistribution(rate).logProbability(y[t - 1]);
          }
          return total;
        },
        POINTS);
  }

  @Test
  void aMissingObservationIsItsOwnLikelihoodAndFeedsItsParents() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] ~ student-t(df = 4, location = mu, scale = 2)",
                "param mu ~ normal(mean = 0, sd = 10)"),
            table("obs.csv", "y", "1.5", "NA", "-0.5"));
    Unknown missing = model.unknown("y[2]");
    double[] state = {0.7, 3.0};
    ConditionalDensity c = model.conditional(missing.index());
    // commons-math3 TDistribution is standard: density of (y - mu)/s is scaled by 1/s.
    agrees(c, state, v -> new TDistribution(4).logDensity((v - 0.7) / 2), POINTS);
    ConditionalDensity mu = model.conditional(0);
    agrees(
        mu,
        state,
        m ->
            new NormalDistribution(0, 10).logDensity(m)
                + new TDistribution(4).logDensity((1.5 - m) / 2)
                + new TDistribution(4).logDensity((3.0 - m) / 2)
                + new TDistribution(4).logDensity((-0.5 - m) / 2),
        POINTS);
  }

  @Test
  void nonDifferentiableTermsMakeTheConditionalNotSmooth() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [0.5, -1.0] ~ laplace(location = mu, scale = 1)",
                "data z[obs] = [0.5, 1.0] ~ normal(mean = abs(nu), sd = 1)",
                "param mu ~ normal(mean = 0, sd = 10)",
                "param nu ~ normal(mean = 0, sd = 10)",
                "param w ~ normal(mean = 0, sd = 10)"));
    assertFalse(model.conditional(0).smooth());
    assertFalse(model.conditional(1).smooth());
    assertTrue(model.conditional(2).smooth());
    assertTrue(model.update(0) instanceof Update.AdaptiveRejection ars && !ars.smooth()
        || model.update(0) instanceof Update.Fallback f && !f.smooth(), model.update(0).reason());
  }

  @Test
  void outsideTheSupportTheDensityIsMinusInfinityWithZeroSlope() {
    BoundModel model = bind("param t ~ normal(mean = 0, sd = 1) within 0 .. 1");
    double[] slope = {7};
    assertEquals(Double.NEGATIVE_INFINITY, model.conditional(0).logDensity(-0.5, new double[1],
        slope));
    assertEquals(0, slope[0]);
  }

  @Test
  void farOnTheLogScaleTheDensityStaysFiniteOrMinusInfinityNeverNaN() {
    BoundModel model = bind(SEEDLINGS, TRAYS);
    double[] state = {0.4, 0.9, 0.3, -0.5, 1.1};
    ConditionalDensity c = model.conditional(model.unknown("spread").index());
    double[] slope = new double[1];
    for (double u : new double[] {-800, -50, 50, 400, 800}) {
      double v = c.logDensity(u, state, slope);
      assertFalse(Double.isNaN(v), "u = " + u);
      assertTrue(v < c.logDensity(0, state, null), "u = " + u);
    }
  }

  @Test
  void aMissingCovariateValueThatIsModelledIsImputedFromItsDependantsToo() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index t = 1 .. 3",
                "data x[t] = [1.0, NA, 2.0] ~ normal(mean = 0, sd = 2)",
                "data y[t] = [0.5, 1.5, 1.0] ~ normal(mean = b * x[t], sd = 1)",
                "param b ~ normal(mean = 0, sd = 1)"));
    Unknown x2 = model.unknown("x[2]");
    assertEquals(java.util.List.of("y[2]"), model.dependentLabels(x2.index()));
    double b = 0.6;
    double[] state = {b, 0.9};
    agrees(
        model.conditional(x2.index()),
        state,
        x -> new NormalDistribution(0, 2).logDensity(x)
            + new NormalDistribution(b * x, 1).logDensity(1.5),
        POINTS);
    assertTrue(model.update(x2.index()) instanceof Update.AdaptiveRejection,
        model.update(x2.index()).reason());
    // The coefficient's conjugate posterior reads the imputed x[2] from the state:
    // precision 1 + (1 + 0.81 + 4), weighted sum 0.5 + 0.9 * 1.5 + 2 * 1.0 (BDA3 section 2.5).
    Posterior p = ((Update.Conjugate) model.update(0)).posterior(state);
    assertEquals((0.5 + 0.9 * 1.5 + 2.0) / 6.81, p.argument("mean"), 1e-12);
  }
}

package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.hullbound.model.TestModels.table;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.hullbound.model.family.Scale;
import org.junit.jupiter.api.Test;

/** Binding of every statement form of the model language into unknowns and terms. */
class BindingTest {

  private static final String SEEDLINGS =
      String.join(
          "\n",
          "model seedlings",
          "index bench = 1 .. 3",
          "index tray",
          "data  planted[tray], bench_of[tray]",
          "data  survived[tray] ~ binomial(trials = planted[tray], logit_p ="
              + " effect[bench_of[tray]])",
          "param centre ~ normal(mean = 0, sd = 2.5)",
          "param spread ~ half-normal(sd = 1)",
          "param effect[bench] ~ normal(mean = centre, sd = spread)");

  private static DataTable seedlingData() {
    return table(
        "trays.csv",
        "planted,bench_of,survived",
        "20,1,15",
        "22,2,11",
        "25,3,20",
        "21,1,14",
        "24,2,12");
  }

  @Test
  void theDesignExampleBindsToOneUnknownPerParamElement() {
    BoundModel model = bind(SEEDLINGS, seedlingData());
    assertEquals("seedlings", model.name());
    assertEquals(
        List.of("centre", "spread", "effect[1]", "effect[2]", "effect[3]"),
        model.unknowns().stream().map(Unknown::label).toList());
    assertEquals(new IndexSet("tray", 1, 5, "trays.csv"), model.indexSets().get(1));
    assertEquals(new IndexSet("bench", 1, 3, "declared"), model.indexSets().get(0));
    // 5 prior terms and 5 likelihood terms.
    assertEquals(10, model.termCount());
    DataSummary data = model.data().get(0);
    assertEquals("trays.csv", data.source());
    assertEquals(5, data.rows());
    assertEquals(List.of("planted", "bench_of", "survived"), data.columns());
  }

  @Test
  void eachUnknownsBlanketHoldsExactlyTheTermsThatReadIt() {
    BoundModel model = bind(SEEDLINGS, seedlingData());
    // effect[2] is read by trays 2 and 5 only (nested indexing effect[bench_of[tray]]).
    assertEquals(
        List.of("survived[2]", "survived[5]"),
        model.dependentLabels(model.unknown("effect[2]").index()));
    assertEquals(
        List.of("effect[1]", "effect[2]", "effect[3]"),
        model.dependentLabels(model.unknown("centre").index()));
    assertEquals(3, model.conditional(model.unknown("effect[2]").index()).termCount());
  }

  @Test
  void scalesFollowTheSupport() {
    BoundModel model = bind(SEEDLINGS, seedlingData());
    assertEquals(Scale.NATURAL, model.unknown("centre").scale());
    assertEquals(Scale.LOG, model.unknown("spread").scale());
    assertEquals(0, model.unknown("spread").lower());
    assertEquals(Double.POSITIVE_INFINITY, model.unknown("spread").upper());
  }

  @Test
  void theJointDensityIsTheSumOfEveryTerm() {
    BoundModel model = bind(SEEDLINGS, seedlingData());
    double[] state = {0.5, 0.8, 0.1, -0.4, 1.2};
    double expected =
        new NormalDistribution(0, 2.5).logDensity(0.5)
            + Math.log(2) + new NormalDistribution(0, 1).logDensity(0.8)
            + new NormalDistribution(0.5, 0.8).logDensity(0.1)
            + new NormalDistribution(0.5, 0.8).logDensity(-0.4)
            + new NormalDistribution(0.5, 0.8).logDensity(1.2)
            + binomial(20, 0.1, 15) + binomial(22, -0.4, 11) + binomial(25, 1.2, 20)
            + binomial(21, 0.1, 14) + binomial(24, -0.4, 12);
    // Reference: commons-math3 NormalDistribution and BinomialDistribution.
    assertEquals(expected, model.logDensity(state), 1e-9);
  }

  private static double binomial(int n, double logit, int y) {
    return new BinomialDistribution(n, 1 / (1 + Math.exp(-logit))).logProbability(y);
  }

  @Test
  void inlineScalarsSizeIndexSetsAndInlineVectorsAreData() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "data n = 3",
                "index day = 1 .. n",
                "data exposure[day] = [2, 3, 4]",
                "data count[day] = [1, 5, 2] ~ poisson(rate = exposure[day] * rate)",
                "param rate ~ gamma(shape = 1, rate = 1)"));
    assertEquals("test", model.name());
    assertEquals(new IndexSet("day", 1, 3, "declared"), model.indexSets().get(0));
    double expected =
        -1.5
            + new PoissonDistribution(3.0).logProbability(1)
            + new PoissonDistribution(4.5).logProbability(5)
            + new PoissonDistribution(6.0).logProbability(2);
    // gamma(1, 1) at 1.5 is exp(-1.5); reference for the counts: commons-math3.
    assertEquals(expected, model.logDensity(new double[] {1.5}), 1e-9);
  }

  @Test
  void anInlineVectorSizesASetWithoutBounds() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "data y[obs] = [1.5, NA, 2.5] ~ normal(mean = mu, sd = 1)",
                "param mu ~ normal(mean = 0, sd = 10)"));
    assertEquals(3, model.indexSets().get(0).size());
    Unknown missing = model.unknown("y[2]");
    assertTrue(missing.imputed());
    assertFalse(missing.discrete());
    assertEquals(List.of("mu", "y[2]"), model.unknowns().stream().map(Unknown::label).toList());
    assertInstanceOf(Update.Conjugate.class, model.update(missing.index()));
  }

  @Test
  void aMatrixIsReadFromColumnsAndSumReducesOverASet() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "index coef = 1 .. 2",
                "data X[obs, coef]",
                "let mu[obs] = sum(coef: X[obs, coef] * beta[coef])",
                "data y[obs] ~ normal(mean = mu[obs], sd = 1)",
                "param beta[coef] ~ normal(mean = 0, sd = 1)"),
            table("obs.csv", "X[1],X[2],y", "1,0.5,1.2", "1,-1.5,0.3", "1,2.0,2.2"));
    double[] state = {0.4, 0.7};
    double expected =
        new NormalDistribution(0, 1).logDensity(0.4)
            + new NormalDistribution(0, 1).logDensity(0.7)
            + new NormalDistribution(0.4 + 0.7 * 0.5, 1).logDensity(1.2)
            + new NormalDistribution(0.4 - 0.7 * 1.5, 1).logDensity(0.3)
            + new NormalDistribution(0.4 + 0.7 * 2.0, 1).logDensity(2.2);
    assertEquals(expected, model.logDensity(state), 1e-9);
    assertEquals(List.of("X[1]", "X[2]", "y"), model.data().get(0).columns());
  }

  @Test
  void aSetSizedOnlyByMatrixColumnsCountsThem() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index obs",
                "index coef",
                "data X[obs, coef]",
                "data y[obs] ~ normal(mean = sum(coef: X[obs, coef] * beta[coef]), sd = 1)",
                "param beta[coef] ~ normal(mean = 0, sd = 1)"),
            table("obs.csv", "X[1],X[2],X[3],y", "1,0.5,2,1.2", "1,-1.5,3,0.3"));
    assertEquals(new IndexSet("coef", 1, 3, "columns"), model.indexSets().get(1));
    assertEquals(3, model.unknowns().size());
  }

  @Test
  void aTruncatedParamHasTheTruncationAsItsSupport() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "param t ~ normal(mean = 0, sd = 1) within -1 .. 2",
                "param s ~ gamma(shape = 2, rate = 1) within 0.5 .. inf"));
    Unknown t = model.unknown("t");
    assertEquals(-1, t.lower());
    assertEquals(2, t.upper());
    assertEquals(Scale.NATURAL, t.scale());
    Unknown s = model.unknown("s");
    assertEquals(0.5, s.lower());
    assertEquals(Double.POSITIVE_INFINITY, s.upper());
    double[] start = model.initialState();
    assertEquals(0, start[t.index()]);
    assertTrue(start[s.index()] > 0.5);
    ConditionalDensity c = model.conditional(t.index());
    assertEquals(Double.NEGATIVE_INFINITY, c.logDensity(2.5, start, null));
    assertEquals(-1, c.lowerBound(start));
    assertEquals(2, c.upperBound(start));
  }

  @Test
  void aMissingCountIsADiscreteImputedUnknown() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index day",
                "data count[day] ~ poisson(rate = rate)",
                "param rate ~ gamma(shape = 1, rate = 1)"),
            table("days.csv", "count", "3", "", "4"));
    Unknown missing = model.unknown("count[2]");
    assertTrue(missing.discrete());
    assertTrue(missing.imputed());
    Update.Conjugate update = (Update.Conjugate) model.update(missing.index());
    assertEquals(Update.ConjugateKind.PREDICTIVE, update.kind());
    double[] state = model.initialState();
    state[model.unknown("rate").index()] = 2.5;
    Posterior posterior = update.posterior(state);
    assertEquals("poisson", posterior.family());
    assertEquals(2.5, posterior.argument("rate"));
    // The rate's blanket includes the imputed count, read from the state.
    assertEquals(
        List.of("count[1]", "count[2]", "count[3]"),
        model.dependentLabels(model.unknown("rate").index()));
  }

  @Test
  void aLetChainIsInlinedAndSetNamesAreValues() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "index t = 1 .. 3",
                "let trend[t] = a + b * t",
                "let level[t] = exp(trend[t])",
                "data y[t] = [1, 2, 4] ~ poisson(rate = level[t])",
                "param a ~ normal(mean = 0, sd = 1)",
                "param b ~ normal(mean = 0, sd = 1)"));
    double a = 0.2;
    double b = 0.3;
    double expected =
        new NormalDistribution(0, 1).logDensity(a)
            + new NormalDistribution(0, 1).logDensity(b)
            + new PoissonDistribution(Math.exp(a + b)).logProbability(1)
            + new PoissonDistribution(Math.exp(a + 2 * b)).logProbability(2)
            + new PoissonDistribution(Math.exp(a + 3 * b)).logProbability(4);
    assertEquals(expected, model.logDensity(new double[] {a, b}), 1e-9);
    // exp of an affine predictor: the Poisson rate rule on the log scale applies.
    assertInstanceOf(Update.AdaptiveRejection.class, model.update(1));
  }

  @Test
  void anInitialStateLiesInsideEverySupport() {
    BoundModel model =
        bind(
            String.join(
                "\n",
                "param lo ~ normal(mean = 3, sd = 1)",
                "param p ~ beta(a = 2, b = 2)",
                "param x ~ uniform(lower = lo, upper = 10)",
                "param r ~ exponential(rate = 2)"));
    double[] start = model.initialState();
    assertEquals(3, start[0]);
    assertEquals(0.5, start[1]);
    assertEquals(6.5, start[2]);
    assertEquals(1, start[3]);
    assertTrue(Double.isNaN(model.unknown("x").lower()));
    assertEquals(10, model.unknown("x").upper());
    assertTrue(Double.isFinite(model.logDensity(start)));
  }
}

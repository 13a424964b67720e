package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.random.RandomGenerator;
import org.hullbound.lang.ModelException;
import org.junit.jupiter.api.Test;

/**
 * The test quantities of posterior predictive checks: which quantities each modelled name gets,
 * their observed values worked out by hand, missing cells left out, check statements evaluated on
 * both sides with the sweep's unknowns, and replicates kept inside truncation bounds.
 */
class TestQuantitiesTest {
  private static final RandomGenerator RNG = RandomGenerator.of("L64X128MixRandom");

  private static double[][] evaluate(TestQuantities tests, double[] state) {
    int n = tests.quantities().size();
    double[] observed = new double[n];
    double[] replicated = new double[n];
    tests.replicator().evaluate(state, RandomGenerator.of("L64X128MixRandom"), observed, replicated);
    return new double[][] {observed, replicated};
  }

  private static List<String> names(TestQuantities tests) {
    return tests.quantities().stream().map(q -> q.node() + "." + q.statistic()).toList();
  }

  @Test
  void aContinuousNameHasMeanSdMinAndMaxAndACountNameAlsoItsShareOfZeros() {
    BoundModel model = TestModels.bind("""
        param mu ~ normal(mean = 0, sd = 1)
        param rate ~ gamma(shape = 2, rate = 1)
        index obs
        data y[obs] = [1, 2, 4] ~ normal(mean = mu, sd = 1)
        data k[obs] = [0, 3, 0] ~ poisson(rate = rate)
        """);
    TestQuantities tests = TestQuantities.of(model);
    assertEquals(
        List.of("y.mean", "y.sd", "y.min", "y.max", "k.mean", "k.sd", "k.min", "k.max",
            "k.zero_share"),
        names(tests));
    double[] observed = evaluate(tests, model.initialState())[0];
    // By hand: y = 1, 2, 4 has mean 7/3 and sd sqrt(((4/3)^2 + (1/3)^2 + (5/3)^2) / 2) = sqrt(7/3).
    assertEquals(7.0 / 3, observed[0], 1e-15);
    assertEquals(Math.sqrt(7.0 / 3), observed[1], 1e-15);
    assertEquals(1, observed[2]);
    assertEquals(4, observed[3]);
    assertEquals(1, observed[4]);
    assertEquals(2.0 / 3, observed[8], 1e-15);
  }

  @Test
  void missingCellsAreLeftOutOfBothSidesOfTheDefaultQuantities() {
    BoundModel model = TestModels.bind("""
        param rate ~ gamma(shape = 2, rate = 1)
        index obs
        data k[obs] = [5, NA, 7] ~ poisson(rate = rate)
        """);
    TestQuantities tests = TestQuantities.of(model);
    assertEquals(new TestQuantities.CheckedNode("k", "poisson", 2, 1), tests.nodes().get(0));
    double[] state = model.initialState();
    state[model.unknown("k[2]").index()] = 1000;
    double[][] values = evaluate(tests, state);
    assertEquals(6, values[0][0], "the mean of 5 and 7, without the imputed 1000");
    assertEquals(7, values[0][3], "the max leaves the imputed 1000 out");
    // The replicate of k[2] is drawn (rate 1 at the start), but not counted: the replicated mean
    // is that of two values, each a Poisson count, so it is a multiple of 1/2.
    assertEquals(0, values[1][0] * 2 % 1, 0);
  }

  @Test
  void aCheckReadsItsNameAsObservedOrReplicatedAndTheSweepsUnknownsOnBothSides() {
    BoundModel model = TestModels.bind("""
        param mu ~ normal(mean = 0, sd = 1)
        index obs
        data y[obs] = [1, 2, 4] ~ normal(mean = mu, sd = 1)
        let centred[obs] = y[obs] - mu
        check squares = sum(obs: centred[obs] ^ 2)
        """);
    TestQuantities tests = TestQuantities.of(model);
    TestQuantities.Quantity check = tests.quantities().get(4);
    assertEquals(new TestQuantities.Quantity("y", "squares", true), check);
    double[] state = {0.5};
    int n = tests.quantities().size();
    double[] observed = new double[n];
    double[] replicated = new double[n];
    TestQuantities.Replicator replicator = tests.replicator();
    replicator.evaluate(state, RNG, observed, replicated);
    // (1 - 0.5)^2 + (2 - 0.5)^2 + (4 - 0.5)^2 = 0.25 + 2.25 + 12.25, through the let.
    assertEquals(14.75, observed[4], 1e-12);
    double expected = 0;
    for (double v : replicator.replicatedData(0)) {
      expected += (v - 0.5) * (v - 0.5);
    }
    assertEquals(expected, replicated[4], 1e-12);
  }

  @Test
  void aCheckOnANameWithMissingCellsUsesTheImputedValueOnTheObservedSide() {
    BoundModel model = TestModels.bind("""
        param mu ~ normal(mean = 0, sd = 1)
        index obs
        data y[obs] = [1, NA, 4] ~ normal(mean = mu, sd = 1)
        check total = sum(obs: y[obs])
        """);
    TestQuantities tests = TestQuantities.of(model);
    double[] state = model.initialState();
    state[model.unknown("y[2]").index()] = 10;
    double[][] values = evaluate(tests, state);
    assertEquals(15, values[0][tests.quantities().size() - 1], 1e-12);
  }

  @Test
  void replicatesOfATruncatedLikelihoodStayWithinItsBounds() {
    BoundModel model = TestModels.bind("""
        param mu ~ normal(mean = 0, sd = 1)
        index obs
        data y[obs] = [0.5, 0.25, 0.75] ~ normal(mean = mu, sd = 3) within 0 .. 1
        """);
    TestQuantities tests = TestQuantities.of(model);
    TestQuantities.Replicator replicator = tests.replicator();
    double[] observed = new double[4];
    double[] replicated = new double[4];
    for (int i = 0; i < 500; i++) {
      replicator.evaluate(new double[] {0}, RNG, observed, replicated);
      assertTrue(replicated[2] >= 0 && replicated[3] <= 1, replicated[2] + " .. " + replicated[3]);
    }
  }

  @Test
  void aModelWithoutModelledDataHasNoQuantities() {
    BoundModel model = TestModels.bind("param mu ~ normal(mean = 0, sd = 1)\n");
    assertTrue(TestQuantities.of(model).quantities().isEmpty());
  }

  @Test
  void aCheckMustReadExactlyOneModelledName() {
    ModelException none = assertThrows(ModelException.class, () -> TestModels.bind("""
        param mu ~ normal(mean = 0, sd = 1)
        check twice = 2 * mu
        """));
    assertTrue(none.render().contains("must read exactly one modelled data name"), none.render());
    ModelException two = assertThrows(ModelException.class, () -> TestModels.bind("""
        param mu ~ normal(mean = 0, sd = 1)
        data a = 1 ~ normal(mean = mu, sd = 1)
        data b = 2 ~ normal(mean = mu, sd = 1)
        check both = a + b
        """));
    assertTrue(two.render().contains("it reads 'a' and 'b'"), two.render());
  }
}

package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.hullbound.model.TestModels.table;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.junit.jupiter.api.Test;

/**
 * Rows of one linear predictor summed once by their sufficient statistics (issue 12): rows of a
 * run whose moving argument has bit-equal numbers have one {@code eta} in every state, and where
 * the family's log-density is linear in the response's statistics given {@code eta} (common
 * practice: exponential families; logit binomial {@code sum(y) log expit(eta) + sum(trials - y)
 * log expit(-eta) + sum log C}, log-rate Poisson {@code sum(y) eta - n exp(eta) - sum lgamma(y +
 * 1)}) the group is evaluated once.
 *
 * <p>The reference is outside the collapse: the same conditional's kept parts evaluated a term at
 * a time ({@link CompiledConditional#logDensityTermByTerm}), each term by the family's own
 * log-density. The two add the same terms in another order, so they agree to rounding: a relative
 * 1e-12 of the value (counts up to 100, whose summed terms stay below a few hundred: a few ulps
 * of each, Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., section 4.2), and of
 * the slope plus the terms' count. A wrong count or sum in a group is off by a whole term.
 */
class CollapsedRowsTest {

  /** seedlings with {@code centre} inside the predictor: its conditional reads all 40 trays. */
  private static BoundModel seedlings(boolean oneBitOff) {
    String[] lines = DemoData.seedlings().split("\n");
    StringBuilder csv = new StringBuilder(lines[0]).append(",weight\n");
    for (int i = 1; i < lines.length; i++) {
      // tray 9 is on bench 2 with trays 2, 17, 25, 33: one bit more on its weight
      double weight = oneBitOff && i == 10 ? Math.nextUp(1.0) : 1.0;
      csv.append(lines[i]).append(',').append(weight).append('\n');
    }
    return bind(String.join("\n",
        "index bench = 1 .. 8",
        "index tray",
        "data  planted[tray], bench_of[tray], weight[tray]",
        "data  survived[tray] ~ binomial(trials = planted[tray],"
            + " logit_p = centre + weight[tray] * effect[bench_of[tray]])",
        "param centre ~ normal(mean = 0, sd = 2.5)",
        "param spread ~ half-normal(sd = 1)",
        "param effect[bench] ~ normal(mean = 0, sd = spread)"),
        table("seedlings.csv", csv.toString().split("\n")));
  }

  private static CompiledConditional conditional(BoundModel model, String label) {
    return (CompiledConditional) model.conditional(model.unknown(label).index());
  }

  @Test
  void seedlingsFortyBinomialRowsAreEightGroups() {
    CompiledConditional centre = conditional(seedlings(false), "centre");
    assertEquals(41, centre.termCount(), "own prior and 40 trays");
    assertEquals(1 + 8, centre.evaluationsPerCall(), "own prior and one group a bench");
    // each effect's conditional: its prior and its five trays, one group
    CompiledConditional effect = conditional(seedlings(false), "effect[3]");
    assertEquals(1 + 5, effect.termCount());
    assertEquals(1 + 1, effect.evaluationsPerCall());
  }

  /**
   * Issue 14: once its run collapses, a conditional keeps of the run only each group's first row
   * (its linear predictor) and the rows alone, and reads them in the same order as with every row
   * kept, so its values are the same bits.
   */
  @Test
  void aCollapsedRunKeepsItsGroupsRowsOnlyAndGivesTheSameBits() {
    BoundModel model = seedlings(true);
    CompiledConditional centre = conditional(model, "centre");
    CompiledConditional everyRow = centre.expanded();
    assertEquals(1 + 9, centre.heldRows(), "own prior and a row a group");
    assertEquals(1 + 40, everyRow.heldRows(), "own prior and every tray");
    double[] state = model.initialState();
    double[] slope = new double[1];
    double[] reference = new double[1];
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(14L);
    for (int draw = 0; draw < 200; draw++) {
      for (int b = 1; b <= 8; b++) {
        state[model.unknown("effect[" + b + "]").index()] = 2 * random.nextGaussian();
      }
      double u = 3 * random.nextGaussian();
      double value = centre.logDensity(u, state, slope);
      double expected = everyRow.logDensity(u, state, reference);
      assertEquals(Double.doubleToRawLongBits(expected), Double.doubleToRawLongBits(value),
          "value at u = " + u);
      assertEquals(Double.doubleToRawLongBits(reference[0]), Double.doubleToRawLongBits(slope[0]),
          "slope at u = " + u);
    }
  }

  @Test
  void aRowDifferingInOneBitIsNotMerged() {
    CompiledConditional centre = conditional(seedlings(true), "centre");
    // bench 2's tray with weight 1 + 2^-52 is alone; its four others still one group
    assertEquals(1 + 8 + 1, centre.evaluationsPerCall());
  }

  @Test
  void binomialGroupsEqualTheRowsOneByOneIncludingFarTails() {
    BoundModel model = seedlings(true);
    CompiledConditional centre = conditional(model, "centre");
    double[] state = model.initialState();
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(20261203L);
    int compared = 0;
    for (int draw = 0; draw < 200; draw++) {
      for (int b = 1; b <= 8; b++) {
        state[model.unknown("effect[" + b + "]").index()] = 2 * random.nextGaussian();
      }
      for (double u : new double[] {-1e4, -700, -40, random.nextGaussian() * 3, 40, 700, 1e4}) {
        compared += agree(centre, u, state);
      }
    }
    assertEquals(1400, compared);
  }

  @Test
  void bernoulliAndPoissonGroupsEqualTheRowsOneByOne() {
    StringBuilder ys = new StringBuilder();
    StringBuilder counts = new StringBuilder();
    StringBuilder xs = new StringBuilder();
    RandomGenerator data = RandomGeneratorFactory.of("L64X128MixRandom").create(7L);
    for (int i = 0; i < 60; i++) {
      String sep = i == 0 ? "" : ", ";
      ys.append(sep).append(data.nextInt(2));
      counts.append(sep).append(data.nextInt(30));
      // doses in tenths 0 .. 0.3, as grown clinics: many rows share one
      xs.append(sep).append(data.nextInt(4) / 10.0);
    }
    BoundModel model = bind(String.join("\n",
        "index i = 1 .. 60",
        "data x[i] = [" + xs + "]",
        "param a ~ normal(mean = 0, sd = 2)",
        "param b ~ normal(mean = 0, sd = 2)",
        "data y[i] = [" + ys + "] ~ bernoulli(logit_p = a + b * x[i])",
        "data n[i] = [" + counts + "] ~ poisson(log_rate = a - b * x[i])"));
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(11L);
    double[] state = model.initialState();
    for (String label : new String[] {"a", "b"}) {
      CompiledConditional c = conditional(model, label);
      assertEquals(1 + 4 + 4, c.evaluationsPerCall(), label + ": one group a dose a statement");
      int other = model.unknown(label.equals("a") ? "b" : "a").index();
      for (int draw = 0; draw < 200; draw++) {
        state[other] = 3 * random.nextGaussian();
        for (double u : new double[] {-1e4, -700, random.nextGaussian() * 5, 700, 1e4}) {
          agree(c, u, state);
        }
      }
    }
  }

  @Test
  void aRunWithNoRepeatsStaysBitForBit() {
    BoundModel model = bind(String.join("\n",
        "index i = 1 .. 8",
        "data x[i] = [-2, -1, -0.5, 0, 0.5, 1, 1.5, 2]",
        "data y[i] = [0, 1, 0, 3, 2, 7, 12, 40] ~ poisson(log_rate = a + b * x[i])",
        "data z[i] = [0, 1, 0, 1, 1, 0, 1, 1] ~ bernoulli(logit_p = a + b * x[i])",
        "param a ~ normal(mean = 0, sd = 2)",
        "param b ~ normal(mean = 0, sd = 2)"));
    CompiledConditional a = conditional(model, "a");
    assertEquals(a.termCount(), a.evaluationsPerCall(), "nothing collapsed");
    assertTrue(a.summedInRuns());
    double[] state = model.initialState();
    double[] slope = new double[1];
    double[] reference = new double[1];
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(3L);
    for (int draw = 0; draw < 100; draw++) {
      state[model.unknown("b").index()] = random.nextGaussian();
      double u = 4 * random.nextGaussian();
      double value = a.logDensity(u, state, slope);
      double alone = a.logDensityTermByTerm(u, state, reference);
      assertEquals(Double.doubleToRawLongBits(alone), Double.doubleToRawLongBits(value));
      assertEquals(Double.doubleToRawLongBits(reference[0]), Double.doubleToRawLongBits(slope[0]));
    }
  }

  /**
   * Groups of one slope form share {@code exp(b x)} (one class per dose here) and take {@code
   * exp(a)} once per draw: the factored exponential must agree with the rows one by one as the
   * unfactored one does, also where an intercept or {@code b x} lies beyond 700 (evaluated
   * unfactored then) and right at it.
   */
  @Test
  void groupsOfOneSlopeFactorTheirExponential() {
    StringBuilder ys = new StringBuilder();
    StringBuilder sites = new StringBuilder();
    StringBuilder doses = new StringBuilder();
    RandomGenerator data = RandomGeneratorFactory.of("L64X128MixRandom").create(5L);
    for (int i = 0; i < 300; i++) {
      String sep = i == 0 ? "" : ", ";
      ys.append(sep).append(data.nextInt(2));
      sites.append(sep).append(1 + data.nextInt(10));
      doses.append(sep).append(data.nextInt(3) * 0.5);
    }
    BoundModel model = bind(String.join("\n",
        "index site = 1 .. 10",
        "index i = 1 .. 300",
        "data site_of[i] = [" + sites + "]",
        "data dose[i] = [" + doses + "]",
        "param slope ~ normal(mean = 0, sd = 2)",
        "param effect[site] ~ normal(mean = 0, sd = 2)",
        "data y[i] = [" + ys + "] ~ bernoulli(logit_p = effect[site_of[i]] + slope * dose[i])"));
    CompiledConditional slope = conditional(model, "slope");
    assertEquals(1 + 30, slope.evaluationsPerCall(), "own prior, one group a (site, dose)");
    assertEquals(3, slope.slopeClasses(), "one class a dose");
    CompiledConditional effect = conditional(model, "effect[4]");
    assertEquals(1, effect.slopeClasses(), "every row's coefficient of effect[4] is 1");
    double[] state = model.initialState();
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(13L);
    int compared = 0;
    for (int draw = 0; draw < 100; draw++) {
      double scale = draw % 4 == 3 ? 800 : draw % 4 == 2 ? 100 : 3;
      for (int k = 1; k <= 10; k++) {
        state[model.unknown("effect[" + k + "]").index()] = scale * random.nextGaussian();
      }
      state[model.unknown("slope").index()] = 3 * random.nextGaussian();
      for (double u : new double[] {random.nextGaussian() * 4, 700, 1400, -1400.5, 1e4,
          random.nextGaussian() * 600}) {
        compared += agree(slope, u, state);
        compared += agree(effect, u, state);
      }
    }
    assertEquals(1200, compared);
  }

  /** Value and slope of {@code c} at {@code u} against its terms one by one; returns 1. */
  private static int agree(CompiledConditional c, double u, double[] state) {
    double[] slope = new double[1];
    double[] reference = new double[1];
    double value = c.logDensity(u, state, slope);
    double alone = c.logDensityTermByTerm(u, state, reference);
    String at = c.unknown().label() + " at u = " + u;
    assertTrue(c.evaluationsPerCall() < c.termCount(), at + ": nothing collapsed");
    if (alone == Double.NEGATIVE_INFINITY) {
      assertEquals(alone, value, at);
      return 1;
    }
    assertTrue(Double.isFinite(alone), at + ": " + alone);
    assertEquals(alone, value, 1e-12 * Math.abs(alone), () -> "value of " + at);
    assertEquals(reference[0], slope[0], 1e-12 * (Math.abs(reference[0]) + c.termCount()),
        () -> "slope of " + at);
    return 1;
  }
}

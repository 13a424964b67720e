package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.hullbound.model.TestModels.table;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * A compiled conditional works the parts of its terms that do not move with its unknown out once
 * per draw and keeps them while the other unknowns keep their values ({@link CompiledConditional}).
 * Specification: after many sweeps, in which every unknown moves in turn as a Gibbs sampler moves
 * it, every evaluation equals the same conditional evaluated from scratch (every part a compiled
 * tree, nothing kept) in value and slope, to rounding.
 *
 * <p>Tolerance: the two sum the same terms but may group a linear predictor's parts differently
 * ({@code (a + c) + b x} against {@code a + b x + c}), a few units in the last place per term;
 * summed over at most 1,201 terms of magnitude below about 10^3 that stays below 10^-9 of {@code
 * 1 + |value| + terms} (rounding error of a sum grows at most linearly with its length: Higham,
 * Accuracy and Stability of Numerical Algorithms, 2nd ed., section 4.2). A stale part (a cache
 * that missed a change of another unknown) is off by the change itself, far beyond it.
 *
 * <p>Runs of like observation terms summed by one loop of their family ({@link
 * org.hullbound.model.family.AffineRows}: every Bernoulli and binomial term of {@code clinics} and
 * {@code seedlings}, the Poisson terms of a log-linear regression) equal, bit for bit, the same kept parts evaluated a term at a time ({@link
 * CompiledConditional#logDensityTermByTerm}): the loop changes no seeded draw. Where a run's rows
 * share one linear predictor and are summed as groups by their sufficient statistics (seedlings'
 * trays of one bench), the same holds within a relative 1e-12 (the sums' order differs).
 *
 * <p>Terms grouped by shape (one evaluator per shape of a statement's rows, their numbers in
 * primitive columns read by row) equal, bit for bit in value and slope, the same conditional
 * compiled with one evaluator a term (its workspace holding each term's parts), evaluated a term
 * at a time: grouping changes no seeded draw either.
 */
class CheapEvaluationTest {

  private static final int SWEEPS = 200;

  static Stream<Arguments> models() {
    return Stream.of(
        Arguments.of("clinics (logistic, random effects, log-scale spread)",
            bind(demoModel("clinics"), table("clinics.csv", DemoData.clinics().split("\n")))),
        Arguments.of("seedlings (binomial with data trials)",
            bind(demoModel("seedlings"), table("seedlings.csv", DemoData.seedlings().split("\n")))),
        Arguments.of("sensors (student-t, location affine in two unknowns)",
            bind(demoModel("sensors"), table("sensors.csv", DemoData.sensors().split("\n")))),
        Arguments.of("poisson regression on the log scale, counts from 0 to 40",
            bind(String.join("\n",
                "index i = 1 .. 8",
                "data x[i] = [-2, -1, -0.5, 0, 0.5, 1, 1.5, 2]",
                "data y[i] = [0, 1, 0, 3, 2, 7, 12, 40] ~ poisson(log_rate = a + b * x[i])",
                "param a ~ normal(mean = 0, sd = 2)",
                "param b ~ normal(mean = 0, sd = 2)"))),
        Arguments.of("parts that are not affine, a moving truncation normaliser, a monomial",
            bind(String.join("\n",
                "index i = 1 .. 5",
                "data x[i] = [0.5, 1.0, 1.5, 2.0, 2.5]",
                "data w[i] = [1, 2, 3, 4, 5]",
                "param a ~ normal(mean = 0, sd = 1)",
                "param b ~ normal(mean = 0, sd = 1)",
                "param s ~ gamma(shape = 2, rate = 1)",
                "data y[i] = [1.2, 0.7, 2.9, 3.3, 1.1]"
                    + " ~ normal(mean = exp(a) + b * x[i] / 2, sd = s * sqrt(w[i]))"
                    + " within -10 .. 10",
                "param z ~ normal(mean = a * b, sd = 1 + s ^ 2)"))));
  }

  private static String demoModel(String name) {
    try {
      return Files.readString(Path.of("models", name + ".hbm"));
    } catch (java.io.IOException e) {
      throw new java.io.UncheckedIOException(e);
    }
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("models")
  void everyEvaluationAfterManySweepsEqualsOneFromScratch(String name, BoundModel model) {
    // Metropolis within Gibbs driven by the kept parts (fixed seed): the state moves the way a
    // sampler moves it, one unknown at a time, so the kept parts of every conditional must follow.
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(20261202L);
    double[] state = model.initialState();
    int n = state.length;
    CompiledConditional[] conditionals = new CompiledConditional[n];
    CompiledConditional[] oneATerm = new CompiledConditional[n];
    for (int i = 0; i < n; i++) {
      conditionals[i] = (CompiledConditional) model.conditional(i);
      oneATerm[i] = model.compiled(i, false);
    }
    double[] slope = new double[1];
    double[] reference = new double[1];
    long compared = 0;
    for (int sweep = 0; sweep < SWEEPS; sweep++) {
      for (int i = 0; i < n; i++) {
        CompiledConditional c = conditionals[i];
        double u = c.toSamplingScale(state[i]);
        double proposal = u + 0.3 * random.nextGaussian();
        double current = c.logDensity(u, state, slope);
        compared += agrees(name, c, u, state, current, slope[0], reference);
        equalsOneEvaluatorATerm(name, oneATerm[i], u, state, current, slope[0], collapses(c));
        double next = c.logDensity(proposal, state, slope);
        compared += agrees(name, c, proposal, state, next, slope[0], reference);
        equalsOneEvaluatorATerm(name, oneATerm[i], proposal, state, next, slope[0],
            collapses(c));
        if (Math.log(random.nextDouble()) < next - current) {
          state[i] = c.toNatural(proposal);
        }
      }
    }
    assertEquals(2L * SWEEPS * n, compared, "every evaluation was compared");
    long inRuns = java.util.Arrays.stream(conditionals)
        .filter(CompiledConditional::summedInRuns).count();
    if (name.startsWith("clinics") || name.startsWith("seedlings") || name.startsWith("poisson")) {
      assertTrue(inRuns > 0, name + ": no conditional sums its terms in runs");
    }
    // Rows of one linear predictor are collapsed where they repeat (seedlings: each bench's five
    // trays), compared to a relative 1e-12; the Poisson rows, each its own x, are not (bit for bit).
    long collapsing = java.util.Arrays.stream(conditionals)
        .filter(CheapEvaluationTest::collapses).count();
    if (name.startsWith("seedlings")) {
      assertTrue(collapsing > 0, name + ": no conditional collapses its rows");
    }
    if (name.startsWith("poisson")) {
      assertEquals(0, collapsing, name + ": rows with no repeats were collapsed");
    }
    // Power: the rows of a statement share evaluators (clinics: the intercept's and the slope's
    // 1,200 rows, each effect's 30 or so, in a handful of shapes), so the grouped form was
    // exercised.
    long grouped = java.util.Arrays.stream(conditionals)
        .filter(c -> c.termCount() >= 20 && c.shapeCount() * 10 <= c.termCount()).count();
    if (name.startsWith("clinics")) {
      assertTrue(grouped > 0, name + ": no conditional groups its rows");
    }
  }

  /**
   * Asserts that {@code value} and {@code slope}, of a conditional whose terms are grouped by
   * shape, equal bit for bit those of {@code oneATerm} (the same conditional compiled with an
   * evaluator a term) evaluated a term at a time.
   */
  static void equalsOneEvaluatorATerm(String name, CompiledConditional oneATerm, double u,
      double[] state, double value, double slope, boolean collapsed) {
    double[] reference = new double[1];
    double alone = oneATerm.logDensityTermByTerm(u, state, reference);
    String at = name + ", " + oneATerm.unknown().label() + " at u = " + u;
    sameOrCollapsed(collapsed, alone, value, reference[0], slope, oneATerm.termCount(),
        "grouped against an evaluator a term: " + at);
  }

  /** Whether some of {@code c}'s rows are summed as groups of one linear predictor. */
  static boolean collapses(CompiledConditional c) {
    return c.evaluationsPerCall() < c.termCount();
  }

  /**
   * Bit for bit where nothing is collapsed; where rows of one linear predictor are summed as a
   * group ({@link CompiledConditional#evaluationsPerCall} below the terms), within a relative
   * 1e-12: the group's sums add the same terms in another order (a few ulps a term, Higham 4.2).
   */
  static void sameOrCollapsed(boolean collapsed, double expected, double value,
      double expectedSlope, double slope, int terms, String what) {
    if (!collapsed || expected == Double.NEGATIVE_INFINITY) {
      assertEquals(Double.doubleToRawLongBits(expected), Double.doubleToRawLongBits(value),
          () -> "value " + what);
      assertEquals(Double.doubleToRawLongBits(expectedSlope), Double.doubleToRawLongBits(slope),
          () -> "slope " + what);
      return;
    }
    assertEquals(expected, value, 1e-12 * Math.abs(expected), () -> "value " + what);
    assertEquals(expectedSlope, slope, 1e-12 * (Math.abs(expectedSlope) + terms),
        () -> "slope " + what);
  }

  /**
   * Asserts that {@code value} and {@code slope} of {@code c} at {@code u} equal its from-scratch
   * evaluation to the tolerance of the class comment; returns 1 (one evaluation compared).
   */
  static int agrees(String name, CompiledConditional c, double u, double[] state,
      double value, double slope, double[] reference) {
    double alone = c.logDensityTermByTerm(u, state, reference);
    String at = name + ", " + c.unknown().label() + " at u = " + u;
    sameOrCollapsed(collapses(c), alone, value, reference[0], slope, c.termCount(),
        "in runs against term by term: " + at);
    double scratch = c.logDensityFromScratch(u, state, reference);
    double scale = 1 + Math.abs(scratch) + c.termCount();
    String where = name + ", " + c.unknown().label() + " at u = " + u;
    if (scratch == Double.NEGATIVE_INFINITY) {
      assertEquals(scratch, value, where);
      return 1;
    }
    assertEquals(scratch, value, 1e-9 * scale, "value of " + where);
    assertEquals(reference[0], slope, 1e-9 * (scale + Math.abs(reference[0])), "slope of " + where);
    return 1;
  }

  /**
   * A binomial whose trials are another unknown keeps its per-row numbers (Stirling errors) for
   * one draw only: as the trials move from draw to draw, the runs still equal the terms evaluated
   * a term at a time, bit for bit, and the conditional from scratch to rounding.
   */
  @org.junit.jupiter.api.Test
  void rowsKeptPerDrawFollowTheUnknownTheyRead() {
    BoundModel model = bind(String.join("\n",
        "index nest = 1 .. 6",
        "data dose[nest] = [0.0, 0.5, 1.0, 1.5, 2.0, 2.5]",
        "param laid[nest] ~ poisson(rate = 9)",
        "param a ~ normal(mean = 0, sd = 2)",
        "param b ~ normal(mean = 0, sd = 2)",
        "data hatched[nest] = [2, 3, 1, 5, 0, 7] ~ binomial(trials = laid[nest],"
            + " logit_p = a + b * dose[nest])"));
    CompiledConditional a = (CompiledConditional) model.conditional(model.unknown("a").index());
    CompiledConditional oneATerm = model.compiled(model.unknown("a").index(), false);
    assertTrue(a.summedInRuns(), "the binomial rows of a are summed in a run");
    double[] state = model.initialState();
    double[] slope = new double[1];
    double[] other = new double[1];
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(11L);
    for (int draw = 0; draw < 200; draw++) {
      for (int nest = 1; nest <= 6; nest++) {
        state[model.unknown("laid[" + nest + "]").index()] = 7 + random.nextInt(20);
      }
      state[model.unknown("b").index()] = random.nextGaussian();
      for (double u : new double[] {-1.5, -0.2, 0.4, 2.0}) {
        double value = a.logDensity(u, state, slope);
        double alone = a.logDensityTermByTerm(u, state, other);
        assertEquals(Double.doubleToRawLongBits(alone), Double.doubleToRawLongBits(value),
            "value at draw " + draw + ", u " + u);
        assertEquals(Double.doubleToRawLongBits(other[0]), Double.doubleToRawLongBits(slope[0]),
            "slope at draw " + draw + ", u " + u);
        equalsOneEvaluatorATerm("kept per draw", oneATerm, u, state, value, slope[0], false);
        double scratch = a.logDensityFromScratch(u, state, other);
        assertEquals(scratch, value, 1e-9 * (1 + Math.abs(scratch)), "from scratch");
      }
    }
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("models")
  void aChangeOfAnyOtherUnknownIsSeenAtTheNextEvaluation(String name, BoundModel model) {
    double[] state = model.initialState();
    for (int i = 0; i < state.length; i++) {
      CompiledConditional c = (CompiledConditional) model.conditional(i);
      double u = c.toSamplingScale(state[i]);
      double before = c.logDensity(u, state, null);
      assertEquals(c.logDensityFromScratch(u, state, null), before, 1e-9 * (1 + Math.abs(before)));
      for (int j = 0; j < state.length; j++) {
        if (j == i) {
          continue;
        }
        double kept = state[j];
        state[j] = model.unknowns().get(j).scale() == org.hullbound.model.family.Scale.NATURAL
            ? kept + 0.25 : kept * 1.25;
        double scratch = c.logDensityFromScratch(u, state, null);
        double cached = c.logDensity(u, state, null);
        assertEquals(scratch, cached, 1e-9 * (1 + Math.abs(scratch)),
            name + ": " + c.unknown().label() + " after a change of "
                + model.unknowns().get(j).label());
        state[j] = kept;
      }
      assertTrue(Double.isFinite(before) || before == Double.NEGATIVE_INFINITY, name);
    }
  }
}

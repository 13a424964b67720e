package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The member lists of a blanket that follows an allocation ({@link AllocationMembers}) are kept
 * up to date as the allocation changes. Specification: over many sweeps in which the allocations
 * move (each drawn by a Metropolis step over its whole support, the other unknowns by random-walk
 * steps), every evaluation of every conditional equals the same conditional evaluated from
 * scratch, which finds its blanket from every candidate's guards at that call; and the number of
 * terms a draw evaluates is the own term and the rows the allocation currently selects, counted
 * here from the state. An allocation's conditional as the sampler gets it, its row of the
 * templates its name's allocations share ({@link AllocationRows}), equals bit for bit its
 * conditional compiled alone (evaluated term by term, as trees), in value and slope.
 *
 * <p>Tolerance as in {@link CheapEvaluationTest} (same sums, parts grouped differently; Higham,
 * Accuracy and Stability of Numerical Algorithms, 2nd ed., section 4.2). A row left in the wrong
 * list is off by that row's whole log-density term, of order 1 here, far beyond it.
 */
class AllocationMembersTest {

  private static final int SWEEPS = 150;

  /** 48 rows in three invented clusters, about 2, 6 and 11, with a covariate. */
  private static String rows() {
    RandomGenerator data = RandomGeneratorFactory.of("L64X128MixRandom").create(20261203L);
    StringBuilder y = new StringBuilder();
    StringBuilder x = new StringBuilder();
    double[] centres = {2, 6, 11};
    for (int i = 0; i < 48; i++) {
      double covariate = Math.round(10 * data.nextDouble()) / 10.0;
      double value = centres[i % 3] + 0.3 * covariate + 1.5 * data.nextGaussian();
      y.append(i == 0 ? "" : ", ").append(String.format(java.util.Locale.ROOT, "%.3f", value));
      x.append(i == 0 ? "" : ", ").append(covariate);
    }
    return "data x[i] = [" + x + "]\ndata y[i] = [" + y + "]";
  }

  static Stream<Arguments> models() {
    return Stream.of(
        Arguments.of("three components, a covariate beside the unknown index",
            (Rows) (m, state, k) -> count(48, k, r -> state[m.unknown("g[" + r + "]").index()]),
            bind(String.join("\n",
                "index i = 1 .. 48",
                "index k = 1 .. 3",
                "data  w[k] = [0.3, 0.3, 0.4]",
                "param mu[k] ~ normal(mean = 6, sd = 5)",
                "param beta ~ normal(mean = 0, sd = 1)",
                "param s ~ gamma(shape = 2, rate = 1)",
                "param g[i] ~ categorical(p = w)",
                rows() + " ~ normal(mean = mu[g[i]] + beta * x[i], sd = s)"))),
        Arguments.of("an index worked out from two allocations (1 + a[i] + b[i])",
            (Rows) (m, state, k) -> count(48, k, r -> 1 + state[m.unknown("a[" + r + "]").index()]
                + state[m.unknown("b[" + r + "]").index()]),
            bind(String.join("\n",
                "index i = 1 .. 48",
                "index k = 1 .. 3",
                "param mu[k] ~ normal(mean = 6, sd = 5)",
                "param share ~ beta(a = 2, b = 2)",
                "param a[i] ~ bernoulli(p = share)",
                "param b[i] ~ bernoulli(p = 0.5)",
                rows() + " ~ normal(mean = mu[1 + a[i] + b[i]], sd = 2)"))),
        Arguments.of("two indexes of one name read allocations: cell[r[i], c[i]]",
            (Rows) (m, state, k) -> count(48, k, r -> 10 * state[m.unknown("r[" + r + "]").index()]
                + state[m.unknown("c[" + r + "]").index()]),
            bind(String.join("\n",
                "index i = 1 .. 48",
                "index row = 1 .. 2",
                "index col = 1 .. 3",
                "data  wr[row] = [0.5, 0.5]",
                "data  wc[col] = [0.2, 0.3, 0.5]",
                "param cell[row, col] ~ normal(mean = 6, sd = 5)",
                "param r[i] ~ categorical(p = wr)",
                "param c[i] ~ categorical(p = wc)",
                rows() + " ~ normal(mean = cell[r[i], c[i]], sd = 2)"))),
        Arguments.of("a change point: every row's phase read from one change year",
            (Rows) (m, state, k) -> count(16, k, year -> year < state[m.unknown("change").index()]
                ? 1 : 2),
            bind(String.join("\n",
                "index year = 1 .. 16",
                "index phase = 1 .. 2",
                "param change ~ whole-uniform(lower = 2, upper = 16)",
                "param level[phase] ~ gamma(shape = 2, rate = 0.2)",
                "let   phase_of[year] = 2 - min(1, max(0, change - year))",
                "data  faults[year] = [9, 12, 8, 11, 10, 13, 9, 11, 4, 6, 3, 5, 4, 2, 6, 3]"
                    + " ~ poisson(rate = level[phase_of[year]])"))));
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("models")
  void everyEvaluationWhileAllocationsMoveEqualsOneFromScratch(
      String name, Rows rows, BoundModel model) {
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(20261206L);
    double[] state = model.initialState();
    int n = state.length;
    CompiledConditional[] conditionals = new CompiledConditional[n];
    ConditionalDensity[] sampled = new ConditionalDensity[n];
    boolean anyDynamic = false;
    for (int i = 0; i < n; i++) {
      sampled[i] = model.conditional(i);
      conditionals[i] = sampled[i] instanceof CompiledConditional c ? c : model.compiled(i);
      anyDynamic |= conditionals[i].dynamicBlanket();
    }
    assertTrue(anyDynamic, name + ": some blanket follows an allocation");
    double[] slope = new double[1];
    double[] reference = new double[1];
    long compared = 0;
    long moves = 0;
    long countsChecked = 0;
    long jointDifferences = 0;
    long sharedRows = 0;
    double[] sharedSlope = new double[1];
    for (int sweep = 0; sweep < SWEEPS; sweep++) {
      for (int i = 0; i < n; i++) {
        CompiledConditional c = conditionals[i];
        boolean allocation = model.allocation(i);
        double u = c.toSamplingScale(state[i]);
        double proposal;
        if (allocation) {
          double lo = c.lowerBound(state);
          double hi = c.upperBound(state);
          proposal = lo + Math.floor((hi - lo + 1) * random.nextDouble());
        } else {
          proposal = u + 0.3 * random.nextGaussian();
        }
        double current = c.logDensity(u, state, slope);
        compared += CheapEvaluationTest.agrees(name, c, u, state, current, slope[0], reference);
        if (sampled[i] != c) {
          double row = sampled[i].logDensity(u, state, sharedSlope);
          double alone = c.logDensityTermByTerm(u, state, slope);
          assertEquals(Double.doubleToRawLongBits(alone), Double.doubleToRawLongBits(row),
              name + ": shared row of " + c.unknown().label() + " at " + u);
          assertEquals(Double.doubleToRawLongBits(slope[0]),
              Double.doubleToRawLongBits(sharedSlope[0]), name + ": its slope");
          double away = c.toSamplingScale(c.upperBound(state)) - u;
          assertEquals(
              Double.doubleToRawLongBits(c.logDensityTermByTerm(u + away, state, null)),
              Double.doubleToRawLongBits(sampled[i].logDensity(u + away, state, null)),
              name + ": shared row of " + c.unknown().label() + " at " + (u + away));
          sharedRows++;
          current = c.logDensity(u, state, slope);
        }
        if (c.dynamicBlanket()) {
          // The component's element: k, or 10 row + col for cell[row, col].
          String label = c.unknown().label();
          int k = 0;
          for (String part : label.substring(label.indexOf('[') + 1, label.length() - 1)
              .split(",")) {
            k = 10 * k + Integer.parseInt(part.strip());
          }
          assertEquals(1 + rows.selecting(model, state, k), c.activeTermCount(state),
              name + ": terms a draw of " + c.unknown().label() + " evaluates");
          countsChecked++;
        }
        double next = c.logDensity(proposal, state, slope);
        compared += CheapEvaluationTest.agrees(name, c, proposal, state, next, slope[0], reference);
        jointDifferences += matchesTheJoint(name, model, c, state, u, proposal, next - current);
        if (Math.log(random.nextDouble()) < next - current) {
          moves += allocation && proposal != u ? 1 : 0;
          state[i] = c.toNatural(proposal);
        }
      }
    }
    assertEquals(2L * SWEEPS * n, compared, "every evaluation was compared");
    // Power: the allocations must actually move for the lists to be exercised (the change year,
    // one allocation for all rows, moved 37 times with this seed; the mixtures hundreds).
    assertTrue(moves >= 20, name + ": allocations moved " + moves + " times");
    assertTrue(countsChecked > 0, name);
    // Every allocation's conditional is its row of the shared templates in these models.
    assertTrue(sharedRows > 0, name + ": shared rows compared");
    assertTrue(jointDifferences > SWEEPS, name);
  }

  /**
   * The conditional's change between two points equals the joint log-density's change (plus the
   * log-Jacobian's on the sampling scale), the joint compiled apart from the conditionals from the
   * model's own terms: a check of the blanket, of its lists and of the form members are evaluated
   * in ({@link AllocationMembers#memberForm}) from outside them. Returns 1 when compared.
   */
  private static int matchesTheJoint(String name, BoundModel model, CompiledConditional c,
      double[] state, double from, double to, double change) {
    if (!Double.isFinite(change)) {
      return 0;
    }
    int i = c.unknown().index();
    double kept = state[i];
    state[i] = c.toNatural(from);
    double before = model.logDensity(state);
    state[i] = c.toNatural(to);
    double after = model.logDensity(state);
    state[i] = kept;
    double expected = after - before + logJacobian(c, to) - logJacobian(c, from);
    assertEquals(expected, change, 1e-9 * (1 + Math.abs(before) + Math.abs(after)),
        name + ": change of " + c.unknown().label() + " from " + from + " to " + to);
    return 1;
  }

  private static double logJacobian(CompiledConditional c, double u) {
    switch (c.scale()) {
      case LOG:
        return u;
      case LOGIT:
        double x = c.toNatural(u);
        return Math.log(x) + Math.log1p(-x);
      default:
        return 0;
    }
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("models")
  void aMoveOfOneAllocationAloneIsSeenAtTheNextEvaluation(
      String name, Rows rows, BoundModel model) {
    // Only the allocations move here, one at a time through every value, so that a conditional
    // must follow each move by itself (no other unknown changes and works every member out anew).
    double[] state = model.initialState();
    int moves = 0;
    for (int i = 0; i < state.length; i++) {
      if (!(model.conditional(i) instanceof CompiledConditional c) || !c.dynamicBlanket()) {
        continue;
      }
      double u = c.toSamplingScale(state[i]);
      double[] slope = new double[1];
      double[] reference = new double[1];
      for (int j = 0; j < state.length; j++) {
        if (!model.allocation(j)) {
          continue;
        }
        ConditionalDensity a = model.conditional(j);
        double kept = state[j];
        for (double v = a.lowerBound(state); v <= a.upperBound(state); v++) {
          state[j] = v;
          CheapEvaluationTest.agrees(name, c, u, state, c.logDensity(u, state, slope), slope[0], reference);
          moves++;
        }
        state[j] = kept;
      }
    }
    assertTrue(moves > 0, name);
  }

  /** The rows whose allocation selects component {@code k} at a state, worked out by hand. */
  @FunctionalInterface
  interface Rows {
    int selecting(BoundModel model, double[] state, int k);
  }

  /** How many of rows 1 .. n have component {@code k} by {@code component}. */
  private static int count(int n, int k, java.util.function.IntToDoubleFunction component) {
    int count = 0;
    for (int r = 1; r <= n; r++) {
      count += component.applyAsDouble(r) == k ? 1 : 0;
    }
    return count;
  }
}

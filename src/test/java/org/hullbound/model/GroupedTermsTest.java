package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;

/**
 * What a compiled conditional holds per row of its blanket (issue 14: {@code fit} of 23 million
 * rows within the default heap; issue 11: a mixture's sweep linear in its rows): the terms of a
 * statement that differ only in numbers share one evaluator, their numbers in primitive columns,
 * and an allocation reads its row of templates its name's allocations share.
 *
 * <p>Counted, not timed or weighed: the objects reachable from each conditional (its evaluators,
 * columns, member lists; not the bound model it reads its terms from), found by walking its
 * fields. An evaluator per term makes the count grow with the rows; grouped, it is the same at
 * 500 and at 5,000 rows. Measured with this walk: the four clinics conditionals below held
 * 17,097 objects at 500 rows and 168,972 at 5,000 with an evaluator per term (about 15 a term),
 * 396 at both once grouped; the mixture's conditionals 40,079 and 400,079 (about 80 a shell, most
 * of them an allocation's compiled conditional), 229 and 227 (two long columns shared).
 */
class GroupedTermsTest {

  @Test
  void aConditionalHoldsTheSameObjectsWhateverItsRows() {
    List<Integer> counts = new ArrayList<>();
    for (int rows : new int[] {500, 5_000}) {
      BoundModel model = TestModels.bind(TermTableTest.CLINICS, TermTableTest.rows(rows));
      double[] state = model.initialState();
      int total = 0;
      for (String label : List.of("intercept", "slope", "effect[1]", "spread")) {
        ConditionalDensity c = model.conditional(model.unknown(label).index());
        c.logDensity(c.toSamplingScale(state[c.unknown().index()]), state, new double[1]);
        total += reachable(c);
      }
      assertTrue(model.conditional(model.unknown("intercept").index()).termCount() > rows);
      counts.add(total);
    }
    assertEquals(counts.get(0), counts.get(1), "objects held at 500 and at 5,000 rows");
  }

  @Test
  void aMixtureHoldsTheSameObjectsWhateverItsRows() {
    List<Integer> counts = new ArrayList<>();
    for (int shells : new int[] {500, 5_000}) {
      StringBuilder values = new StringBuilder();
      for (int i = 0; i < shells; i++) {
        // invented lengths, two clusters about 30 and 50 (common practice for a test mixture)
        values.append(i == 0 ? "" : ", ").append(i % 5 < 2 ? 28 + i % 7 : 47 + i % 9);
      }
      BoundModel model = TestModels.bind(String.join("\n",
          "index shell = 1 .. " + shells,
          "index cohort = 1 .. 2",
          "data  share[cohort] = [0.4, 0.6]",
          "param centre[cohort] ~ normal(mean = 40, sd = 20)",
          "param cohort_of[shell] ~ categorical(p = share)",
          "data  length[shell] = [" + values + "] ~ normal(mean = centre[cohort_of[shell]],"
              + " sd = 4)"));
      double[] state = model.initialState();
      Set<Object> seen = newSet();
      int total = 0;
      for (Unknown u : model.unknowns()) {
        ConditionalDensity c = model.conditional(u.index());
        c.logDensity(c.toSamplingScale(state[u.index()]), state, null);
        // every allocation's view names its row of one shared form: walked once, counted once
        total += reachable(c, seen) - (u.label().startsWith("cohort_of[") ? 1 : 0);
      }
      counts.add(total);
    }
    // Not more at 5,000: columns of 1,024 rows or more equal between conditionals are one array
    // (RowColumn.shared), walked once here.
    assertTrue(counts.get(1) <= counts.get(0),
        "objects held at 500 and at 5,000 shells: " + counts);
  }

  private static Set<Object> newSet() {
    return ReachableObjects.seen();
  }

  private static int reachable(Object root) {
    return reachable(root, newSet());
  }

  /**
   * How many of the project's objects and arrays not in {@code seen} are reachable from {@code
   * root} ({@link ReachableObjects}), the bound model and the JDK's objects (a thread-local's map)
   * neither counted nor entered; adds them to {@code seen}.
   */
  private static int reachable(Object root, Set<Object> seen) {
    return ReachableObjects.count(root,
        o -> o.getClass().isArray() || o.getClass().getName().startsWith("org.hullbound."), false,
        o -> o instanceof BoundModel, seen);
  }
}

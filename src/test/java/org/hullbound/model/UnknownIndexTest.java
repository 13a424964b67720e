package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.junit.jupiter.api.Test;

/**
 * Unknowns as indices: an index proved inside its set by interval arithmetic over whole numbers,
 * and the conditional of a component whose blanket is the set of observations currently assigned
 * to it. The reference for the blanket is the same model with the allocation given as data (a
 * fixed-allocation model): the two conditionals must differ by a constant only, at every
 * allocation tried.
 */
class UnknownIndexTest {

  private static final double[] LENGTHS = {0.3, 1.2, 2.9, 1.8, 4.6, 5.3, 3.6, 6.1, 2.4, 4.9};

  private static final String MIXTURE = """
      model shells
      index shell = 1 .. 10
      index cohort = 1 .. 2
      data  share[cohort] = [0.4, 0.6]
      param centre[cohort] ~ logistic(location = 3, scale = 2)
      param cohort_of[shell] ~ categorical(p = share)
      data  length[shell] = [0.3, 1.2, 2.9, 1.8, 4.6, 5.3, 3.6, 6.1, 2.4, 4.9] ~ normal(
                mean = centre[cohort_of[shell]], sd = 1)
      """;

  private static BoundModel bind(String text) {
    return BoundModel.bind(Parser.parse(SourceText.of("m.hbm", text)), List.of());
  }

  /** The same model with the allocation {@code cohorts} given as data. */
  private static BoundModel fixed(int[] cohorts) {
    StringBuilder list = new StringBuilder();
    for (int i = 0; i < cohorts.length; i++) {
      list.append(i == 0 ? "" : ", ").append(cohorts[i]);
    }
    return bind(MIXTURE.replace("param cohort_of[shell] ~ categorical(p = share)",
        "data  cohort_of[shell] = [" + list + "]"));
  }

  @Test
  void aComponentsConditionalIsTheFixedAllocationConditionalUpToAConstant() {
    BoundModel mixture = bind(MIXTURE);
    int[][] allocations = {
      {1, 1, 1, 1, 2, 2, 2, 2, 1, 2}, {2, 2, 2, 2, 2, 2, 2, 2, 2, 2}, {1, 2, 1, 2, 1, 2, 1, 2, 1, 2}
    };
    for (int[] allocation : allocations) {
      BoundModel reference = fixed(allocation);
      double[] state = mixture.initialState();
      double[] referenceState = reference.initialState();
      for (int i = 0; i < allocation.length; i++) {
        state[mixture.unknown("cohort_of[" + (i + 1) + "]").index()] = allocation[i];
      }
      for (int k = 1; k <= 2; k++) {
        int other = 3 - k;
        state[mixture.unknown("centre[" + other + "]").index()] = 0.7 * other;
        referenceState[reference.unknown("centre[" + other + "]").index()] = 0.7 * other;
        ConditionalDensity dynamic =
            mixture.conditional(mixture.unknown("centre[" + k + "]").index());
        ConditionalDensity fixed =
            reference.conditional(reference.unknown("centre[" + k + "]").index());
        double[] slope = new double[1];
        double[] referenceSlope = new double[1];
        double offset = Double.NaN;
        for (double u = -4; u <= 9; u += 0.5) {
          double value = dynamic.logDensity(u, state, slope);
          double expected = fixed.logDensity(u, referenceState, referenceSlope);
          if (Double.isNaN(offset)) {
            offset = value - expected;
          }
          assertEquals(expected + offset, value, 1e-9 * (1 + Math.abs(expected)),
              "centre[" + k + "] at " + u);
          assertEquals(referenceSlope[0], slope[0], 1e-9 * (1 + Math.abs(referenceSlope[0])));
        }
        int assigned = 0;
        for (int c : allocation) {
          assigned += c == k ? 1 : 0;
        }
        // The own prior and the observations assigned to k: the candidates of the other
        // component are left out of the draw.
        assertEquals(1 + assigned,
            ((CompiledConditional) dynamic).activeTermCount(state), "centre[" + k + "]");
        assertEquals(1 + LENGTHS.length, dynamic.termCount());
        assertTrue(((CompiledConditional) dynamic).dynamicBlanket());
      }
    }
  }

  @Test
  void theFromScratchPathLeavesOutTheSameTerms() {
    BoundModel mixture = bind(MIXTURE);
    double[] state = mixture.initialState();
    for (int i = 1; i <= LENGTHS.length; i++) {
      state[mixture.unknown("cohort_of[" + i + "]").index()] = i % 2 + 1;
    }
    CompiledConditional c =
        (CompiledConditional) mixture.conditional(mixture.unknown("centre[1]").index());
    for (double u = -3; u <= 8; u += 1) {
      double[] slope = new double[1];
      double[] scratchSlope = new double[1];
      double cheap = c.logDensity(u, state, slope);
      assertEquals(c.logDensityFromScratch(u, state, scratchSlope), cheap,
          1e-12 * (1 + Math.abs(cheap)));
      assertEquals(scratchSlope[0], slope[0], 1e-12 * (1 + Math.abs(slope[0])));
    }
  }

  @Test
  void anAllocationsConditionalReadsTheSelectedComponentOnly() {
    BoundModel mixture = bind(MIXTURE);
    double[] state = mixture.initialState();
    state[mixture.unknown("centre[1]").index()] = 1.0;
    state[mixture.unknown("centre[2]").index()] = 5.0;
    ConditionalDensity c = mixture.conditional(mixture.unknown("cohort_of[3]").index());
    // log share[k] + log N(2.9; centre[k], 1), from the closed form of the normal density
    // (common practice), as the difference between k = 2 and k = 1.
    double expected = Math.log(0.6 / 0.4)
        - 0.5 * ((2.9 - 5.0) * (2.9 - 5.0) - (2.9 - 1.0) * (2.9 - 1.0));
    assertEquals(expected, c.logDensity(2, state, null) - c.logDensity(1, state, null), 1e-12);
    assertInstanceOf(Update.Discrete.class, mixture.update(mixture.unknown("cohort_of[3]")
        .index()));
  }

  @Test
  void aChangePhaseIsProvedInsideItsSetByIntervalArithmetic() {
    // 2 - min(1, max(0, change - year)) with change in 2 .. 16: for years 5 and 15 it takes
    // 1 .. 2; for year 1 only 1 (the change is never before year 2); from year 16 on only 2.
    Formula change = new Formula.Slot(0);
    for (int[] yearAndRange : new int[][] {{5, 1, 2}, {15, 1, 2}, {1, 1, 1}, {16, 2, 2}, {20, 2, 2}}) {
      Formula early = Formulas.apply(Op.MIN, List.of(Formula.constant(1),
          Formulas.apply(Op.MAX, List.of(Formula.constant(0),
              Formulas.apply(Op.SUBTRACT,
                  List.of(change, Formula.constant(yearAndRange[0])))))));
      Formula phase = Formulas.apply(Op.SUBTRACT, List.of(Formula.constant(2), early));
      UnknownIndex.Proof proof = UnknownIndex.range(phase,
          s -> new UnknownIndex.Range(2, 16), s -> "change");
      assertNull(proof.problem());
      assertEquals(new UnknownIndex.Range(yearAndRange[1], yearAndRange[2]), proof.range(),
          "year " + yearAndRange[0]);
    }
  }

  @Test
  void aProductAndANegationTakeTheirRangeAtTheCorners() {
    Formula g = new Formula.Slot(0);
    Formula product = Formulas.apply(Op.MULTIPLY, List.of(
        Formulas.apply(Op.NEGATE, List.of(g)), Formulas.apply(Op.ADD, List.of(g,
            Formula.constant(-3)))));
    // -g * (g - 3) for g in -1 .. 2: -g in -2 .. 1 and g - 3 in -4 .. -1, whose corner products
    // 8, 2, -4, -1 give -4 .. 8 (a bound: the true range, -4 .. 2, lies inside it).
    UnknownIndex.Proof proof =
        UnknownIndex.range(product, s -> new UnknownIndex.Range(-1, 2), s -> "g");
    assertEquals(new UnknownIndex.Range(-4, 8), proof.range());
    assertTrue(UnknownIndex.range(Formulas.apply(Op.DIVIDE, List.of(g, Formula.constant(2))),
        s -> new UnknownIndex.Range(1, 2), s -> "g").problem().contains("'/'"));
    assertTrue(UnknownIndex.range(Formulas.apply(Op.ADD, List.of(g, Formula.constant(0.5))),
        s -> new UnknownIndex.Range(1, 2), s -> "g").problem().contains("0.5"));
    assertTrue(UnknownIndex.range(g, s -> null, s -> "spread").problem().contains("'spread'"));
  }

  @Test
  void checkSaysWhichBlanketsFollowTheAllocation() {
    BoundModel mixture = bind(MIXTURE);
    assertTrue(mixture.dynamicBlanket(mixture.unknown("centre[1]").index()));
    assertTrue(!mixture.dynamicBlanket(mixture.unknown("cohort_of[1]").index()));
  }
}

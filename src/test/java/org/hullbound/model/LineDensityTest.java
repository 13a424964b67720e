package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.Supplier;
import org.junit.jupiter.api.Test;

/**
 * A line density is compiled when it is first evaluated, not when the move is found: {@code check}
 * states a move and its proof and never draws, and a line through millions of rows compiles to
 * hundreds of bytes a row (issue 14). Its terms are made once more for the compilation; that
 * the compiled line agrees with the joint density is {@link MovePatternsTest}'s (an independent
 * evaluation of every term).
 */
class LineDensityTest {
  private static final String MODEL = """
      index row = 1 .. 3
      data x[row] = [0.5, 1.5, 2.5]
      data y[row] = [1.0, 2.0, 2.5] ~ normal(mean = a + b * x[row], sd = 1)
      param a ~ normal(mean = 0, sd = 2)
      param b ~ normal(mean = 0, sd = 2)
      """;

  @Test
  void theMovedTermsAreMadeForTheCompilationOnlyAtTheFirstEvaluation() {
    BoundModel model = TestModels.bind(MODEL);
    List<Term> terms = model.terms();
    AtomicInteger made = new AtomicInteger();
    Supplier<List<Term>> moved = () -> {
      made.incrementAndGet();
      return terms;
    };
    LineDensity line = new LineDensity(2, new int[] {0, 1}, new double[] {1, -1},
        LineDensity.Geometry.FIXED_TRANSLATION, terms.size(), moved, true);
    assertEquals(terms.size(), line.termCount());
    assertEquals(0, made.get(), "finding and stating a move compiles nothing");
    double[] frame = new double[line.frameLength()];
    line.load(new double[] {0.3, 0.7}, frame);
    double first = line.logDensity(0.25, frame, null);
    double second = line.logDensity(0.25, frame, null);
    assertEquals(1, made.get(), "compiled once, at the first evaluation");
    assertEquals(first, second);
    assertFalse(Double.isNaN(first));
  }
}

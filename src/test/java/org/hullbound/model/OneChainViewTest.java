package org.hullbound.model;

import static org.hullbound.model.TestModels.bind;
import static org.hullbound.model.TestModels.table;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotSame;
import static org.junit.jupiter.api.Assertions.assertSame;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.junit.jupiter.api.Test;

/**
 * A conditional's view for one chain ({@link ConditionalDensity#forOneChain}) keeps its own
 * workspace: two chains' views used in turn at different states each give, bit for bit, what the
 * shared conditional gives at that state, so that neither reads the other's prepared parts
 * (issue 12: a sweep of grown {@code clinics} draws 3,600 small conditionals, each once, and the
 * thread's workspace lookup was a noticeable part of each draw).
 */
class OneChainViewTest {

  private static BoundModel clinics() throws IOException {
    return bind(Files.readString(Path.of("models", "clinics.hbm")),
        table("clinics.csv", DemoData.clinics().split("\n")));
  }

  @Test
  void twoChainsViewsInTurnEqualTheSharedConditional() throws IOException {
    BoundModel model = clinics();
    int effect = model.unknown("effect[7]").index();
    ConditionalDensity shared = model.conditional(effect);
    ConditionalDensity first = shared.forOneChain();
    ConditionalDensity second = shared.forOneChain();
    assertNotSame(shared, first);
    assertNotSame(first, second);
    double[] one = model.initialState();
    double[] other = model.initialState();
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(17L);
    double[] slope = new double[1];
    double[] expectedSlope = new double[1];
    for (int draw = 0; draw < 50; draw++) {
      for (double[] state : new double[][] {one, other}) {
        for (String name : new String[] {"intercept", "slope", "spread"}) {
          int i = model.unknown(name).index();
          state[i] = name.equals("spread") ? Math.exp(random.nextGaussian())
              : random.nextGaussian();
        }
      }
      // each view prepares at its own state, then both are evaluated again in turn
      for (int call = 0; call < 3; call++) {
        double u = random.nextGaussian() * 2;
        ConditionalDensity view = call % 2 == 0 ? first : second;
        double[] state = call % 2 == 0 ? one : other;
        double expected = shared.logDensity(u, state, expectedSlope);
        double value = view.logDensity(u, state, slope);
        assertEquals(Double.doubleToRawLongBits(expected), Double.doubleToRawLongBits(value),
            "value at draw " + draw);
        assertEquals(Double.doubleToRawLongBits(expectedSlope[0]),
            Double.doubleToRawLongBits(slope[0]), "slope at draw " + draw);
      }
    }
    assertEquals(shared.termCount(), first.termCount());
    assertEquals(shared.lowerBound(one), first.lowerBound(one));
    assertEquals(shared.toNatural(0.3), first.toNatural(0.3));
  }

  @Test
  void aLargeConditionalKeepsTheThreadsWorkspace() throws IOException {
    BoundModel model = clinics();
    ConditionalDensity intercept = model.conditional(model.unknown("intercept").index());
    assertEquals(1201, intercept.termCount(), "own prior and 1,200 patients");
    assertSame(intercept, intercept.forOneChain());
  }
}

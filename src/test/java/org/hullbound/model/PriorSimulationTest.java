package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourcePosition;
import org.junit.jupiter.api.Test;

/**
 * Ancestral draws from a model's prior and simulated observations, against distributions worked
 * out by hand: a normal whose mean has a normal prior is marginally normal with the variances
 * added (common practice: the sum of independent normals), KS test at level 1e-5 with 6500 draws
 * and a fixed seed (critical distance 2.47 / sqrt(6500) = 0.031, as 4000 draws at 0.001 had).
 */
final class PriorSimulationTest {
  private static BoundModel bind(String text, List<DataTable> data) {
    return BoundModel.bind(Parser.parse("m.hbm", text), data);
  }

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  @Test
  void hierarchicalPriorsAreDrawnParentsFirst() {
    // x is declared before mu, so the draw order must follow the dependency, not the text.
    BoundModel model = bind(
        "param x ~ normal(mean = mu, sd = 1)\nparam mu ~ normal(mean = 3, sd = 2)\n", List.of());
    PriorSimulation simulation = PriorSimulation.of(model);
    RandomGenerator rng = rng(1);
    double[] x = new double[6500];
    double[] mu = new double[6500];
    for (int i = 0; i < x.length; i++) {
      double[] state = simulation.drawUnknowns(rng);
      x[i] = state[model.unknown("x").index()];
      mu[i] = state[model.unknown("mu").index()];
    }
    KolmogorovSmirnovTest ks = new KolmogorovSmirnovTest();
    assertTrue(ks.kolmogorovSmirnovTest(new NormalDistribution(3, 2), mu) > 1e-5);
    assertTrue(ks.kolmogorovSmirnovTest(new NormalDistribution(3, Math.sqrt(5)), x) > 1e-5);
  }

  @Test
  void observationsAreSimulatedWithTheirCellsAndCovariates() {
    DataTable table = DataTable.of("d.csv", List.of("exposure", "count"),
        List.of(List.of("1", "4"), List.of("10", "NA"), List.of("100", "70")));
    BoundModel model = bind(
        "index unit\ndata exposure[unit]\ndata count[unit] ~ poisson(rate = exposure[unit] * r)\n"
            + "param r ~ gamma(shape = 2, rate = 4)\n",
        List.of(table));
    PriorSimulation simulation = PriorSimulation.of(model);
    double[] state = simulation.drawUnknowns(rng(2));
    assertEquals(List.of("r", "count[2]"), model.unknowns().stream().map(Unknown::label).toList());
    assertEquals(2, simulation.observedCount(), "the missing count is an unknown, not simulated data");
    List<PriorSimulation.SimulatedValue> values = simulation.simulateObservations(state, rng(3));
    assertEquals("count[1]", values.get(0).label());
    assertEquals(new SourcePosition("d.csv", 2, 2), values.get(0).origin());
    assertEquals(new SourcePosition("d.csv", 4, 2), values.get(1).origin());
    // count[3] ~ poisson(100 r): chi-square-free check of the mean over many simulations.
    state[0] = 0.5;
    double total = 0;
    RandomGenerator rng = rng(4);
    for (int i = 0; i < 2000; i++) {
      double y = simulation.simulateObservations(state, rng).get(1).value();
      assertEquals(Math.rint(y), y);
      total += y;
    }
    // Mean of 2000 Poisson(50) draws: sd of the average is sqrt(50 / 2000) = 0.16; 5 sd = 0.8.
    assertEquals(new PoissonDistribution(50).getNumericalMean(), total / 2000, 0.8);
  }

  @Test
  void truncatedPriorsAreDrawnInsideTheirBounds() {
    BoundModel model = bind("param z ~ normal(mean = 0, sd = 1) within 37 .. inf\n", List.of());
    PriorSimulation simulation = PriorSimulation.of(model);
    RandomGenerator rng = rng(5);
    for (int i = 0; i < 200; i++) {
      double z = simulation.drawUnknowns(rng)[0];
      assertTrue(z >= 37 && z < 40, "z = " + z);
    }
  }

  @Test
  void invalidDrawnArgumentsAreReportedWithTheTerm() {
    BoundModel model = bind("param s ~ uniform(lower = -1, upper = 1)\nparam x ~ normal(mean = 0, sd = s)\n", List.of());
    PriorSimulation simulation = PriorSimulation.of(model);
    RandomGenerator rng = rng(6);
    SimulationException failure =
        assertThrows(SimulationException.class, () -> {
          for (int i = 0; i < 100; i++) {
            simulation.drawUnknowns(rng);
          }
        });
    assertTrue(failure.getMessage().contains("'x'") && failure.getMessage().contains("sd"), failure.getMessage());
    assertThrows(IllegalArgumentException.class, () -> simulation.simulateObservations(new double[5], rng));
  }
}

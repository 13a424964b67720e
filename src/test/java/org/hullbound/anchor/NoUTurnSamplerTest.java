package org.hullbound.anchor;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.random.RandomGenerator;
import org.hullbound.gibbs.ChainSeeds;
import org.junit.jupiter.api.Test;

/** The No-U-Turn sampler's arguments, reproducibility, warm-up schedule and edges. */
class NoUTurnSamplerTest {
  /** A normal with sds 1 and 10 (the mass matrix should learn variances near 1 and 100). */
  private static final Target WIDE = new Target() {
    @Override
    public int dimension() {
      return 2;
    }

    @Override
    public double logDensity(double[] position, double[] gradient) {
      gradient[0] = -position[0];
      gradient[1] = -position[1] / 100;
      return -0.5 * position[0] * position[0] - 0.5 * position[1] * position[1] / 100;
    }
  };

  @Test
  void refusesBadArguments() {
    assertThrows(IllegalArgumentException.class, () -> new NoUTurnSampler.Settings(-1, 0.8, 10));
    assertThrows(IllegalArgumentException.class, () -> new NoUTurnSampler.Settings(10, 1, 10));
    assertThrows(IllegalArgumentException.class,
        () -> new NoUTurnSampler.Settings(10, Double.NaN, 10));
    assertThrows(IllegalArgumentException.class, () -> new NoUTurnSampler.Settings(10, 0.8, 0));
    assertThrows(IllegalArgumentException.class,
        () -> NoUTurnSampler.of(WIDE, new double[3], NoUTurnSampler.Settings.of(10)));
    assertThrows(IllegalArgumentException.class,
        () -> NoUTurnSampler.of(null, new double[2], NoUTurnSampler.Settings.of(10)));
  }

  @Test
  void refusesAStartWithoutDensity() {
    Target nowhere = new Target() {
      @Override
      public int dimension() {
        return 1;
      }

      @Override
      public double logDensity(double[] position, double[] gradient) {
        return position[0] > 0 ? -position[0] : Double.NEGATIVE_INFINITY;
      }
    };
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> NoUTurnSampler.of(nowhere, new double[] {-1}, NoUTurnSampler.Settings.of(10)));
    assertTrue(e.getMessage().contains("finite log-density"), e.getMessage());
  }

  @Test
  void sameSeedSameChain() {
    double[] first = run(7).position();
    double[] second = run(7).position();
    assertArrayEquals(first, second);
  }

  @Test
  void warmUpLearnsTheVariancesAndStopsAdapting() {
    NoUTurnSampler sampler = run(11);
    double[] variances = sampler.inverseMass();
    // the last window holds 500 draws of N(0, 1) and N(0, 100): sd of a variance estimate about
    // var sqrt(2 / ess); the bounds allow a factor 2 (not a statistical check)
    assertTrue(variances[0] > 0.5 && variances[0] < 2, "variance of x " + variances[0]);
    assertTrue(variances[1] > 50 && variances[1] < 200, "variance of y " + variances[1]);
    double step = sampler.stepSize();
    sampler.iterate(ChainSeeds.split(12, 1)[0]);
    assertEquals(step, sampler.stepSize(), "step size after warm-up");
    assertEquals(1, sampler.statistics().iterations());
  }

  @Test
  void escapesToFiniteDensityNearAWall() {
    // log-density -inf below 0: trajectories that cross it are cut, never taken
    Target halfLine = new Target() {
      @Override
      public int dimension() {
        return 1;
      }

      @Override
      public double logDensity(double[] position, double[] gradient) {
        gradient[0] = -1;
        return position[0] > 0 ? -position[0] : Double.NEGATIVE_INFINITY;
      }
    };
    NoUTurnSampler sampler =
        NoUTurnSampler.of(halfLine, new double[] {0.01}, NoUTurnSampler.Settings.of(200));
    RandomGenerator rng = ChainSeeds.split(3, 1)[0];
    for (int i = 0; i < 400; i++) {
      sampler.iterate(rng);
      assertTrue(sampler.position()[0] > 0, "left the support at iteration " + i);
    }
  }

  /** Stan's default schedule for 1000 warm-up iterations: windows of 25, 50, 100, 200, 500. */
  @Test
  void windowsFollowTheCommonSchedule() {
    // recalled from memory (Stan reference manual: 75 first, then 25 doubling, 50 last)
    assertArrayEquals(new long[] {100, 150, 250, 450, 950}, WarmupWindows.of(1000).ends());
    // shorter than 150: 15%, 75%, 10% (one window from 15 to 90 of 100)
    assertArrayEquals(new long[] {90}, WarmupWindows.of(100).ends());
    assertArrayEquals(new long[0], WarmupWindows.of(10).ends());
    WarmupWindows windows = WarmupWindows.of(1000);
    assertTrue(!windows.collects(74) && windows.collects(75) && windows.collects(949)
        && !windows.collects(950));
    assertTrue(windows.endsWindow(99) && !windows.endsWindow(100) && windows.endsWarmup(999));
  }

  private static NoUTurnSampler run(long seed) {
    NoUTurnSampler sampler =
        NoUTurnSampler.of(WIDE, new double[] {3, -20}, NoUTurnSampler.Settings.of(1000));
    RandomGenerator rng = ChainSeeds.split(seed, 1)[0];
    for (int i = 0; i < 1000; i++) {
      sampler.iterate(rng);
    }
    return sampler;
  }
}

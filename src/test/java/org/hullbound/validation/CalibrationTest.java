package org.hullbound.validation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.random.RandomGeneratorFactory;
import org.hullbound.io.CsvData;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.SimulationException;
import org.junit.jupiter.api.Test;

/**
 * Simulation-based calibration (Talts et al. 2018) of small conjugate models: the Gibbs driver's
 * ranks pass the chi-square test, and two deliberately wrong samplers injected here (posterior
 * draws shifted by half a posterior sd, or spread 1.5 times too wide) are caught.
 *
 * <p>Level and power: each check uses level 1e-4 at a fixed seed, so that the three checks of
 * exact samplers add at most 3e-4 to the false-alarm rate of the whole build (DEVELOPERS.md,
 * Tests). With N = 200 replicates and
 * L = 99, a shift of half a posterior sd moves the expected rank fraction from 1/2 to
 * Phi(-0.5 / sqrt 2) = 0.36 (prior and posterior draws then differ by a normal with variance 2
 * sd^2), and a 1.5-fold spread piles the ranks in the middle; both give chi-square statistics far
 * beyond the 1e-4 critical value (at this seed: p = 1e-10 for the shift, 9e-6 for the spread;
 * the exact sampler gives p = 0.39).
 */
final class CalibrationTest {
  private static final String NORMAL_MEAN =
      "model inline_normal_mean\n"
          + "index obs = 1 .. 5\n"
          + "data y[obs] = [1.2, 0.4, 2.0, 1.1, 0.3] ~ normal(mean = mu, sd = 1)\n"
          + "param mu ~ normal(mean = 0, sd = 2)\n";

  private static final CalibrationSettings SETTINGS = new CalibrationSettings(200, 99, 1, 20, 0, 42);

  private static ModelFile parse(String text) {
    return Parser.parse(SourceText.of("calibration.hbm", text));
  }

  @Test
  void theGibbsDriverIsCalibratedOnAConjugateNormalMean() {
    CalibrationResult result =
        Calibration.of(parse(NORMAL_MEAN), List.of(), PosteriorFitter.gibbs()).run(SETTINGS, n -> { });
    RankUniformity mu = result.tests().get(0);
    assertEquals("mu", mu.label());
    assertEquals(24, mu.degreesOfFreedom(), "25 bins: the largest divisor of 100 with >= 5 per bin");
    assertTrue(mu.pValue() > 1e-4, "p-value " + mu.pValue());
    assertEquals(200, java.util.Arrays.stream(mu.counts()).sum());
  }

  @Test
  void theGibbsDriverIsCalibratedOnABetaBinomialFromDataFiles() {
    Path folder = Path.of("validation/beta_binomial");
    ModelFile model = Parser.parse(SourceText.of("model.hbm", read(folder.resolve("model.hbm"))));
    CalibrationResult result =
        Calibration.of(model, List.of(CsvData.read(folder.resolve("batches.csv"))), PosteriorFitter.gibbs())
            .run(SETTINGS, n -> { });
    assertTrue(result.tests().get(0).pValue() > 1e-4, "p-value " + result.tests().get(0).pValue());
  }

  @Test
  void aShiftedSamplerIsCaught() {
    PosteriorFitter shifted = wrap((draws, mean, sd) -> draws + 0.5 * sd);
    CalibrationResult result = Calibration.of(parse(NORMAL_MEAN), List.of(), shifted).run(SETTINGS, n -> { });
    assertTrue(result.tests().get(0).pValue() < 1e-4, "p-value " + result.tests().get(0).pValue());
    assertTrue(!result.passes(1e-4));
  }

  @Test
  void aTooWideSamplerIsCaught() {
    PosteriorFitter wide = wrap((draws, mean, sd) -> mean + 1.5 * (draws - mean));
    CalibrationResult result = Calibration.of(parse(NORMAL_MEAN), List.of(), wide).run(SETTINGS, n -> { });
    assertTrue(result.tests().get(0).pValue() < 1e-4, "p-value " + result.tests().get(0).pValue());
  }

  @Test
  void aHierarchicalModelGivesRanksForEveryUnknownInRange() {
    Path folder = Path.of("validation/eight_schools");
    ModelFile model = Parser.parse(SourceText.of("model.hbm", read(folder.resolve("model.hbm"))));
    CalibrationSettings few = new CalibrationSettings(10, 19, 2, 50, 2, 3);
    CalibrationResult result =
        Calibration.of(model, List.of(CsvData.read(folder.resolve("schools.csv"))), PosteriorFitter.gibbs())
            .run(few, n -> { });
    assertEquals(List.of("mu", "tau", "theta[1]", "theta[2]", "theta[3]", "theta[4]", "theta[5]",
        "theta[6]", "theta[7]", "theta[8]"), result.labels());
    for (int[] replicate : result.ranks()) {
      for (int rank : replicate) {
        assertTrue(rank >= 0 && rank <= 19);
      }
    }
  }

  @Test
  void anInlineScalarObservationIsSimulatedToo() {
    String text = "data k = 3 ~ poisson(rate = r)\nparam r ~ gamma(shape = 2, rate = 1)\n";
    CalibrationResult result =
        Calibration.of(parse(text), List.of(), PosteriorFitter.gibbs())
            .run(new CalibrationSettings(100, 19, 1, 20, 0, 4), n -> { });
    assertTrue(result.tests().get(0).pValue() > 1e-4, "p-value " + result.tests().get(0).pValue());
  }

  /**
   * Kept {@code let} quantities are ranked too, their prior value computed from the prior draw as
   * {@code fit} computes it from a kept state. Ranks are invariant under an increasing function
   * and reversed by a decreasing one (common practice: a rank counts the draws below the truth, and
   * a strictly monotone map keeps or reverses every comparison), so at every replicate the rank of
   * {@code exp(mu)} equals mu's and that of {@code -mu} is L - mu's, exactly.
   */
  @Test
  void keptDerivedQuantitiesAreRankedFromThePriorDrawsOwnValue() {
    String text = NORMAL_MEAN + "let grown = exp(mu)\nlet flipped = -mu\n";
    CalibrationSettings few = new CalibrationSettings(20, 99, 1, 20, 0, 5);
    CalibrationResult result =
        Calibration.of(parse(text), List.of(), PosteriorFitter.gibbs()).run(few, n -> { });
    assertEquals(List.of("mu", "grown", "flipped"), result.labels());
    assertEquals(3, result.tests().size());
    int[][] ranks = result.ranks();
    for (int[] replicate : ranks) {
      assertEquals(replicate[0], replicate[1], "exp keeps the order");
      assertEquals(99 - replicate[0], replicate[2], "negation reverses it");
    }
  }

  @Test
  void theSameSeedGivesTheSameRanks() {
    CalibrationSettings few = new CalibrationSettings(5, 9, 1, 5, 2, 9);
    Calibration calibration = Calibration.of(parse(NORMAL_MEAN), List.of(), PosteriorFitter.gibbs());
    assertTrue(java.util.Arrays.deepEquals(
        calibration.run(few, n -> { }).ranks(), calibration.run(few, n -> { }).ranks()));
  }

  @Test
  void modelledDataReadByAnotherStatementIsRefused() {
    String text =
        "index obs = 1 .. 3\n"
            + "data x[obs] = [1, 2, 3] ~ normal(mean = 0, sd = 1)\n"
            + "data y[obs] = [1, 2, 3] ~ normal(mean = b * x[obs], sd = 1)\n"
            + "param b ~ normal(mean = 0, sd = 1)\n";
    SimulationException refused =
        assertThrows(SimulationException.class, () -> Calibration.of(parse(text), List.of(), PosteriorFitter.gibbs()));
    assertTrue(refused.getMessage().contains("[x]"), refused.getMessage());
  }

  @Test
  void binsMustDivideDrawsPlusOne() {
    assertThrows(IllegalArgumentException.class, () -> new CalibrationSettings(100, 99, 1, 0, 7, 1));
    assertEquals(20, new CalibrationSettings(100, 99, 1, 0, 0, 1).binCount());
    IllegalArgumentException prime =
        assertThrows(IllegalArgumentException.class, () -> new CalibrationSettings(100, 100, 1, 0, 0, 1).binCount());
    assertTrue(prime.getMessage().contains("101"), prime.getMessage());
  }

  @Test
  void ranksCountDrawsBelowAndBreakTiesAtRandom() {
    var rng = RandomGeneratorFactory.of("L64X128MixRandom").create(1);
    assertEquals(2, Calibration.rank(1.5, new double[] {1, 2, 0, 3}, rng));
    assertEquals(0, Calibration.rank(-1, new double[] {1, 2}, rng));
    assertEquals(2, Calibration.rank(9, new double[] {1, 2}, rng));
    int[] seen = new int[4];
    for (int i = 0; i < 3000; i++) {
      seen[Calibration.rank(1, new double[] {1, 1, 1}, rng)]++;
    }
    // Three ties: ranks 0..3 each with probability 1/4 (750 expected; 5 sd is about 120).
    for (int count : seen) {
      assertTrue(Math.abs(count - 750) < 120, java.util.Arrays.toString(seen));
    }
  }

  /** Uniform ranks give a chi-square p-value near 1; all in one bin give one near 0. */
  @Test
  void uniformityTestAgainstHandComputedStatistics() {
    int[] even = new int[100];
    for (int i = 0; i < 100; i++) {
      even[i] = i;
    }
    RankUniformity flat = RankUniformity.of("x", even, 99, 10);
    assertEquals(0, flat.chiSquare(), 1e-12);
    assertEquals(1, flat.pValue(), 1e-12);
    RankUniformity piled = RankUniformity.of("x", new int[100], 99, 10);
    // All 100 in bin 0: (100 - 10)^2 / 10 + 9 * 10 = 900.
    assertEquals(900, piled.chiSquare(), 1e-9);
    assertTrue(piled.pValue() < 1e-100);
  }

  private interface Distortion {
    double apply(double draw, double mean, double sd);
  }

  private static PosteriorFitter wrap(Distortion distortion) {
    PosteriorFitter exact = PosteriorFitter.gibbs();
    return (model, draws, thin, burnIn, seed) -> {
      double[][] out = exact.fit(model, draws, thin, burnIn, seed);
      for (double[] series : out) {
        double mean = java.util.Arrays.stream(series).average().orElseThrow();
        double sd = Math.sqrt(java.util.Arrays.stream(series).map(v -> (v - mean) * (v - mean)).sum() / (series.length - 1));
        for (int i = 0; i < series.length; i++) {
          series[i] = distortion.apply(series[i], mean, sd);
        }
      }
      return out;
    };
  }

  private static String read(Path file) {
    try {
      return java.nio.file.Files.readString(file);
    } catch (java.io.IOException e) {
      throw new java.io.UncheckedIOException(e);
    }
  }
}

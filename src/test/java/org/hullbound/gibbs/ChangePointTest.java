package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.apache.commons.math3.special.Gamma;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.junit.jupiter.api.Test;

/**
 * The change-point demo {@code models/fleet_faults.hbm} (yearly fault counts, an invented
 * scenario): its posterior of the change year is known exactly, as each candidate year c splits
 * the years into two runs whose gamma-Poisson marginals are closed-form (Gelman et al., Bayesian
 * Data Analysis, 3rd ed., 2.6: with a gamma(a, b) prior on a rate and counts y over n years, the
 * marginal is b^a Gamma(a + Y) / (Gamma(a) (b + n)^(a + Y) prod y!)), so p(c | y) is their
 * product normalised over c = 2 .. 16. The fit (enumeration for the year, adaptive rejection or
 * conjugate draws for the rates) must match it: the posterior mean of the year and the share of
 * draws at each year of posterior mass above 0.05, each within 4 MCSE (level about 6.3e-5 each,
 * normal approximation; see {@link GibbsPosteriorTest} for the build's count).
 */
class ChangePointTest {
  private static final int[] FAULTS = {9, 12, 8, 11, 10, 13, 9, 11, 4, 6, 3, 5, 4, 2, 6, 3};
  private static final double SHAPE = 2;
  private static final double RATE = 0.2;

  private static double logMarginal(int from, int to) {
    double total = 0;
    for (int t = from; t <= to; t++) {
      total += FAULTS[t - 1];
    }
    double years = to - from + 1;
    return SHAPE * Math.log(RATE) - Gamma.logGamma(SHAPE) + Gamma.logGamma(SHAPE + total)
        - (SHAPE + total) * Math.log(RATE + years);
  }

  /** p(change = c | faults) for c = 2 .. 16, index c. */
  private static double[] exactPosterior() {
    double[] log = new double[17];
    double top = Double.NEGATIVE_INFINITY;
    for (int c = 2; c <= 16; c++) {
      log[c] = logMarginal(1, c - 1) + logMarginal(c, 16);
      top = Math.max(top, log[c]);
    }
    double sum = 0;
    double[] p = new double[17];
    for (int c = 2; c <= 16; c++) {
      p[c] = Math.exp(log[c] - top);
      sum += p[c];
    }
    for (int c = 2; c <= 16; c++) {
      p[c] /= sum;
    }
    return p;
  }

  @Test
  void theChangeYearMatchesTheExactPosterior() throws Exception {
    String text = Files.readString(Path.of("models/fleet_faults.hbm"));
    assertTheChangeYearMatches(text, 2026L, 4000, 4);
  }

  /**
   * The same model written with an unknown index: the rate of year t is {@code level[phase_of[t]]},
   * the phase worked out from the change year ({@code UnknownIndex} proves it in 1 .. 2). The
   * posterior is the same, so the same exact reference applies, here within 5 MCSE (level about
   * 5.7e-7 each, normal approximation) with 6,250 draws per chain, 1.5625 = (5 / 4)^2 times as
   * many, so that the smallest difference found is the same as at 4 MCSE with 4,000 (at most 4
   * checks, counted in DEVELOPERS.md).
   */
  @Test
  void theChangeYearOfAnUnknownIndexMatchesTheExactPosterior() {
    String text = """
        model fleet_faults_indexed
        index year = 1 .. 16
        index phase = 1 .. 2
        param change ~ whole-uniform(lower = 2, upper = 16)
        param level[phase] ~ gamma(shape = 2, rate = 0.2)
        let   phase_of[year] = 2 - min(1, max(0, change - year))
        data  faults[year] = [9, 12, 8, 11, 10, 13, 9, 11, 4, 6, 3, 5, 4, 2, 6, 3] ~ poisson(
                  rate = level[phase_of[year]])
        """;
    BoundModel model = BoundModel.bind(Parser.parse(SourceText.of("indexed.hbm", text)),
        List.of());
    assertTrue(model.allocation(model.unknown("change").index()));
    assertTrue(model.dynamicBlanket(model.unknown("level[1]").index()));
    assertTheChangeYearMatches(text, 2027L, 6250, 5);
  }

  private static void assertTheChangeYearMatches(
      String text, long seed, int draws, double mcses) {
    BoundModel model = BoundModel.bind(Parser.parse(SourceText.of("fleet_faults.hbm", text)),
        List.of());
    int change = model.unknown("change").index();
    Fits.Fit fit = Fits.run(ModelSampler.of(model, Map.of()).sampler(),
        new RunSettings(4, 300, draws, 1, seed, 2));
    assertEquals("enumeration", fit.reports().get(change).method());
    double[] exact = exactPosterior();
    double mean = 0;
    for (int c = 2; c <= 16; c++) {
      mean += c * exact[c];
    }
    double[][] years = fit.store().draws(change);
    VariableSummary summary = PosteriorSummary.of("change", years);
    assertTrue(Math.abs(summary.mean() - mean) < mcses * summary.mcseMean(),
        "mean " + summary.mean() + " vs " + mean + ", mcse " + summary.mcseMean());
    int checked = 0;
    for (int c = 2; c <= 16; c++) {
      if (exact[c] <= 0.05) {
        continue;
      }
      double[][] at = new double[years.length][];
      for (int chain = 0; chain < years.length; chain++) {
        at[chain] = new double[years[chain].length];
        for (int i = 0; i < at[chain].length; i++) {
          at[chain][i] = years[chain][i] == c ? 1 : 0;
        }
      }
      VariableSummary share = PosteriorSummary.of("change = " + c, at);
      assertTrue(Math.abs(share.mean() - exact[c]) < mcses * share.mcseMean(),
          "P(change = " + c + ") " + share.mean() + " vs " + exact[c] + ", mcse "
              + share.mcseMean());
      checked++;
    }
    assertTrue(checked >= 1, "at least one year carries mass above 0.05");
  }
}

package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The diagnostics agree with {@link PaperDiagnostics}, a second implementation written in the
 * tests from Vehtari et al. (2021), to a relative 1e-10: on stationary AR(1) chains from
 * antithetic to strongly correlated, and on chains that disagree in location or in scale (where
 * R-hat is far from 1 and the folded draws matter). Fit output from a real model is compared in
 * {@code gibbs.FitDiagnosticsAgreementTest}. Agreement here is not a statistical test: both sides
 * compute the same numbers from the same draws, so any difference beyond rounding is an error in
 * one of them.
 */
class PaperAgreementTest {

  static final double RELATIVE = 1e-10;

  /** Checks every diagnostic of {@code chains} against the paper's implementation. */
  static void assertAgreement(double[][] chains, String what) {
    Draws draws = Draws.of(chains);
    RankNormalizedRhat rhat = Rhat.rankNormalized(draws);
    close(PaperDiagnostics.rhatBulk(chains), rhat.bulk(), what + ": bulk R-hat");
    close(PaperDiagnostics.rhatTail(chains), rhat.tail(), what + ": tail R-hat");
    close(PaperDiagnostics.essBulk(chains), EffectiveSampleSize.bulk(draws), what + ": bulk ESS");
    close(PaperDiagnostics.essTail(chains), EffectiveSampleSize.tail(draws), what + ": tail ESS");
    close(PaperDiagnostics.essMean(chains), EffectiveSampleSize.mean(draws), what + ": mean ESS");
    close(
        PaperDiagnostics.mcseMean(chains), MonteCarloStandardError.mean(draws), what + ": MCSE mean");
    for (double p : new double[] {0.05, 0.5, 0.95}) {
      close(
          PaperDiagnostics.essQuantile(chains, p),
          EffectiveSampleSize.quantile(draws, p),
          what + ": ESS of the " + p + " quantile");
      close(
          PaperDiagnostics.mcseQuantile(chains, p),
          MonteCarloStandardError.quantile(draws, p),
          what + ": MCSE of the " + p + " quantile");
    }
  }

  private static void close(double expected, double actual, String what) {
    assertEquals(expected, actual, RELATIVE * Math.abs(expected), what);
  }

  @ParameterizedTest(name = "rho {0}")
  @CsvSource({"-0.3", "0", "0.5", "0.9"})
  void ar1ChainsGiveThePapersValues(double rho) {
    assertAgreement(SimulatedChains.ar1(41, 4, 1000, rho), "AR(1) rho " + rho);
  }

  @ParameterizedTest(name = "chain 0 shifted by {0}, scaled by {1}")
  @CsvSource({"1.0, 1.0", "0.0, 3.0", "0.5, 0.5"})
  void disagreeingChainsGiveThePapersValues(double shift, double scale) {
    double[][] chains = SimulatedChains.ar1(42, 4, 600, 0.6);
    for (int i = 0; i < chains[0].length; i++) {
      chains[0][i] = shift + scale * chains[0][i];
    }
    assertAgreement(chains, "shift " + shift + ", scale " + scale);
  }
}

package org.hullbound.diagnostics;

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

  @ParameterizedTest(name = "rho {0}")
  @CsvSource({"-0.3", "0", "0.5", "0.9"})
  void ar1ChainsGiveThePapersValues(double rho) {
    PaperDiagnostics.assertAgreement(SimulatedChains.ar1(41, 4, 1000, rho), "AR(1) rho " + rho);
  }

  @ParameterizedTest(name = "chain 0 shifted by {0}, scaled by {1}")
  @CsvSource({"1.0, 1.0", "0.0, 3.0", "0.5, 0.5"})
  void disagreeingChainsGiveThePapersValues(double shift, double scale) {
    double[][] chains = SimulatedChains.ar1(42, 4, 600, 0.6);
    for (int i = 0; i < chains[0].length; i++) {
      chains[0][i] = shift + scale * chains[0][i];
    }
    PaperDiagnostics.assertAgreement(chains, "shift " + shift + ", scale " + scale);
  }
}
